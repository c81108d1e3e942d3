import { fakesDirectory } from './env';
import { mkdtemp, rm } from 'node:fs/promises';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { waitFor } from './waiting';

// A database of this file's own, chosen before any app module reads the configuration.
process.env.DATABASE_PATH = join(fakesDirectory, `segments-confirm-${process.pid}.db`);
process.env.JOB_RETRY_BASE_SECONDS = '0';

const { db, schema } = await import('$lib/server/db');
const { eq, and, isNull } = await import('drizzle-orm');
const { validateChapters } = await import('$lib/captions/segment');
const { parseVtt } = await import('$lib/captions/vtt');
const { DEMO_CLIPS } = await import('../../src/scripts/demo/clips/scripts');
const { planDemoClip } = await import('../../src/scripts/demo/clips/timeline');
const { renderDemoClip } = await import('../../src/scripts/demo/clips/encoding');
const { makeRendition } = await import('$lib/server/media/outputs');
const { probeFile } = await import('$lib/server/media/probe');
const captions = await import('$lib/server/captions');
const segments = await import('$lib/server/segments');
const { cutSegmentHandler, SEGMENT_POSTER_COUNT } = await import('$lib/server/segments/job');
const queue = await import('$lib/server/jobs/queue');
const { startWorker } = await import('$lib/server/jobs/sqlite');
const { HANDLERS } = await import('$lib/server/jobs');
const { headObject, getObjectStream, deleteObject } = await import('$lib/server/storage');
const { recordingKeys } = await import('$lib/server/storage/keys');
const { downloadToFile } = await import('$lib/server/storage/multipart');
const { makeClinic, makeExercise, makePatient, makeProgramme, makeRecording, makeStaff } =
	await import('./factories');
const { storeMedia } = await import('./media-support');

type Cue = import('$lib/captions/types').Cue;
type Recording = import('$lib/server/db/schema').Recording;
type DemoClip = import('../../src/scripts/demo/clips/scripts').DemoClip;

/*
 * Real SQLite, the storage fake and ffmpeg, on a two-exercise variant of the first demo script
 * (small and at 8 frames a second so it renders in seconds). Its plan says where each exercise
 * starts, which is what the suggestions, the cuts and the cues are checked against.
 */

const SOURCE = DEMO_CLIPS[0];
const CLIP: DemoClip = {
	...SOURCE,
	id: `${SOURCE.id}-two`,
	exercises: SOURCE.exercises.slice(0, 2)
};
const FPS = 8;
const FRAME = 1 / FPS;
const plan = planDemoClip(CLIP);
const [FIRST, SECOND] = plan.sections.filter((s) => s.kind === 'exercise');
const script: Cue[] = plan.cues.map((c, i) => ({ id: `cue-${i + 1}`, ...c }));
// A cue across the boundary between the two exercises, which both segments must keep a part of.
// Added in a later captions version: spoken over the pause, it would (rightly) move the suggestion.
const STRADDLE: Cue = {
	id: 'straddle',
	start: SECOND.start - 1,
	end: SECOND.start + 1.5,
	text: 'Rest, then get ready.'
};
const cues: Cue[] = [...script, STRADDLE].sort((a, b) => a.start - b.start);

let clinic: { id: string };
let otherClinic: { id: string };
let clinician: import('./factories').Staff;
let dir: string;
let rendition: string;
let recording: Recording;

/** A ready recording of the clip this file renders (its figures), by the clinician. */
const insertRecording = (title: string, changes: Parameters<typeof makeRecording>[1] = {}) =>
	makeRecording(clinic.id, {
		uploadedBy: clinician.id,
		title,
		durationSeconds: plan.durationSeconds,
		width: 320,
		height: 180,
		audioCodec: 'aac',
		frameRate: FPS,
		hasAudio: true,
		...changes
	});

const storeRendition = (r: Recording) => storeMedia(r, rendition);

function giveCaptions(r: Recording, list: Cue[]) {
	const track = captions.createTrack(r, { kind: 'captions', language: 'en-GB' });
	const saved = captions.saveVersion(track, { baseVersion: 0, cues: list, source: 'import' });
	expect(saved.ok).toBe(true);
}

function current(recordingId: string) {
	return db()
		.select()
		.from(schema.segments)
		.where(and(eq(schema.segments.recordingId, recordingId), isNull(schema.segments.supersededAt)))
		.orderBy(schema.segments.position)
		.all();
}

