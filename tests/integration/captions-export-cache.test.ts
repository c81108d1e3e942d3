import { fakesDirectory } from './env';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';

/*
 * exportTrack keeps files it has written in memory. These tests check that what it answers is
 * always what a fresh write of the version gives, before and after saves, for either format.
 */
process.env.DATABASE_PATH = join(fakesDirectory, `captions-export-cache-${process.pid}.db`);

const captions = await import('$lib/server/captions');
const { serializeVtt } = await import('$lib/captions/vtt');
const { serializeSrt } = await import('$lib/captions/srt');
const { makeClinic, makeRecording } = await import('./factories');

let clinicId: string;

function newTrack() {
	return captions.createTrack(makeRecording(clinicId), { kind: 'captions', language: 'en-GB' });
}

const fresh = (id: string) => captions.findTrack(clinicId, id)!;

const FIRST = [{ id: 'a', start: 0.5, end: 2, text: 'Slide your heel towards you.' }];
const SECOND = [
	{ id: 'a', start: 0.5, end: 2, text: 'Slide your heel towards you.' },
	{ id: 'b', start: 2.5, end: 4, text: '<i>Hold</i> for five seconds &amp; relax.' }
];

beforeAll(() => {
	clinicId = makeClinic('Export clinic').id;
});

describe('exportTrack with files kept in memory', () => {
	it('answers the current version after every save, and each older version as it was', () => {
		const track = newTrack();
		expect(captions.exportTrack(track, 'vtt')?.body).toBe('WEBVTT\n');

		expect(captions.saveVersion(fresh(track.id), { baseVersion: 0, cues: FIRST }).ok).toBe(true);
		const first = captions.exportTrack(fresh(track.id), 'vtt')!;
		expect(first.body).toBe(serializeVtt(FIRST));
		// The second read comes from memory and must be the same file with the same tag.
		expect(captions.exportTrack(fresh(track.id), 'vtt')).toEqual(first);

		expect(captions.saveVersion(fresh(track.id), { baseVersion: 1, cues: SECOND }).ok).toBe(true);
		const second = captions.exportTrack(fresh(track.id), 'vtt')!;
		expect(second.version).toBe(2);
		expect(second.body).toBe(serializeVtt(SECOND));
		expect(second.etag).not.toBe(first.etag);
		expect(captions.exportTrack(fresh(track.id), 'vtt', 1)).toEqual(first);
		expect(captions.exportTrack(fresh(track.id), 'vtt', 0)?.body).toBe('WEBVTT\n');
	});

	it('keeps WebVTT and SRT apart for one version', () => {
		const track = newTrack();
		captions.saveVersion(track, { baseVersion: 0, cues: SECOND });
		const vtt = captions.exportTrack(fresh(track.id), 'vtt')!;
		const srt = captions.exportTrack(fresh(track.id), 'srt')!;
		expect(vtt.body).toBe(serializeVtt(SECOND));
		expect(srt.body).toBe(serializeSrt(SECOND));
		expect(captions.exportTrack(fresh(track.id), 'srt')?.body).toBe(srt.body);
		expect(captions.exportTrack(fresh(track.id), 'vtt')?.body).toBe(vtt.body);
	});

	it('keeps tracks apart, and still answers null for a version that does not exist', () => {
		const one = newTrack();
		const two = newTrack();
		captions.saveVersion(one, { baseVersion: 0, cues: FIRST });
		captions.saveVersion(two, { baseVersion: 0, cues: SECOND });
		expect(captions.exportTrack(fresh(one.id), 'vtt')?.body).toBe(serializeVtt(FIRST));
		expect(captions.exportTrack(fresh(two.id), 'vtt')?.body).toBe(serializeVtt(SECOND));
		expect(captions.exportTrack(fresh(one.id), 'vtt', 2)).toBeNull();
		expect(captions.exportTrack(fresh(one.id), 'vtt', 2)).toBeNull();
	});
});
