import { fakesDirectory } from './env';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';

// A database of this file's own, chosen before any app module reads the configuration.
process.env.DATABASE_PATH = join(fakesDirectory, `segment-captions-${process.pid}.db`);

const { db, schema } = await import('$lib/server/db');
const { eq } = await import('drizzle-orm');
const { shiftAndClip } = await import('$lib/captions/segment');
const captions = await import('$lib/server/captions');
const segments = await import('$lib/server/segments');
const { recordSession, transcriptLines } = await import('$lib/server/sessions');
const { makeClinic, makeExercise, makePatient, makeProgramme, makeRecording, makeSegment } =
	await import('./factories');

type Cue = import('$lib/captions/types').Cue;
type Recording = import('$lib/server/db/schema').Recording;
type SegmentRow = import('$lib/server/db/schema').SegmentRow;

/*
 * A segment's captions follow the recording's captions track: a fix saved in the caption
 * editor reaches the segment's `<track>`, transcript and replay at once, with a new tag, and
 * nothing is cut again. Real SQLite; no media is needed, since the clip does not change.
 */

let clinic: { id: string };
const FIRST: Cue[] = [
	{ id: 'a', start: 10, end: 12.5, text: 'Lie on your back.' },
	{ id: 'b', start: 12.5, end: 15, text: 'Slide the heel up.' },
	{ id: 'c', start: 31, end: 33, text: 'Next, ankle pumps.' }
];
let recording: Recording;
let segment: SegmentRow;
let track: import('$lib/server/captions').CaptionTrack;

beforeAll(() => {
	clinic = makeClinic('Segment captions clinic');
	recording = makeRecording(clinic.id, {
		title: 'Heel slides and ankle pumps',
		durationSeconds: 60
	});
	track = captions.createTrack(recording, { kind: 'captions', language: 'en-GB' });
	expect(captions.saveVersion(track, { baseVersion: 0, cues: FIRST, source: 'import' }).ok).toBe(
		true
	);
	// Confirmed on version 1: the first exercise runs from 10 s to 30 s.
	segment = makeSegment(recording, {
		startSeconds: 10,
		endSeconds: 30,
		cues: shiftAndClip(FIRST, 10, 30),
		captionsVersion: 1,
		captionsLanguage: 'en-GB'
	});
});

const current = () =>
	captions.findTrack(clinic.id, track.id) ?? expect.unreachable('the track is there');

describe("a segment's captions follow the recording's track", () => {
	it('shows the confirmed version, clipped to the segment and shifted to zero', () => {
		const shown = segments.segmentCaptions(segment);
		expect(shown).toMatchObject({ trackId: track.id, version: 1, language: 'en-GB' });
		expect(shown.cues).toEqual([
			{ id: 'a', start: 0, end: 2.5, text: 'Lie on your back.' },
			{ id: 'b', start: 2.5, end: 5, text: 'Slide the heel up.' }
		]);
	});

	it('serves a saved fix at once, under a new tag, in the file, the transcript and the replay', () => {
		const before = segments.segmentVtt(segment);
		expect(before.body()).toContain('Slide the heel up.');
		const fixed = FIRST.map((c) =>
			c.id === 'b' ? { ...c, end: 14.6, text: 'Slide your heel towards you.' } : c
		);
		const saved = captions.saveVersion(current(), { baseVersion: 1, cues: fixed });
		expect(saved.ok).toBe(true);

		const after = segments.segmentVtt(segment);
		expect(after.etag).not.toBe(before.etag);
		expect(after.body()).toContain('00:00:02.500 --> 00:00:04.600\nSlide your heel towards you.');
		expect(after.body()).not.toContain('Slide the heel up.');
		expect(segments.segmentTranscript(segment)).toMatchObject({ captionsVersion: 2 });
		expect(transcriptLines(segment).map((l) => l.text)).toEqual([
			'Lie on your back.',
			'Slide your heel towards you.'
		]);
		// The same version keeps the same tag, so players revalidate with a 304.
		expect(segments.segmentVtt(segment).etag).toBe(after.etag);
	});

	it('records with each logged session the captions version the patient was shown', () => {
		const patient = makePatient(clinic.id, 'Ida Caption');
		const exercise = makeExercise(clinic.id, 'Heel slides', { segmentId: segment.id });
		const { items } = makeProgramme(patient, [exercise.id], { startDate: '2026-12-01' });
		const item = items[0];
		const { log } = recordSession(patient, {
			clientId: crypto.randomUUID(),
			programmeItemId: item.id,
			doneAt: '2026-12-02T10:00:00Z',
			setsDone: 1,
			repsDone: 8,
			pain: 2,
			sharpPain: false,
			note: ''
		});
		const row = db()
			.select()
			.from(schema.sessionLogs)
			.where(eq(schema.sessionLogs.id, log.id))
			.get();
		expect(row).toMatchObject({ captionsTrackId: track.id, captionsVersion: 2 });
	});

	it('keeps the copy made at confirmation when the track is gone', () => {
		db().delete(schema.captionTracks).where(eq(schema.captionTracks.id, track.id)).run();
		const shown = segments.segmentCaptions(segment);
		expect(shown).toMatchObject({ trackId: null, version: 1 });
		expect(shown.cues.map((c) => c.text)).toEqual(['Lie on your back.', 'Slide the heel up.']);
	});
});