function settled(recordingId: string) {
	return waitFor('every segment to finish', () => {
		const rows = current(recordingId);
		return rows.length > 0 && rows.every((s) => s.status !== 'cutting') && rows;
	});
}

/**
 * A segment's job once the worker has closed it. The segment is marked ready inside the job, a
 * moment before the worker records the job as done, so asserting on the job right after
 * `settled` races the worker (and lost under load).
 */
function jobFinished(segmentId: string) {
	return waitFor('the job to be closed', () => {
		const job = queue.latestSegmentJobs([segmentId]).get(segmentId);
		return job && job.status !== 'running' && job.status !== 'queued' && job;
	});
}

const worker = (options: Partial<Parameters<typeof startWorker>[0]> = {}) =>
	startWorker({
		handlers: HANDLERS,
		heartbeatSeconds: 0.2,
		pollMs: 100,
		retryBaseSeconds: 0,
		log: () => {},
		...options
	});

const exercisePlan = () => [
	{ title: FIRST.title, start: FIRST.start, end: SECOND.start },
	{ title: SECOND.title, start: SECOND.start, end: plan.durationSeconds }
];

beforeAll(async () => {
	dir = await mkdtemp(join(fakesDirectory, 'segments-confirm-'));
	clinic = makeClinic('Segments test clinic');
	otherClinic = makeClinic('Another clinic');
	clinician = makeStaff(clinic.id);
	const drawn = join(dir, 'clip.mp4');
	await renderDemoClip(CLIP, drawn, { width: 320, height: 180, fps: FPS });
	rendition = join(dir, 'rendition.mp4');
	await makeRendition(drawn, rendition, { durationSeconds: plan.durationSeconds, frameRate: FPS });
	recording = insertRecording('Two knee exercises');
	await storeRendition(recording);
	giveCaptions(recording, script);
}, 120_000);

afterAll(async () => {
	if (dir) await rm(dir, { recursive: true, force: true });
});

