import { suggestBoundaries, type SuggestOptions, type Suggestion } from '$lib/captions/suggest';
import type { Cue } from '$lib/captions/types';
import { detectSceneChanges, detectSilences } from '$lib/server/media/detect';
import { probeFile } from '$lib/server/media/probe';

export interface RecordingSuggestOptions extends Partial<SuggestOptions> {
	signal?: AbortSignal;
	/** For each ffmpeg run; defaults to MEDIA_JOB_TIMEOUT_SECONDS. */
	timeoutSeconds?: number;
	/** Silence threshold in dBFS for the audio detector. Default -45. */
	noiseDb?: number;
	/** Scene score above which the picture counts as changed. Default 0.3. */
	sceneThreshold?: number;
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
	const minSilenceSeconds = suggestOptions.minSilenceSeconds ?? 1.5;

	// The two detectors run side by side; when one fails the other is stopped, not left running.
	const both = new AbortController();
	const stopBoth = () => both.abort();
	signal?.addEventListener('abort', stopBoth, { once: true });
	try {
		if (signal?.aborted) both.abort();
		const run = { signal: both.signal, timeoutSeconds };
		const probe = await probeFile(renditionPath, run);
		const [silences, sceneChanges] = await Promise.all([
			detectSilences(renditionPath, {
				...run,
				noiseDb,
				minSeconds: minSilenceSeconds,
				durationSeconds,
				hasAudio: probe.audio !== null
			}).catch((error: unknown) => {
				both.abort();
				throw error;
			}),
			detectSceneChanges(renditionPath, {
				...run,
				threshold: sceneThreshold,
				hasVideo: probe.video !== null
			}).catch((error: unknown) => {
				both.abort();
				throw error;
			})
		]);
		return suggestBoundaries(
			{ cues, silences, sceneChanges: sceneChanges.map((c) => c.time), durationSeconds },
			{ language: 'en', ...suggestOptions, minSilenceSeconds }
		);
	} finally {
		signal?.removeEventListener('abort', stopBoth);
	}
}
