import { suggestBoundaries, type SuggestOptions, type Suggestion } from '$lib/captions/suggest';
import type { Cue } from '$lib/captions/types';
import { detectSceneChanges, detectSilences, type Silence } from '$lib/server/media/detect';
import { probeFile } from '$lib/server/media/probe';

export interface DetectorOptions {
	signal?: AbortSignal;
	/** For each ffmpeg run; defaults to MEDIA_JOB_TIMEOUT_SECONDS. */
	timeoutSeconds?: number;
	/** Silence threshold in dBFS for the audio detector. Default -45. */
	noiseDb?: number;
	/** Shorter quiet is not a silence. Default 1.5 s. */
	minSilenceSeconds?: number;
	/** Scene score above which the picture counts as changed. Default 0.3. */
	sceneThreshold?: number;
}

export interface RecordingSuggestOptions extends Partial<SuggestOptions>, DetectorOptions {}

export interface MediaSignals {
	silences: Silence[];
	/** Times at which the picture changed. */
	sceneChanges: number[];
}

export const DEFAULT_NOISE_DB = -45;
export const DEFAULT_MIN_SILENCE_SECONDS = 1.5;
export const DEFAULT_SCENE_THRESHOLD = 0.3;

/** The detector settings in words, stored beside what they found (recording_signals.settings). */
export function signalSettings(opts: DetectorOptions = {}): string {
	const noise = opts.noiseDb ?? DEFAULT_NOISE_DB;
	const minSilence = opts.minSilenceSeconds ?? DEFAULT_MIN_SILENCE_SECONDS;
	const scene = opts.sceneThreshold ?? DEFAULT_SCENE_THRESHOLD;
	return `silence ${noise} dB ${minSilence} s; scene ${scene}`;
}

/**
 * Silences and scene changes in one rendition (two ffmpeg passes, side by side). When one
 * detector fails the other is stopped, not left running.
 */
export async function detectMediaSignals(
	renditionPath: string,
	durationSeconds: number,
	opts: DetectorOptions = {}
): Promise<MediaSignals> {
	const { signal, timeoutSeconds, noiseDb = DEFAULT_NOISE_DB } = opts;
	const { sceneThreshold = DEFAULT_SCENE_THRESHOLD } = opts;
	const minSeconds = opts.minSilenceSeconds ?? DEFAULT_MIN_SILENCE_SECONDS;
	const both = new AbortController();
	const stopBoth = () => both.abort();
	signal?.addEventListener('abort', stopBoth, { once: true });
	try {
		if (signal?.aborted) both.abort();
		const run = { signal: both.signal, timeoutSeconds };
		const probe = await probeFile(renditionPath, run);
		// The first failure stops the other detector; both are awaited, so no ffmpeg outlives the
		// call, and the first failure (not the other's "cancelled") is what the caller hears.
		const failures: unknown[] = [];
		const stopOnFailure = (error: unknown): never => {
			failures.push(error);
			both.abort();
			throw error;
		};
		const [silenceRun, sceneRun] = await Promise.allSettled([
			detectSilences(renditionPath, {
				...run,
				noiseDb,
				minSeconds,
				durationSeconds,
				hasAudio: probe.audio !== null
			}).catch(stopOnFailure),
			detectSceneChanges(renditionPath, {
				...run,
				threshold: sceneThreshold,
				hasVideo: probe.video !== null
			}).catch(stopOnFailure)
		]);
		if (silenceRun.status === 'rejected' || sceneRun.status === 'rejected') throw failures[0];
		return {
			silences: silenceRun.value.map(({ start, end }) => ({ start, end })),
			sceneChanges: sceneRun.value.map((c) => c.time)
		};
	} finally {
		signal?.removeEventListener('abort', stopBoth);
	}
}

/**
 * Suggested exercise boundaries for one recording: silences and scene changes detected in its
 * rendition, combined with its cues by suggestBoundaries. Each suggestion lists its signals.
 */
export async function suggestForRecording(
	renditionPath: string,
	cues: readonly Cue[],
	durationSeconds: number,
	opts: RecordingSuggestOptions = {}
): Promise<Suggestion[]> {
	const { signal, timeoutSeconds, noiseDb, sceneThreshold, ...suggestOptions } = opts;
	const minSilenceSeconds = suggestOptions.minSilenceSeconds ?? DEFAULT_MIN_SILENCE_SECONDS;
	const found = await detectMediaSignals(renditionPath, durationSeconds, {
		signal,
		timeoutSeconds,
		noiseDb,
		sceneThreshold,
		minSilenceSeconds
	});
	return suggestBoundaries(
		{ cues, ...found, durationSeconds },
		{ language: 'en', ...suggestOptions, minSilenceSeconds }
	);
}
