import { fakesDirectory } from './env';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';

// A database of this file's own: the tests count versions.
process.env.DATABASE_PATH = join(fakesDirectory, `captions-${process.pid}.db`);

const { db, schema } = await import('$lib/server/db');
const captions = await import('$lib/server/captions');
const { parseVtt } = await import('$lib/captions/vtt');
const { parseSrt } = await import('$lib/captions/srt');
const { makeClinic, makeRecording, makeStaff } = await import('./factories');

let owner: import('./factories').Staff;
let otherClinicId: string;
const utf8 = (text: string) => new TextEncoder().encode(text);

const GOOD_VTT = `WEBVTT

intro
00:00:00.500 --> 00:00:02.000
Sit on the edge of the chair.

00:00:02.500 --> 00:00:04.000
<i>Stand up</i> &amp; sit down.
`;

const BROKEN_VTT = `WEBVTT

00:00:00.500 --> 00:00:02,000
A comma where the full stop belongs.

00:00:03.000 -> 00:00:04.000
No arrow.
`;

function newTrack() {
	return captions.createTrack(makeRecording(owner.clinicId), {
		kind: 'captions',
		language: 'en-gb'
	});
}

const fresh = (track: { id: string }) => captions.findTrack(owner.clinicId, track.id)!;

beforeAll(() => {
	owner = makeStaff(makeClinic('Captions clinic').id);
	otherClinicId = makeClinic('Other clinic').id;
});

describe('caption tracks', () => {
	it('are made empty, with a canonical language and a label from it', () => {
		const track = newTrack();
		expect(track).toMatchObject({ language: 'en-GB', currentVersion: 0 });
		expect(track.label).toBe('British English');
		expect(captions.listVersions(track)).toEqual([]);
		expect(captions.exportTrack(track, 'vtt')?.body).toBe('WEBVTT\n');
	});

	it('refuse a tag that is not BCP 47, and a second track of one kind and language', () => {
		const recording = makeRecording(owner.clinicId);
		expect(() =>
			captions.createTrack(recording, { kind: 'captions', language: 'not a tag' })
		).toThrow(/not a language tag/);
		captions.createTrack(recording, { kind: 'captions', language: 'cy' });
		expect(() => captions.createTrack(recording, { kind: 'captions', language: 'CY' })).toThrow(
			expect.objectContaining({ status: 409 })
		);
		// Another kind in the same language is its own track.
		expect(captions.createTrack(recording, { kind: 'chapters', language: 'cy' }).kind).toBe(
			'chapters'
		);
		expect(captions.listTracks(owner.clinicId, recording.id)).toHaveLength(2);
	});

	it('are not found from another clinic', () => {
		const track = newTrack();
		expect(captions.findTrack(otherClinicId, track.id)).toBeNull();
		expect(captions.listTracks(otherClinicId, track.recordingId)).toEqual([]);
	});

	it('go when their recording goes', () => {
		const track = newTrack();
		captions.saveVersion(track, {
			baseVersion: 0,
			cues: [{ id: '1', start: 0, end: 1, text: 'Up.' }]
		});
		db().delete(schema.recordings).run();
		expect(captions.findTrack(owner.clinicId, track.id)).toBeNull();
		expect(db().select().from(schema.captionTrackVersions).all()).toEqual([]);
	});
});

