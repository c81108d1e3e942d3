/**
 * Segment detection as a job: ffmpeg's silencedetect and scene score over a recording's whole
 * rendition, run by a worker (`detect-signals`), never by a request. It is queued when processing
 * makes the rendition and again on demand when the stored result is missing; either way there is
 * one job per rendition and detector settings (its unique key), whichever process asks first, so
 * two app processes asking at once still measure once. What it finds is kept in
 * recording_signals, which the suggestions read.
 *
 * No request-bound imports here: the stand-alone worker process loads this module.
 */
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { and, eq, lte, ne } from 'drizzle-orm';
import { config } from '../config';
import { db } from '../db';
import { jobs, recordings, recordingSignals, type Job, type Recording } from '../db/schema';
import * as queue from '../jobs/queue';
import type { JobContext, JobHandler } from '../jobs/engine';
import { recordingKeys } from '../storage/keys';
import { downloadToFile } from '../storage/multipart';
import { detectMediaSignals, signalSettings, type MediaSignals } from './suggest';

/** The detector settings in use; signals measured with others are measured again. */
export const SIGNAL_SETTINGS = signalSettings();

/** Attempts a detection gets (a second one after the queue's back-off) before it counts as failed. */
export const DETECTION_ATTEMPTS = 2;

/** A failed detection is tried again, on demand, once it is this old. */
export const FAILED_DETECTION_RETRY_MS = 10 * 60 * 1000;

type Rendition = Pick<Recording, 'id' | 'readyAt'>;

/** The detection job's unique key: one per rendition (its ready time) and detector settings. */
export function detectionKey(recording: Rendition): string {
	return `detect-signals:${recording.id}:${recording.readyAt?.getTime() ?? 0}:${SIGNAL_SETTINGS}`;
}

type Tx = Parameters<Parameters<ReturnType<typeof db>['transaction']>[0]>[0];

/** Queues the rendition's detection unless it is already queued, running or done. */
export function queueDetection(recording: Rendition, tx: Tx | ReturnType<typeof db> = db()): Job {
	return queue.enqueueOnce(
		{
			kind: 'detect-signals',
			recordingId: recording.id,
			uniqueKey: detectionKey(recording),
			maxAttempts: DETECTION_ATTEMPTS
		},
		tx
	);
}

/** The detectors' findings stored for this rendition with today's settings, or null. */
export function storedSignals(recording: Recording): MediaSignals | null {
	const row = db()
		.select()
		.from(recordingSignals)
		.where(eq(recordingSignals.recordingId, recording.id))
		.get();
	if (!row || row.settings !== SIGNAL_SETTINGS) return null;
	if (row.renditionReadyAt.getTime() !== (recording.readyAt?.getTime() ?? 0)) return null;
	return { silences: row.silences, sceneChanges: row.sceneChanges };
}

export type DetectionState =
	| { state: 'ready'; signals: MediaSignals }
	| { state: 'working' }
	| { state: 'failed'; reason: string | null };

/**
 * Where the rendition's detection stands, for a reader; asks for it when it is missing. Only
 * reads and queues: the measuring is the worker's. A detection that failed is asked for again
 * once FAILED_DETECTION_RETRY_MS have passed; a job that finished without storing anything
 * (its results were forgotten since) is queued again.
 */
export function detectionState(recording: Recording, now = Date.now()): DetectionState {
	const stored = storedSignals(recording);
	if (stored) return { state: 'ready', signals: stored };
	const job = queueDetection(recording);
	if (job.status === 'failed') {
		const failedAt = job.finishedAt?.getTime() ?? 0;
		if (now - failedAt < FAILED_DETECTION_RETRY_MS)
			return { state: 'failed', reason: job.lastError };
		queue.requeue(job.id, ['failed']);
	} else if (job.status === 'succeeded' || job.status === 'cancelled') {
		// Finished, yet nothing stored: read once more (it may have just landed), else measure again.
		const landed = storedSignals(recording);
		if (landed) return { state: 'ready', signals: landed };
		queue.requeue(job.id, ['succeeded', 'cancelled']);
	}
	return { state: 'working' };
}