describe('suggestions for a stored recording', () => {
	// The detectors run as a job: a worker measures, suggestionsFor only reads and waits.
	let detector: ReturnType<typeof worker>;
	beforeAll(() => {
		detector = worker();
	});
	afterAll(() => detector.stop());

	const storedSignals = (id: string) =>
		db()
			.select()
			.from(schema.recordingSignals)
			.where(eq(schema.recordingSignals.recordingId, id))
			.get();

	it('finds the exercise change from the stored rendition, names it, and keeps what the detectors found', async () => {
		const first = await segments.suggestionsFor(recording, { waitMs: 60_000 });
		expect(first.state).toBe('ready');
		if (first.state !== 'ready') return;
		expect(first.note).toBeNull();
		expect(first.captionsVersion).toBe(1);
		// Known script of the generated clip: exercises start at the cuts planDemoClip reports.
		expect(first.suggestions).toHaveLength(plan.boundaries.length);
		first.suggestions.forEach((s, i) => {
			expect(Math.abs(s.time - plan.boundaries[i])).toBeLessThanOrEqual(0.5);
		});
		expect(first.suggestions.map((s) => s.name)).toEqual([FIRST.title, SECOND.title]);
		// The silences and the scene change are stored against this rendition.
		const stored = storedSignals(recording.id);
		expect(stored?.renditionReadyAt.getTime()).toBe(recording.readyAt?.getTime());
		expect(stored?.silences.length).toBeGreaterThan(0);
		expect(stored?.sceneChanges.length).toBeGreaterThan(0);
		// Asked again (a reload, or after a restart): answered at once from the stored signals.
		const again = await segments.suggestionsFor(recording, { waitMs: 0 });
		expect(again).toEqual(first);
	}, 60_000);

	it('answers at once for a new captions version, reading the new cues without measuring again', async () => {
		const other = insertRecording('Captions changed');
		await storeRendition(other);
		giveCaptions(other, script);
		const before = await segments.suggestionsFor(other, { waitMs: 60_000 });
		expect(before.state).toBe('ready');
		const measuredAt = storedSignals(other.id)?.detectedAt.getTime();
		// The clinician renames the second exercise in the captions and saves.
		const track = captions.firstCaptionsTrack(other.clinicId, other.id)!;
		const renamed = new RegExp(SECOND.title, 'gi');
		const saved = captions.saveVersion(track, {
			baseVersion: 1,
			cues: script.map((c) => ({ ...c, text: c.text.replace(renamed, 'Thigh squeezes') })),
			source: 'edit'
		});
		expect(saved.ok).toBe(true);
		const after = await segments.suggestionsFor(other, { waitMs: 0 });
		expect(after.state).toBe('ready');
		if (after.state !== 'ready' || before.state !== 'ready') return;
		expect(after.captionsVersion).toBe(2);
		expect(before.suggestions.map((s) => s.name)).toEqual([FIRST.title, SECOND.title]);
		expect(after.suggestions.map((s) => s.name)).toEqual([FIRST.title, 'Thigh squeezes']);
		expect(storedSignals(other.id)?.detectedAt.getTime()).toBe(measuredAt);
	}, 60_000);

	it('measures again when the recording has a new rendition', async () => {
		const readyAt = new Date(recording.readyAt!.getTime() + 1000);
		const remade = db()
			.update(schema.recordings)
			.set({ readyAt })
			.where(eq(schema.recordings.id, recording.id))
			.returning()
			.get();
		const early = await segments.suggestionsFor(remade, { waitMs: 0 });
		expect(early).toEqual({ state: 'working', recordingId: recording.id });
		const later = await segments.suggestionsFor(remade, { waitMs: 60_000 });
		expect(later.state).toBe('ready');
		expect(storedSignals(recording.id)?.renditionReadyAt.getTime()).toBe(readyAt.getTime());
		recording = remade;
	}, 60_000);

	it('answers "working" while the detectors run, and refuses a recording not yet ready', async () => {
		segments.forgetSuggestions(recording.id);
		expect(storedSignals(recording.id)).toBeUndefined();
		const early = await segments.suggestionsFor(recording, { waitMs: 0 });
		expect(early).toEqual({ state: 'working', recordingId: recording.id });
		const later = await segments.suggestionsFor(recording, { waitMs: 60_000 });
		expect(later.state).toBe('ready');
		await expect(
			segments.suggestionsFor({ ...recording, status: 'processing' })
		).rejects.toMatchObject({ status: 409 });
	}, 60_000);

	it('falls back to the captions alone, saying so, when the rendition cannot be read', async () => {
		const missing = insertRecording('No rendition in storage');
		giveCaptions(missing, script);
		const answer = await segments.suggestionsFor(missing, { waitMs: 60_000 });
		expect(answer.state).toBe('ready');
		if (answer.state !== 'ready') return;
		expect(answer.note).toMatch(/captions alone/);
		expect(answer.suggestions.map((s) => s.name)).toContain(SECOND.title);
		expect(storedSignals(missing.id)).toBeUndefined();
	}, 60_000);
});

