import { runFfmpeg } from './ffmpeg';
import { probeFile } from './probe';

/*
 * The detectors read ffmpeg's frame metadata printed to stdout (`metadata=mode=print:file=-`)
 * rather than the filters' log lines on stderr: those are info-level, which the runner silences,
 * and the runner keeps only the last 16 KB of stderr, so a long recording would silently lose its
 * early findings. silencedetect and select write the same values into each frame's metadata.
 */

export interface DetectOptions {
	signal?: AbortSignal;
	/** Defaults to MEDIA_JOB_TIMEOUT_SECONDS. */
	timeoutSeconds?: number;
}

export interface SilenceOptions extends DetectOptions {
	/** Quieter than this (dBFS) counts as silence. Default -45. */
	noiseDb?: number;
	/** Shorter quiet is ignored. Default 1.5 s. */
	minSeconds?: number;
	/** Closes a silence that runs to the end. With `hasAudio`, spares a probe of the file. */
	durationSeconds?: number;
	hasAudio?: boolean;
}

export interface SceneOptions extends DetectOptions {
	/** Scene scores above this (0–1) count as a change of picture. Default 0.3. */
	threshold?: number;
	/** From the probe; the file is probed when not given. */
	hasVideo?: boolean;
}

export interface Silence {
	start: number;
	end: number;
}

export interface SceneChange {
	/** Where the new picture's first frame is shown, in seconds. */
	time: number;
	score: number;
}

interface MetadataFrame {
	ptsTime: number;
	values: Map<string, string>;
}

/** Splits `metadata=mode=print` output into frames: a `frame:… pts_time:…` line, then key=value lines. */
function metadataFrames(text: string): MetadataFrame[] {
	const frames: MetadataFrame[] = [];
	for (const line of text.split('\n')) {
		const header = /^frame:\s*\d+\s+pts:\s*\S+\s+pts_time:\s*(\S+)/.exec(line);
		if (header) {
			frames.push({ ptsTime: Number(header[1]), values: new Map() });
			continue;
		}
		const equals = line.indexOf('=');
		const frame = frames.at(-1);
		if (frame && equals > 0) frame.values.set(line.slice(0, equals), line.slice(equals + 1).trim());
	}
	return frames;
}

const finite = (value: string | undefined): number | null => {
	const parsed = value === undefined ? Number.NaN : Number(value);
	return Number.isFinite(parsed) ? parsed : null;
};

/**
 * Stretches of the first audio track quieter than `noiseDb` for at least `minSeconds`
 * (ffmpeg silencedetect), in time order. A silence still open when the sound ends is closed at
 * the recording's duration. A file without sound has no silences.
 */
export async function detectSilences(input: string, opts: SilenceOptions = {}): Promise<Silence[]> {
	const { noiseDb = -45, minSeconds = 1.5, signal, timeoutSeconds } = opts;
	if (!(minSeconds > 0)) throw new RangeError('minSeconds must be above 0');
	if (!Number.isFinite(noiseDb)) throw new RangeError('noiseDb must be a number of decibels');
	let { durationSeconds, hasAudio } = opts;
	if (durationSeconds === undefined || hasAudio === undefined) {
		const probe = await probeFile(input, { signal, timeoutSeconds });
		durationSeconds ??= probe.durationSeconds;
		hasAudio ??= probe.audio !== null;
	}
	// ffmpeg refuses to run with nothing to decode.
	if (!hasAudio) return [];
	const { stdout } = await runFfmpeg(
		[
			'-i',
			input,
			'-map',
			'0:a:0',
			'-vn',
			'-sn',
			'-dn',
			'-af',
			`silencedetect=noise=${noiseDb}dB:d=${minSeconds},ametadata=mode=print:file=-`,
			'-f',
			'null',
			'-'
		],
		{ signal, timeoutSeconds }
	);

	const silences: Silence[] = [];
	let open: number | null = null;
	for (const frame of metadataFrames(stdout)) {
		const start = finite(frame.values.get('lavfi.silence_start'));
		const end = finite(frame.values.get('lavfi.silence_end'));
		// One frame can end a silence and, in principle, report the next one's start.
		if (end !== null && open !== null) {
			silences.push({ start: open, end: Math.max(open, end) });
			open = null;
		}
		if (start !== null) open = Math.max(0, start);
	}
	// This ffmpeg build reports no end for a silence that lasts until the sound stops.
	if (open !== null && durationSeconds > open) {
		silences.push({ start: open, end: durationSeconds });
	}
	return silences;
}

/**
 * Frames of the first video track whose scene score (ffmpeg's select filter) exceeds
 * `threshold`, in time order, with their scores. A file without picture has none.
 */
export async function detectSceneChanges(
	input: string,
	opts: SceneOptions = {}
): Promise<SceneChange[]> {
	const { threshold = 0.3, signal, timeoutSeconds } = opts;
	if (!(threshold >= 0 && threshold <= 1))
		throw new RangeError('threshold must be between 0 and 1');
	const hasVideo =
		opts.hasVideo ?? (await probeFile(input, { signal, timeoutSeconds })).video !== null;
	if (!hasVideo) return [];
	const { stdout } = await runFfmpeg(
		[
			'-i',
			input,
			'-map',
			'0:v:0',
			'-an',
			'-sn',
			'-dn',
			'-vf',
			`select='gt(scene,${threshold})',metadata=mode=print:file=-`,
			'-f',
			'null',
			'-'
		],
		{ signal, timeoutSeconds }
	);
	const changes: SceneChange[] = [];
	for (const frame of metadataFrames(stdout)) {
		const score = finite(frame.values.get('lavfi.scene_score'));
		if (score !== null && Number.isFinite(frame.ptsTime)) {
			changes.push({ time: frame.ptsTime, score });
		}
	}
	return changes.sort((a, b) => a.time - b.time);
}