describe('versions', () => {
	const first = [{ id: '1', start: 0, end: 1.5, text: 'Lift the arm.' }];
	const second = [...first, { id: '2', start: 2, end: 3, text: 'Lower it.' }];

	it('are numbered from 1, one per save, and never change', () => {
		const track = newTrack();
		expect(captions.saveVersion(track, { baseVersion: 0, cues: first, userId: owner.id })).toEqual({
			ok: true,
			version: 1
		});
		const stored = structuredClone(captions.getVersion(fresh(track), 1));
		expect(
			captions.saveVersion(fresh(track), { baseVersion: 1, cues: second, note: 'Second cue' })
		).toEqual({ ok: true, version: 2 });
		expect(captions.getVersion(fresh(track), 1)).toEqual(stored);
		expect(fresh(track).currentVersion).toBe(2);
		expect(
			captions.listVersions(fresh(track)).map((v) => [v.version, v.source, v.cueCount, v.note])
		).toEqual([
			[2, 'edit', 2, 'Second cue'],
			[1, 'edit', 1, '']
		]);
		expect(captions.listTracks(owner.clinicId, track.recordingId)[0].cueCount).toBe(2);
	});

	it('refuse a save against an older version with both sets of cues, and write nothing', () => {
		const track = newTrack();
		captions.saveVersion(track, { baseVersion: 0, cues: first });
		captions.saveVersion(fresh(track), { baseVersion: 1, cues: second });
		const mine = [{ id: '1', start: 0, end: 1.5, text: 'Raise the arm.' }];
		const result = captions.saveVersion(fresh(track), { baseVersion: 1, cues: mine });
		expect(result).toEqual({
			ok: false,
			conflict: {
				baseVersion: 1,
				yours: mine,
				current: { version: 2, cues: second, note: '', createdAt: expect.any(String) }
			}
		});
		expect(fresh(track).currentVersion).toBe(2);
		expect(captions.listVersions(fresh(track))).toHaveLength(2);
	});

	it('let only one of two saves from the same base through', () => {
		const track = newTrack();
		const a = captions.saveVersion(track, { baseVersion: 0, cues: first });
		const b = captions.saveVersion(track, { baseVersion: 0, cues: second });
		expect([a.ok, b.ok]).toEqual([true, false]);
	});

	it('restore an old version as a new one, keeping every version', () => {
		const track = newTrack();
		captions.saveVersion(track, { baseVersion: 0, cues: first });
		captions.saveVersion(fresh(track), { baseVersion: 1, cues: second });
		expect(captions.restoreVersion(fresh(track), { version: 1, userId: owner.id })).toEqual({
			ok: true,
			version: 3
		});
		const v3 = captions.getVersion(fresh(track))!;
		expect(v3).toMatchObject({ version: 3, source: 'restore', note: 'Restored version 1' });
		expect(v3.cues).toEqual(first);
		expect(captions.getVersion(fresh(track), 2)?.cues).toEqual(second);
		expect(() => captions.restoreVersion(fresh(track), { version: 9 })).toThrow(/no version 9/);
	});
});

describe('import', () => {
	it('stores a WebVTT file as the next version, tags and identifiers kept', () => {
		const track = newTrack();
		const result = captions.importFile(track, utf8(GOOD_VTT), 'sit-to-stand.vtt', {
			userId: owner.id
		});
		expect(result).toMatchObject({ ok: true, version: 1, cueCount: 2 });
		const v1 = captions.getVersion(fresh(track))!;
		expect(v1).toMatchObject({ source: 'import', note: 'Imported sit-to-stand.vtt' });
		expect(v1.cues.map((c) => [c.id, c.start, c.end, c.text])).toEqual([
			['intro', 0.5, 2, 'Sit on the edge of the chair.'],
			['', 2.5, 4, '<i>Stand up</i> &amp; sit down.']
		]);
	});

	it('accepts a UTF-8 byte order mark', () => {
		const track = newTrack();
		const bytes = new Uint8Array([0xef, 0xbb, 0xbf, ...utf8(GOOD_VTT)]);
		expect(captions.importFile(track, bytes, 'bom.vtt')).toMatchObject({ ok: true, cueCount: 2 });
		expect(captions.getVersion(fresh(track))?.cues[0].id).toBe('intro');
	});

	it('converts SRT', () => {
		const track = newTrack();
		const srt = '1\n00:00:01,000 --> 00:00:02,500\n<font color="red">Hold</font> for five.\n';
		expect(captions.importFile(track, utf8(srt), 'hold.SRT')).toMatchObject({ ok: true });
		expect(captions.getVersion(fresh(track))?.cues).toEqual([
			{ id: '1', start: 1, end: 2.5, text: 'Hold for five.' }
		]);
	});

	it('refuses a file with errors, listing each by line and column, and leaves the track as it was', () => {
		const track = newTrack();
		captions.importFile(track, utf8(GOOD_VTT), 'good.vtt');
		const before = captions.exportTrack(fresh(track), 'vtt')?.body;
		const result = captions.importFile(fresh(track), utf8(BROKEN_VTT), 'broken.vtt');
		expect(result.ok).toBe(false);
		if (result.ok || 'conflict' in result) throw new Error('expected a refusal');
		expect(result.message).toMatch(/not imported/);
		expect(result.errors.length).toBeGreaterThanOrEqual(2);
		expect(result.errors.map((e) => e.line)).toEqual(expect.arrayContaining([3, 6]));
		for (const error of result.errors) {
			expect(error.column).toBeGreaterThan(0);
			expect(error.message).toMatch(/^Line \d+, column \d+: /);
		}
		expect(fresh(track).currentVersion).toBe(1);
		expect(captions.listVersions(fresh(track))).toHaveLength(1);
		expect(captions.exportTrack(fresh(track), 'vtt')?.body).toBe(before);
	});

	it('refuses binary and non-UTF-8 files, and other file types, without a version', () => {
		const track = newTrack();
		const png = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13]);
		const latin1 = new Uint8Array([...utf8('WEBVTT\n\n00:00.000 --> 00:01.000\nCaf'), 0xe9, 0x0a]);
		const utf16 = new Uint8Array([0xff, 0xfe, 0x57, 0x00, 0x45, 0x00]);
		expect(captions.importFile(track, png, 'picture.vtt')).toMatchObject({
			ok: false,
			message: expect.stringMatching(/not a text file/)
		});
		expect(captions.importFile(track, latin1, 'latin1.vtt')).toMatchObject({
			ok: false,
			message: expect.stringMatching(/not in UTF-8/)
		});
		expect(captions.importFile(track, utf16, 'wide.srt')).toMatchObject({
			ok: false,
			message: expect.stringMatching(/UTF-16/)
		});
		expect(captions.importFile(track, utf8(GOOD_VTT), 'notes.txt')).toMatchObject({
			ok: false,
			message: expect.stringMatching(/\.vtt.*\.srt/)
		});
		expect(captions.importFile(track, utf8('WEBVTT\n'), 'empty.vtt')).toMatchObject({
			ok: false,
			message: expect.stringMatching(/no cues/)
		});
		expect(fresh(track).currentVersion).toBe(0);
	});

	it('with a stale base version is a conflict, not a replacement', () => {
		const track = newTrack();
		captions.importFile(track, utf8(GOOD_VTT), 'one.vtt');
		captions.importFile(fresh(track), utf8(GOOD_VTT), 'two.vtt');
		const result = captions.importFile(fresh(track), utf8(GOOD_VTT), 'three.vtt', {
			baseVersion: 1
		});
		expect(result).toMatchObject({ ok: false, conflict: { current: { version: 2 } } });
		expect(fresh(track).currentVersion).toBe(2);
	});
});