describe('confirming and cutting', () => {
	it('refuses a plan with problems, another clinic and a recording not ready, writing nothing', () => {
		const overlapping = [
			{ title: 'A', start: 10, end: 30 },
			{ title: '', start: 20, end: 40 }
		];
		expect(() => segments.confirmSegments(clinician, recording.id, overlapping)).toThrow(
			expect.objectContaining({
				status: 422,
				problems: [
					'Segment 2 needs a name.',
					'Segment 2 starts before segment 1 ends; segments may not overlap.'
				]
			})
		);
		expect(() =>
			segments.confirmSegments(
				{ ...clinician, clinicId: otherClinic.id },
				recording.id,
				exercisePlan()
			)
		).toThrow(expect.objectContaining({ status: 404 }));
		const waiting = insertRecording('Still processing', { status: 'processing' });
		expect(() => segments.confirmSegments(clinician, waiting.id, exercisePlan())).toThrow(
			expect.objectContaining({ status: 409 })
		);
		expect(db().select().from(schema.segments).all()).toEqual([]);
		// (The suggestions above left their detection jobs; no cut was queued.)
		expect(
			db().select().from(schema.jobs).where(eq(schema.jobs.kind, 'cut-segment')).all()
		).toEqual([]);
	});

	it('cuts each confirmed segment to its own clip, within one frame, with posters and shifted cues', async () => {
		const track = captions.firstCaptionsTrack(clinic.id, recording.id)!;
		expect(captions.saveVersion(track, { baseVersion: 1, cues }).ok).toBe(true);
		const { segments: rows, chapters } = segments.confirmSegments(
			clinician,
			recording.id,
			exercisePlan()
		);
		expect(rows.map((r) => [r.position, r.title, r.status])).toEqual([
			[0, FIRST.title, 'cutting'],
			[1, SECOND.title, 'cutting']
		]);
		const jobs = db().select().from(schema.jobs).where(eq(schema.jobs.kind, 'cut-segment')).all();
		expect(jobs.map((j) => j.segmentId).sort()).toEqual(rows.map((r) => r.id).sort());

		// Cues: shifted so each segment starts at zero; the straddling cue is split in two.
		const [a, b] = rows;
		expect(a.cues[0].start).toBeCloseTo(
			cues.find((c) => c.start >= FIRST.start)!.start - FIRST.start,
			3
		);
		const length = (r: (typeof rows)[number]) => r.endSeconds - r.startSeconds;
		for (const r of rows) {
			for (const cue of r.cues) {
				expect(cue.start).toBeGreaterThanOrEqual(0);
				expect(cue.end).toBeLessThanOrEqual(length(r) + 1e-9);
			}
		}
		// W3C WebVTT keeps times in seconds; the split itself is our rule (shiftAndClip).
		const left = a.cues.find((c) => c.id === 'straddle')!;
		const right = b.cues.find((c) => c.id === 'straddle')!;
		expect(left.start).toBeCloseTo(STRADDLE.start - FIRST.start, 3);
		expect(left.end).toBeCloseTo(SECOND.start - FIRST.start, 3);
		expect(right).toMatchObject({ start: 0, end: 1.5, text: STRADDLE.text });
		expect(a.captionsVersion).toBe(2);
		expect(b.cues.every((c) => c.start < length(b))).toBe(true);

		// Chapters: one per segment, a generated version, valid as W3C WebVTT chapters.
		const chaptersTrack = captions.findTrack(clinic.id, chapters.trackId)!;
		expect(chaptersTrack.kind).toBe('chapters');
		expect(chaptersTrack.language).toBe('en-GB');
		const version = captions.getVersion(chaptersTrack)!;
		expect(version.source).toBe('generated');
		expect(version.cues.map((c) => [c.start, c.end, c.text])).toEqual([
			[FIRST.start, SECOND.start, FIRST.title],
			[SECOND.start, plan.durationSeconds, SECOND.title]
		]);
		expect(validateChapters(version.cues)).toEqual([]);
		const file = captions.exportTrack(chaptersTrack, 'vtt')!;
		const reparsed = parseVtt(file.body);
		expect(reparsed.ok && reparsed.cues.map((c) => c.text)).toEqual([FIRST.title, SECOND.title]);

		const running = worker();
		try {
			const done = await settled(recording.id);
			expect(done.map((s) => [s.status, s.failureReason])).toEqual([
				['ready', null],
				['ready', null]
			]);
			const keys = recordingKeys(clinic.id, recording.id);
			for (const s of done) {
				const stored = await headObject(keys.segment(s.id));
				expect(stored?.contentLength).toBe(s.clipSize);
				const local = join(dir, `check-${s.id}.mp4`);
				expect(await downloadToFile(keys.segment(s.id), local)).toBe(true);
				const probed = await probeFile(local);
				// DESIGN.md §4: cut clips are checked with ffprobe, within one frame of end − start.
				expect(
					Math.abs(probed.durationSeconds - (s.endSeconds - s.startSeconds))
				).toBeLessThanOrEqual(FRAME + 1e-3);
				expect(s.clipDurationSeconds).toBeCloseTo(probed.durationSeconds, 3);
				expect(probed.video?.codec).toBe('h264');
				expect(probed.audio?.codec).toBe('aac');
				expect(s.posterCount).toBe(SEGMENT_POSTER_COUNT);
				for (let n = 0; n < SEGMENT_POSTER_COUNT; n++) {
					const poster = await getObjectStream(keys.segmentPoster(s.id, n));
					expect(poster?.contentLength).toBeGreaterThan(500);
					poster?.body.destroy();
				}
			}
			const jobsAfter = queue.latestSegmentJobs(done.map((s) => s.id));
			expect([...jobsAfter.values()].map((j) => [j.status, j.progress])).toEqual([
				['succeeded', 1],
				['succeeded', 1]
			]);
			const ready = segments.listReadySegments(clinic.id);
			expect(ready.map((s) => s.title)).toEqual([FIRST.title, SECOND.title]);
			expect(segments.listReadySegments(otherClinic.id)).toEqual([]);
		} finally {
			await running.stop();
		}
	}, 120_000);

	it('supersedes on a second confirmation: an exercise keeps its segment and clip, the unused one goes with its files', async () => {
		const before = current(recording.id);
		expect(before).toHaveLength(2);
		const keys = recordingKeys(clinic.id, recording.id);
		expect(await headObject(keys.segmentPoster(before[1].id, 0))).not.toBeNull();
		const exercise = makeExercise(clinic.id, FIRST.title, { segmentId: before[0].id });
		const confirmed = segments.confirmSegments(clinician, recording.id, [
			{ title: `${FIRST.title} and ${SECOND.title}`, start: FIRST.start, end: plan.durationSeconds }
		]);
		const next = confirmed.segments;
		expect(current(recording.id).map((s) => s.id)).toEqual([next[0].id]);
		const kept = segments.findSegment(clinic.id, before[0].id);
		expect(kept?.status).toBe('ready');
		expect(kept?.supersededAt).toBeInstanceOf(Date);
		expect(await headObject(keys.segment(before[0].id))).not.toBeNull();
		// Nothing used the second one: its row, clip and posters are gone.
		expect(confirmed.removed).toEqual([before[1].id]);
		expect(segments.findSegment(clinic.id, before[1].id)).toBeNull();
		await confirmed.filesRemoved;
		expect(await headObject(keys.segment(before[1].id))).toBeNull();
		for (let n = 0; n < SEGMENT_POSTER_COUNT; n++) {
			expect(await headObject(keys.segmentPoster(before[1].id, n))).toBeNull();
		}
		const still = db()
			.select()
			.from(schema.exercises)
			.where(eq(schema.exercises.id, exercise.id))
			.get();
		expect(still?.segmentId).toBe(before[0].id);
		// Chapters follow the newest confirmation.
		const track = segments.findChaptersTrack(recording)!;
		expect(captions.getVersion(track)?.cues.map((c) => c.text)).toEqual([next[0].title]);
		expect(track.currentVersion).toBe(2);

		const running = worker();
		try {
			await settled(recording.id);
		} finally {
			await running.stop();
		}
		expect(segments.listReadySegments(clinic.id).map((s) => s.id)).toEqual([next[0].id]);
		expect(segments.findSegment(otherClinic.id, next[0].id)).toBeNull();

		// A segment sent to the library stays too, though no exercise of the clinic uses it now.
		// A bare submission row, written by hand: all that matters is that it names the segment.
		db()
			.insert(schema.librarySubmissions)
			.values({
				clinicId: clinic.id,
				segmentId: next[0].id,
				snapshot: { title: FIRST.title } as never,
				consentConfirmed: true,
				licence: 'all-rights-reserved',
				attribution: 'Segments test clinic'
			})
			.run();
		const third = segments.confirmSegments(clinician, recording.id, exercisePlan());
		expect(third.removed).toEqual([]);
		expect(segments.findSegment(clinic.id, next[0].id)?.supersededAt).toBeInstanceOf(Date);
		await third.filesRemoved;
		expect(await headObject(keys.segment(next[0].id))).not.toBeNull();
		const finishing = worker();
		try {
			await settled(recording.id);
		} finally {
			await finishing.stop();
		}
	}, 120_000);
});

