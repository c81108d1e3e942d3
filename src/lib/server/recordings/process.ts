import { createReadStream } from 'node:fs';
import { mkdtemp, rm, stat, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { eq } from 'drizzle-orm';
import { config } from '../config';
import { db } from '../db';
import { recordings, type Job } from '../db/schema';
import type { JobContext, JobHandler } from '../jobs/worker';
import { makePosters, makeRendition, makeSprite, makeWaveform } from '../media/outputs';
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
type Stage = (typeof STAGES)[number][0];

function stageReporter(context: JobContext) {
	return (stage: Stage, fraction = 0) => {
		let before = 0;
		for (const [name, share] of STAGES) {
			if (name === stage) {
				context.report(stage, before + share * Math.max(0, Math.min(1, fraction)));
				return;
			}
			before += share;
		}
	};
}

async function upload(key: string, path: string, contentType: string) {
	const { size } = await stat(path);
	await putObject(key, createReadStream(path), contentType, size);
	return size;
}

/**
 * Turns a stored original into what the web and the studio need: rendition, three posters, a
 * thumbnail strip and waveform peaks, each uploaded under the recording's keys. Works in a
 * scratch folder so any process with the database and storage can run it.
 */
async function processRecording(job: Job, context: JobContext): Promise<void> {
	const recording = db().select().from(recordings).where(eq(recordings.id, job.recordingId)).get();
	if (!recording) return;
	const keys = recordingKeys(recording.clinicId, recording.id);
	const report = stageReporter(context);
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
		const durationSeconds = recording.durationSeconds;
		await makeRendition(original, rendition, {
			durationSeconds,
			frameRate: recording.frameRate ?? undefined,
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
		if (recording.hasAudio) {
			const peaks = await makeWaveform(rendition, { hasAudio: true, signal });
			waveformPath = join(dir, 'waveform.json');
			await writeFile(waveformPath, JSON.stringify(peaks));
		}
		checkpoint();

		report('storing');
		const renditionSize = await upload(keys.rendition, rendition, 'video/mp4');
		for (const [index, path] of posters.entries()) {
			await upload(keys.poster(index), path, 'image/jpeg');
		}
		await upload(keys.sprite, spritePath, 'image/jpeg');
		if (waveformPath) await upload(keys.waveform, waveformPath, 'application/json');
		checkpoint();
		report('storing', 1);

		const readyAt = new Date();
		const updated = db().transaction((tx) => {
			const marked = tx
				.update(recordings)
				.set({
					status: 'ready',
					renditionSize,
					posterCount: posters.length,
					sprite,
					waveformKey: waveformPath ? keys.waveform : null,
					failureReason: null,
					readyAt
				})
				.where(eq(recordings.id, recording.id))
				.run();
			// The segment detectors' pass over the new rendition, queued with it, so the segments
			// page finds their result waiting (segments/detection.ts).
			if (marked.changes > 0) queueDetection({ id: recording.id, readyAt }, tx);
			return marked;
		});
		// Deleted while we worked: its objects went before ours arrived, so remove ours too.
		if (updated.changes === 0) await deletePrefix(keys.prefix);
	} finally {
		await rm(dir, { recursive: true, force: true });
	}
}

export const processRecordingHandler: JobHandler = {
	run: processRecording,
	failed(job, reason) {
		markFailed(job.recordingId, `Processing failed after ${job.attempts} attempts: ${reason}`);
	},
	cancelled(job) {
		markCancelled(job.recordingId);
	}
};
