import { createReadStream } from 'node:fs';
import { mkdtemp, rm, stat, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { eq } from 'drizzle-orm';
import { config } from '../config';
import { db } from '../db';
import { recordings, type Job, type Recording } from '../db/schema';
import { stageReporter, type JobContext, type JobHandler } from '../jobs/engine';
import { makePosters, makeRendition, makeSprite, makeWaveform } from '../media/outputs';
import { planVersions } from '../../media/ladder';
import { deletePrefix, putObject } from '../storage';
import { recordingKeys } from '../storage/keys';
import { downloadToFile } from '../storage/multipart';
import { queueDetection } from '../segments/detection';
import { markCancelled, markFailed } from './index';

export const POSTER_COUNT = 3;

// Share of the whole job each stage takes, so the bar moves at about the speed work gets done.
const STAGES = [
	['downloading', 0.08],
	['rendition', 0.62],
	['posters', 0.06],
	['sprite', 0.1],
	['waveform', 0.06],
	['storing', 0.08]
] as const;

async function upload(key: string, path: string, contentType: string) {
	const { size } = await stat(path);
	await putObject(key, createReadStream(path), contentType, size);
	return size;
}

/** What a worker needs to process a recording: where its files are and what the upload found. */
interface ProcessInput {
	recordingId: string;
	clinicId: string;
	durationSeconds: number;
	frameRate: number | null;
	hasAudio: boolean;
	/** Displayed size, for the ladder's versions. */
	width: number;
	height: number;
}

type ProcessResult = {
	columns: Pick<
		Recording,
		'renditionSize' | 'renditionVersions' | 'posterCount' | 'sprite' | 'waveformKey'
	>;
	/** The key prefix everything was stored under. */
	prefix: string;
};

function prepareProcessing(job: Job): ProcessInput | null {
	const recording = db().select().from(recordings).where(eq(recordings.id, job.recordingId)).get();
	if (!recording) return null;
	const {
		id: recordingId,
		clinicId,
		durationSeconds,
		frameRate,
		hasAudio,
		width,
		height
	} = recording;
	return { recordingId, clinicId, durationSeconds, frameRate, hasAudio, width, height };
}

/**
 * Turns a stored original into what the web and the studio need: rendition, three posters, a
 * thumbnail strip and waveform peaks, each uploaded under the recording's keys. Works in a
 * scratch folder with the storage only, so a worker on any machine can run it.
 */
async function processRecording(input: ProcessInput, context: JobContext): Promise<ProcessResult> {
	const keys = recordingKeys(input.clinicId, input.recordingId);
	const report = stageReporter(context, STAGES);
	const { signal } = context;
	const checkpoint = () => signal.throwIfAborted();
	const dir = await mkdtemp(join(config().MEDIA_WORK_DIR || tmpdir(), 'kinelume-job-'));
	try {
		report('downloading');
		const original = join(dir, 'original');
		if (!(await downloadToFile(keys.original, original, signal))) {
			throw new Error('The original file is missing from storage.');
		}
		checkpoint();

		report('rendition');
		const rendition = join(dir, 'rendition.mp4');
		const { durationSeconds } = input;
		// The ladder's smaller versions come from the same run (src/lib/media/ladder.ts).
		const { smaller } = await makeRendition(original, rendition, {
			durationSeconds,
			frameRate: input.frameRate ?? undefined,
			versions: planVersions(input.width, input.height),
			signal,
			onProgress: (fraction: number) => report('rendition', fraction)
		});
		checkpoint();

		report('posters');
		const posterDir = join(dir, 'posters');
		const posters = await makePosters(rendition, posterDir, {
			durationSeconds,
			count: POSTER_COUNT,
			signal
		});
		checkpoint();

		report('sprite');
		const spritePath = join(dir, 'sprite.jpg');
		// The rendition has a keyframe every second, so decoding keyframes only gives the same
		// sheet about ten times faster.
		const sprite = await makeSprite(rendition, spritePath, {
			durationSeconds,
			keyframesOnly: true,
			signal
		});
		checkpoint();

		report('waveform');
		let waveformPath: string | null = null;
		if (input.hasAudio) {
			const peaks = await makeWaveform(rendition, { hasAudio: true, signal });
			waveformPath = join(dir, 'waveform.json');
			await writeFile(waveformPath, JSON.stringify(peaks));
		}
		checkpoint();

		report('storing');
		const renditionSize = await upload(keys.rendition, rendition, 'video/mp4');
		const renditionVersions = [];
		for (const made of smaller) {
			const size = await upload(keys.renditionVersion(made.short), made.path, 'video/mp4');
			renditionVersions.push({ short: made.short, size });
		}
		for (const [index, path] of posters.entries()) {
			await upload(keys.poster(index), path, 'image/jpeg');
		}
		await upload(keys.sprite, spritePath, 'image/jpeg');
		if (waveformPath) await upload(keys.waveform, waveformPath, 'application/json');
		checkpoint();
		report('storing', 1);
		return {
			columns: {
				renditionSize,
				renditionVersions: renditionVersions.length ? renditionVersions : null,
				posterCount: posters.length,
				sprite,
				waveformKey: waveformPath ? keys.waveform : null
			},
			prefix: keys.prefix
		};
	} finally {
		await rm(dir, { recursive: true, force: true });
	}
}

/** Marks the recording ready with what processing made, and queues its segment detection. */
async function applyProcessing(job: Job, result: ProcessResult): Promise<void> {
	const readyAt = new Date();
	const updated = db().transaction((tx) => {
		const marked = tx
			.update(recordings)
			.set({ status: 'ready', ...result.columns, failureReason: null, readyAt })
			.where(eq(recordings.id, job.recordingId))
			.run();
		// The segment detectors' pass over the new rendition, queued with it, so the segments
		// page finds their result waiting (segments/detection.ts).
		if (marked.changes > 0) queueDetection({ id: job.recordingId, readyAt }, tx);
		return marked;
	});
	// Deleted while we worked: its objects went before ours arrived, so remove ours too.
	if (updated.changes === 0) await deletePrefix(result.prefix);
}

export const processRecordingHandler: JobHandler<ProcessInput, ProcessResult> = {
	prepare: prepareProcessing,
	run: processRecording,
	apply: applyProcessing,
	failed(job, reason) {
		markFailed(job.recordingId, `Processing failed after ${job.attempts} attempts: ${reason}`);
	},
	cancelled(job) {
		markCancelled(job.recordingId);
	}
};