describe('confirming again before the cuts are made', () => {
	const jobsOf = (segmentIds: string[]) =>
		db()
			.select()
			.from(schema.jobs)
			.all()
			.filter((j) => j.segmentId && segmentIds.includes(j.segmentId));

	it('stops the cuts of the replaced segments: a queued one at once, a running one at its heartbeat', async () => {
		const r = insertRecording('Confirmed twice in a row');
		await storeRendition(r);
		giveCaptions(r, cues);
		const first = segments.confirmSegments(clinician, r.id, exercisePlan()).segments;
		const firstIds = first.map((s) => s.id);
		expect(jobsOf(firstIds).map((j) => j.status)).toEqual(['queued', 'queued']);
		// A worker has started on the second one.
		const running = jobsOf([first[1].id])[0];
		db()
			.update(schema.jobs)
			.set({ status: 'running', lockedBy: 'test-worker', heartbeatAt: new Date(), attempts: 1 })
			.where(eq(schema.jobs.id, running.id))
			.run();

		const second = segments.confirmSegments(clinician, r.id, exercisePlan());
		// The queued cut is cancelled and its segment, never made, is gone with it.
		expect(second.removed).toEqual([first[0].id]);
		expect(segments.findSegment(clinic.id, first[0].id)).toBeNull();
		expect(jobsOf([first[0].id])).toEqual([]);
		// The running one is asked to stop; its segment waits until nothing can write its files.
		const asked = jobsOf([first[1].id])[0];
		expect(asked).toMatchObject({ status: 'running', cancelRequested: true });
		expect(queue.heartbeat(asked.id, 'test-worker', { stage: 'cutting', progress: 0.5 })).toEqual({
			stop: true
		});
		queue.markCancelled(asked.id, 'test-worker');
		expect(segments.findSegment(clinic.id, first[1].id)?.supersededAt).toBeInstanceOf(Date);

		// The next confirmation takes it away; the current segments' cuts were never touched.
		const third = segments.confirmSegments(clinician, r.id, exercisePlan());
		expect(third.removed.sort()).toEqual([first[1].id, ...second.segments.map((s) => s.id)].sort());
		await third.filesRemoved;
		expect(jobsOf(third.segments.map((s) => s.id)).map((j) => j.status)).toEqual([
			'queued',
			'queued'
		]);
		const cutting = worker();
		try {
			const rows = await settled(r.id);
			expect(rows.map((s) => s.status)).toEqual(['ready', 'ready']);
		} finally {
			await cutting.stop();
		}
	}, 120_000);
});