/** Forgets what the detectors found, and their jobs (tests, and asking for a fresh measurement). */
export function forgetSignals(recordingId?: string): void {
	const signalRows = db().delete(recordingSignals);
	(recordingId
		? signalRows.where(eq(recordingSignals.recordingId, recordingId))
		: signalRows
	).run();
	// A running detection is left to finish; it stores what it finds.
	const finished = and(eq(jobs.kind, 'detect-signals'), ne(jobs.status, 'running'));
	db()
		.delete(jobs)
		.where(recordingId ? and(finished, eq(jobs.recordingId, recordingId)) : finished)
		.run();
}

/** What a worker needs to measure a rendition: where it is, how long, and which one it is. */
interface DetectionInput {
	recordingId: string;
	clinicId: string;
	durationSeconds: number;
	renditionReadyAt: number;
}

/**
 * A job whose rendition has since been replaced (or whose recording is gone or no longer ready)
 * has nothing to do: the newer rendition has its own job.
 */
function prepareDetection(job: Job): DetectionInput | null {
	const recording = db().select().from(recordings).where(eq(recordings.id, job.recordingId)).get();
	if (!recording || recording.status !== 'ready' || job.uniqueKey !== detectionKey(recording)) {
		return null;
	}
	return {
		recordingId: recording.id,
		clinicId: recording.clinicId,
		durationSeconds: recording.durationSeconds,
		renditionReadyAt: recording.readyAt?.getTime() ?? 0
	};
}

/** The job: downloads the rendition to a scratch folder and runs both detectors over it. */
async function detectSignals(
	input: DetectionInput,
	context: JobContext
): Promise<MediaSignals & { renditionReadyAt: number }> {
	const { signal } = context;
	const dir = await mkdtemp(join(config().MEDIA_WORK_DIR || tmpdir(), 'kinelume-detect-'));
	try {
		context.report('downloading', 0);
		const rendition = join(dir, 'rendition.mp4');
		const keys = recordingKeys(input.clinicId, input.recordingId);
		if (!(await downloadToFile(keys.rendition, rendition, signal))) {
			throw new Error('The web version of this recording is missing from storage.');
		}
		signal.throwIfAborted();
		context.report('detecting', 0.2);
		const found = await detectMediaSignals(rendition, input.durationSeconds, { signal });
		signal.throwIfAborted();
		context.report('done', 1);
		return { ...found, renditionReadyAt: input.renditionReadyAt };
	} finally {
		await rm(dir, { recursive: true, force: true });
	}
}

/** Stores what the detectors found for the rendition they measured. */
function storeSignals(job: Job, found: MediaSignals & { renditionReadyAt: number }): void {
	const values = {
		renditionReadyAt: new Date(found.renditionReadyAt),
		settings: SIGNAL_SETTINGS,
		silences: found.silences,
		sceneChanges: found.sceneChanges,
		detectedAt: new Date()
	};
	db()
		.insert(recordingSignals)
		.values({ recordingId: job.recordingId, ...values })
		.onConflictDoUpdate({
			target: recordingSignals.recordingId,
			set: values,
			// Never over what a newer rendition's job stored meanwhile.
			setWhere: lte(recordingSignals.renditionReadyAt, values.renditionReadyAt)
		})
		.run();
}

export const detectSignalsHandler: JobHandler<
	DetectionInput,
	MediaSignals & { renditionReadyAt: number }
> = {
	prepare: prepareDetection,
	run: detectSignals,
	apply: storeSignals,
	failed(job, reason) {
		// The suggestions then come from the captions alone and say so; nothing else to mark.
		console.error(`[segments] detection for recording ${job.recordingId} failed: ${reason}`);
	}
};
