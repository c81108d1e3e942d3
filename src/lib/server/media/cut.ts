import { mkdir, rm } from 'node:fs/promises';
import { dirname } from 'node:path';
import { MediaError, runFfmpeg, STORAGE_URL_WHITELIST } from './ffmpeg';
import { probeFile } from './probe';
import type { PlannedVersion } from '../../media/ladder';
import { versionOutputs, type MadeVersion } from './outputs';

export interface CutOptions {
	/** Seconds into the input where the segment starts. */
	start: number;
	/** Seconds into the input where the segment ends (exclusive). */
	end: number;
	signal?: AbortSignal;
	/** Defaults to MEDIA_JOB_TIMEOUT_SECONDS. */
	timeoutSeconds?: number;
	/** Fraction of the segment encoded so far, 0 to 1. */
	onProgress?: (fraction: number) => void;
	/**
	 * The ladder's versions (`planVersions` of the recording's displayed size): the smaller ones
	 * are cut in the same run beside `output` (`<name>-<short>.mp4`). Without it, only the largest.
	 */
	versions?: readonly PlannedVersion[];
}

// Without a picture to count frames in, one AAC frame at 48 kHz is the finest step there is.
const FALLBACK_FRAME_SECONDS = 1024 / 48000;

/*
 * No stream-copy variant: measured on this ffmpeg build with a file keyframed every second, a copy
 * of 4.0–8.0 s (both on keyframes) came out 5.08 s long and began about a second early, and 1.0–3.0 s
 * came out 3.10 s, so a copy misses "within one frame" even on keyframe-aligned boundaries.
 */

/**
 * One segment of a recording as its own web clip, frame-accurate: re-encoded (H.264 veryfast,
 * AAC, index first, a keyframe every second like the rendition) from `start` to `end`. Seeking
 * before `-i` is exact when re-encoding: ffmpeg decodes from the keyframe before and drops frames
 * up to `start` (verified on this 2018 build: a cut from 2.3 s shows a 4.0 s picture change at
 * 1.72 s, the frame covering 2.3 s being kept). The result is probed, and a length that differs
 * from end − start by more than one frame is an error; the output is removed whenever it fails.
 * `input` is a local path or a presigned URL of our storage, which ffmpeg reads with ranges: only
 * the index and the part being cut cross the network, not the whole rendition. Every version is
 * capped by the ladder (src/lib/media/ladder.ts) and keyframed at the same instants.
 */
export async function cutSegment(
	input: string,
	output: string,
	opts: CutOptions
): Promise<{ durationSeconds: number; smaller: MadeVersion[] }> {
	const { start, end, signal, timeoutSeconds, onProgress } = opts;
	if (!(Number.isFinite(start) && Number.isFinite(end) && start >= 0 && end > start)) {
		throw new RangeError(`A segment needs 0 ≤ start < end; got ${start} to ${end}.`);
	}
	const wanted = end - start;
	let reported = 0;
	const { args, smaller } = versionOutputs(output, opts.versions, [], ['-t', wanted.toFixed(3)]);
	const check = async (path: string) => {
		const probe = await probeFile(path, { signal, timeoutSeconds });
		const frame = probe.video?.frameRate ? 1 / probe.video.frameRate : FALLBACK_FRAME_SECONDS;
		// A hair of slack: container durations are rounded to the time base.
		if (Math.abs(probe.durationSeconds - wanted) > frame + 1e-3) {
			throw new MediaError(
				'The segment could not be cut to the length asked for.',
				'failed',
				`asked for ${wanted.toFixed(3)} s from ${start.toFixed(3)} s, got ${probe.durationSeconds.toFixed(3)} s (one frame is ${frame.toFixed(3)} s)`
			);
		}
		return probe.durationSeconds;
	};

	await mkdir(dirname(output), { recursive: true });
	try {
		await runFfmpeg(
			[
				'-y',
				'-ss',
				start.toFixed(3),
				...(/^https?:\/\//.test(input) ? ['-protocol_whitelist', STORAGE_URL_WHITELIST] : []),
				'-i',
				input,
				...args
			],
			{
				signal,
				timeoutSeconds,
				onProgress: onProgress
					? ({ outTimeSeconds }) => {
							// 1 is kept for "verified", which the faststart rewrite and the probe stand between.
							const fraction = Math.min(0.99, outTimeSeconds / wanted);
							if (fraction > reported) onProgress((reported = fraction));
						}
					: undefined
			}
		);
		const durationSeconds = await check(output);
		for (const made of smaller) await check(made.path);
		onProgress?.(1);
		return { durationSeconds, smaller };
	} catch (error) {
		for (const path of [output, ...smaller.map((m) => m.path)]) {
			await rm(path, { force: true }).catch(() => {});
		}
		throw error;
	}
}