describe('when cutting goes wrong', () => {
	it('an attempt that dies after storing, before marking ready, leaves a retryable job and no ready segment', async () => {
		const r = insertRecording('Crash after storing');
		await storeRendition(r);
		giveCaptions(r, cues);
		const [row] = segments.confirmSegments(clinician, r.id, exercisePlan().slice(0, 1)).segments;
		// Everything but the last write: the process "dies" once the clip and posters are stored.
		const crashing = {
			...cutSegmentHandler,
			run: (
				job: Parameters<typeof cutSegmentHandler.run>[0],
				context: Parameters<typeof cutSegmentHandler.run>[1]
			) =>
				cutSegmentHandler.run(job, {
					...context,
					report(stage, progress) {
						if (stage === 'storing' && progress >= 0.999) throw new Error('simulated crash');
						context.report(stage, progress);
					}
				})
		};
		const first = worker({ handlers: { 'cut-segment': crashing }, retryBaseSeconds: 3600 });
		try {
			await waitFor('the first attempt to fail', () =>
				db()
					.select()
					.from(schema.jobs)
					.where(
						and(eq(schema.jobs.segmentId, row.id), eq(schema.jobs.lastError, 'simulated crash'))
					)
					.get()
			);
		} finally {
			await first.stop();
		}
		const keys = recordingKeys(clinic.id, r.id);
		expect(await headObject(keys.segment(row.id))).not.toBeNull();
		const afterCrash = segments.findSegment(clinic.id, row.id)!;
		expect(afterCrash.status).toBe('cutting');
		expect(afterCrash.clipDurationSeconds).toBeNull();
		const job = queue.latestSegmentJobs([row.id]).get(row.id)!;
		expect(job).toMatchObject({ status: 'queued', attempts: 1, stage: 'waiting to retry' });

		// Its back-off over, the job runs again and finishes.
		db().update(schema.jobs).set({ runAfter: new Date() }).where(eq(schema.jobs.id, job.id)).run();
		const second = worker();
		try {
			const done = await settled(r.id);
			expect(done.map((s) => s.status)).toEqual(['ready']);
			expect(await jobFinished(row.id)).toMatchObject({ status: 'succeeded', attempts: 2 });
		} finally {
			await second.stop();
		}
	}, 120_000);

	it('a worker that died mid-job leaves it running until its heartbeat goes stale; then it is cut', async () => {
		const r = insertRecording('Worker died');
		await storeRendition(r);
		const [row] = segments.confirmSegments(clinician, r.id, exercisePlan().slice(0, 1)).segments;
		const claimed = queue.claim('a-worker-that-died');
		expect(claimed?.segmentId).toBe(row.id);
		// Its last sign of life was two minutes ago.
		db()
			.update(schema.jobs)
			.set({ heartbeatAt: new Date(Date.now() - 120_000) })
			.where(eq(schema.jobs.id, claimed!.id))
			.run();
		expect(segments.findSegment(clinic.id, row.id)?.status).toBe('cutting');
		const running = worker({ staleSeconds: 60 });
		try {
			const [done] = await settled(r.id);
			expect(done.status).toBe('ready');
			// The interrupted attempt does not count against the job.
			expect(await jobFinished(row.id)).toMatchObject({
				status: 'succeeded',
				attempts: 1
			});
		} finally {
			await running.stop();
		}
	}, 120_000);

	it('fails with a reason after the last attempt, and cuts when retried', async () => {
		const r = insertRecording('Rendition missing');
		// No rendition in storage: every attempt stops at the download.
		const [row] = segments.confirmSegments(clinician, r.id, exercisePlan().slice(1)).segments;
		const running = worker();
		try {
			const [failed] = await settled(r.id);
			expect(failed.status).toBe('failed');
			expect(failed.failureReason).toBe(
				'Cutting failed after 3 attempts: The web version of the recording is missing from storage.'
			);
			expect(segments.listReadySegments(clinic.id).some((s) => s.id === row.id)).toBe(false);
			expect(segments.recordingSegments(r).settled).toBe(true);

			await storeRendition(r);
			expect(segments.retrySegment(otherClinic.id, row.id)).toBe(false);
			expect(segments.retrySegment(clinic.id, row.id)).toBe(true);
			expect(segments.retrySegment(clinic.id, row.id)).toBe(false);
			running.nudge();
			const [again] = await settled(r.id);
			expect(again.status).toBe('ready');
			expect(again.failureReason).toBeNull();
		} finally {
			await running.stop();
		}
		await deleteObject(recordingKeys(clinic.id, r.id).rendition);
	}, 120_000);
});