describe('export', () => {
	it('round-trips WebVTT and SRT, per version, with a tag per version and format', () => {
		const track = newTrack();
		captions.importFile(track, utf8(GOOD_VTT), 'good.vtt');
		captions.saveVersion(fresh(track), {
			baseVersion: 1,
			cues: [{ id: 'x', start: 1, end: 2, text: 'Only one.' }]
		});
		const vtt = captions.exportTrack(fresh(track), 'vtt', 1)!;
		const parsed = parseVtt(vtt.body);
		expect(parsed.ok && parsed.cues.map((c) => c.text)).toEqual([
			'Sit on the edge of the chair.',
			'<i>Stand up</i> &amp; sit down.'
		]);
		const srt = captions.exportTrack(fresh(track), 'srt', 1)!;
		const fromSrt = parseSrt(srt.body);
		expect(fromSrt.ok && fromSrt.cues.map((c) => [c.start, c.end])).toEqual([
			[0.5, 2],
			[2.5, 4]
		]);
		expect(srt.body).toContain('<i>Stand up</i> & sit down.');
		expect(srt.filename).toBe('captions-en-GB-v1.srt');
		const current = captions.exportTrack(fresh(track), 'vtt')!;
		expect(current.version).toBe(2);
		expect(new Set([vtt.etag, srt.etag, current.etag]).size).toBe(3);
		expect(current.etag).toMatch(/^"[A-Za-z0-9_-]+"$/);
		expect(captions.exportTrack(fresh(track), 'vtt', 2)?.etag).toBe(current.etag);
		expect(captions.exportTrack(fresh(track), 'vtt', 7)).toBeNull();
	});

	it('gives a transcript with plain text beside the tagged text', () => {
		const track = newTrack();
		captions.importFile(track, utf8(GOOD_VTT), 'good.vtt');
		expect(captions.transcript(fresh(track))?.lines).toEqual([
			{
				id: 'intro',
				start: 0.5,
				end: 2,
				text: 'Sit on the edge of the chair.',
				plain: 'Sit on the edge of the chair.'
			},
			{
				id: '',
				start: 2.5,
				end: 4,
				text: '<i>Stand up</i> &amp; sit down.',
				plain: 'Stand up & sit down.'
			}
		]);
	});
});
