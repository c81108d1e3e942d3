import { createReadStream } from 'node:fs';
import { mkdtemp, rm, stat } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { eq } from 'drizzle-orm';
import { config } from '../config';
import { db } from '../db';
import { recordings, segments, type Job } from '../db/schema';
import { stageReporter, type JobContext, type JobHandler } from '../jobs/engine';
import { cutSegment } from '../media/cut';
import { makePosters, PHONE_POSTER } from '../media/outputs';
import { planVersions, type StoredVersion } from '../../media/ladder';
import { deleteObject, headObject, presignRead, putObject } from '../storage';
import { recordingKeys } from '../storage/keys';
import { markSegmentFailed, markSegmentReady } from './index';

export const SEGMENT_POSTER_COUNT = 3;

// Share of the job each stage takes, so the bar moves at about the speed work gets done.
const STAGES = [
	['cutting', 0.8],
	['posters', 0.1],
	['storing', 0.1]
] as const;

async function upload(key: string, path: string, contentType: string): Promise<number> {
	const { size } = await stat(path);
	await putObject(key, createReadStream(path), contentType, size);
	return size;
}

/** What a worker needs to cut a segment: where its recording's files are and the cut's ends. */
interface CutInput {
	segmentId: string;
	recordingId: string;
	clinicId: string;
	startSeconds: number;
	endSeconds: number;
	/** The recording's displayed size, for the ladder's versions. */
	width: number;
	height: number;
}

interface CutResult {
	clipDurationSeconds: number;
	clipSize: number;
	clipVersions: StoredVersion[] | null;
	posterCount: number;
	/** What was stored, removed again if the segment went meanwhile. */
	keys: string[];
}

function prepareCut(job: Job): CutInput | null {
	if (!job.segmentId) throw new Error('A cut-segment job needs a segment.');
	const segment = db().select().from(segments).where(eq(segments.id, job.segmentId)).get();
	// Deleted with its recording meanwhile, or already made by an attempt that died after the end.
	if (!segment || segment.status === 'ready') return null;
	const recording = db()
		.select({ clinicId: recordings.clinicId, width: recordings.width, height: recordings.height })
		.from(recordings)
		.where(eq(recordings.id, segment.recordingId))
		.get();
	if (!recording) return null;
	const { startSeconds, endSeconds, recordingId } = segment;
	return {
		segmentId: segment.id,
		recordingId,
		clinicId: recording.clinicId,
		startSeconds,
		endSeconds,
		width: recording.width,
		height: recording.height
	};
}

/**
 * Cuts one confirmed segment from its recording's rendition: the clip (re-encoded, its length
 * verified to a frame by cutSegment) and posters from the clip, both uploaded. Only then does
 * `applyCut` mark the segment ready: an attempt that dies anywhere before leaves the segment
 * `cutting` and the job to be tried again; objects an earlier attempt stored are overwritten.
 */
async function cutSegmentJob(input: CutInput, context: JobContext): Promise<CutResult> {
	const keys = recordingKeys(input.clinicId, input.recordingId);
	const report = stageReporter(context, STAGES);
	const { signal } = context;
	const dir = await mkdtemp(join(config().MEDIA_WORK_DIR || tmpdir(), 'kinelume-cut-'));
	try {
		report('cutting');
		if (!(await headObject(keys.rendition))) {
			throw new Error('The web version of the recording is missing from storage.');
		}
		// ffmpeg reads the rendition from storage with byte ranges (the index, then the part it
		// cuts), so a long recording's segments do not each download the whole file.
		const { MEDIA_JOB_TIMEOUT_SECONDS } = config();
		const rendition = await presignRead(keys.rendition, MEDIA_JOB_TIMEOUT_SECONDS + 60);
		const clip = join(dir, 'segment.mp4');
		// Every version of the ladder in the same run (src/lib/media/ladder.ts).
		const { durationSeconds, smaller } = await cutSegment(rendition, clip, {
			start: input.startSeconds,
			end: input.endSeconds,
			versions: planVersions(input.width, input.height),
			signal,
			onProgress: (fraction) => report('cutting', fraction)
		});
		signal.throwIfAborted();

		report('posters');
		const posters = await makePosters(clip, join(dir, 'posters'), {
			durationSeconds,
			count: SEGMENT_POSTER_COUNT,
			...PHONE_POSTER,
			signal
		});
		signal.throwIfAborted();

		report('storing');
		const clipSize = await upload(keys.segment(input.segmentId), clip, 'video/mp4');
		const stored = [keys.segment(input.segmentId)];
		const clipVersions: StoredVersion[] = [];
		for (const made of smaller) {
			const key = keys.segmentVersion(input.segmentId, made.short);
			clipVersions.push({ short: made.short, size: await upload(key, made.path, 'video/mp4') });
			stored.push(key);
		}
		for (const [index, path] of posters.entries()) {
			const key = keys.segmentPoster(input.segmentId, index);
			await upload(key, path, 'image/jpeg');
			stored.push(key);
		}
		signal.throwIfAborted();
		report('storing', 1);
		return {
			clipDurationSeconds: durationSeconds,
			clipSize,
			clipVersions: clipVersions.length ? clipVersions : null,
			posterCount: posters.length,
			keys: stored
		};
	} finally {
		await rm(dir, { recursive: true, force: true });
	}
}

async function applyCut(job: Job, result: CutResult): Promise<void> {
	const { keys, ...made } = result;
	const marked = job.segmentId !== null && markSegmentReady(job.segmentId, made);
	// Deleted with its recording while we worked: its objects went before ours arrived.
	if (!marked) for (const key of keys) await deleteObject(key);
}

export const cutSegmentHandler: JobHandler<CutInput, CutResult> = {
	prepare: prepareCut,
	run: cutSegmentJob,
	apply: applyCut,
	failed(job, reason) {
		if (job.segmentId) {
			markSegmentFailed(
				job.segmentId,
				`Cutting failed after ${job.attempts} ${job.attempts === 1 ? 'attempt' : 'attempts'}: ${reason}`
			);
		}
	},
	cancelled(job) {
		if (job.segmentId) {
			markSegmentFailed(job.segmentId, 'Cutting was cancelled. Choose “Cut again” to restart it.');
		}
	}
};