describe('who may watch a segment', () => {
	it('a patient with a published programme using it; not a draft, not another patient', () => {
		const [segment] = current(recording.id);
		const mine = makePatient(clinic.id, 'Patient with a programme');
		const other = makePatient(clinic.id, 'Patient without one');
		const exercise = makeExercise(clinic.id, segment.title, { segmentId: segment.id });
		const { programme } = makeProgramme(mine, [exercise.id], {
			status: 'draft',
			startDate: '2030-01-01'
		});
		expect(segments.patientCanSeeSegment(mine.id, segment.id)).toBe(false);
		db()
			.update(schema.programmes)
			.set({ status: 'published', publishedAt: new Date() })
			.where(eq(schema.programmes.id, programme.id))
			.run();
		expect(segments.patientCanSeeSegment(mine.id, segment.id)).toBe(true);
		expect(segments.patientCanSeeSegment(other.id, segment.id)).toBe(false);
		expect(segments.patientCanSeeSegment(mine.id, crypto.randomUUID())).toBe(false);
		db()
			.update(schema.programmes)
			.set({ status: 'ended' })
			.where(eq(schema.programmes.id, programme.id))
			.run();
		expect(segments.patientCanSeeSegment(mine.id, segment.id)).toBe(false);
	});
});

describe("a segment's captions", () => {
	it('serialise as WebVTT from zero and as a transcript, with tags kept and removed', () => {
		const [segment] = current(recording.id);
		// What is served follows the recording's current track, clipped to the segment.
		const shown = segments.segmentCaptions(segment).cues;
		const vtt = segments.segmentVtt(segment);
		const parsed = parseVtt(vtt.body());
		expect(parsed.ok && parsed.cues.length).toBe(shown.length);
		expect(parsed.ok && parsed.cues[0].start).toBeCloseTo(shown[0].start, 3);
		expect(vtt.etag).toMatch(/^"[A-Za-z0-9_-]{32}"$/);
		expect(segments.segmentTag(segment, 'vtt')).toBe(vtt.etag);
		expect(segments.segmentTag(segment, 'transcript')).not.toBe(vtt.etag);
		// A segment whose recording has no captions track any more shows the copy it was cut with.
		const transcript = segments.segmentTranscript({
			...segment,
			recordingId: crypto.randomUUID(),
			cues: [{ id: 'a', start: 0, end: 1, text: '<i>Slowly</i> now' }]
		});
		expect(transcript.lines).toEqual([
			{ id: 'a', start: 0, end: 1, text: '<i>Slowly</i> now', plain: 'Slowly now' }
		]);
	});
});
