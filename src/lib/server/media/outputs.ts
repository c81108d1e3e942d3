import { mkdir, mkdtemp, readdir, rm, stat } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import { LADDER, TOP_LONG, TOP_SHORT, type PlannedVersion, type Rung } from '../../media/ladder';
import { MediaError, runFfmpeg } from './ffmpeg';
import { probeFile } from './probe';
import { grabStill } from './stills';
import type { SpriteLayout } from '../../media/sprite';

/** What every output maker accepts besides its own options. */
export interface JobControl {
	signal?: AbortSignal;
	/** Defaults to MEDIA_JOB_TIMEOUT_SECONDS. */
	timeoutSeconds?: number;
}

/** The web rendition fits this box, turned to match the picture's orientation. */
const BOX_LONG = TOP_LONG;
const BOX_SHORT = TOP_SHORT;
const MAX_FRAME_RATE = 60;

/**
 * An ffmpeg scale filter that fits the displayed picture (after autorotation, with non-square
 * pixels made square) inside a long × short box turned to its orientation, never enlarging it,
 * at even dimensions as yuv420p requires.
 */
function fitBoxFilter(long: number, short: number): string {
	const dw = 'iw*sar';
	const factor = `if(gte(${dw},ih),min(1,min(${long}/(${dw}),${short}/ih)),min(1,min(${short}/(${dw}),${long}/ih)))`;
	return `scale=w='max(2,round(${dw}*${factor}/2)*2)':h='max(2,round(ih*${factor}/2)*2)',setsar=1`;
}

/** Width at most `maxWidth`, height following the displayed aspect, both even. */
function fitWidthFilter(maxWidth: number): string {
	return `scale=w='min(${maxWidth},max(2,round(iw*sar/2)*2))':h='max(2,round(ow*ih/(iw*sar)/2)*2)',setsar=1`;
}

/** Just the run controls, so option objects carrying other fields are not handed to ffmpeg. */
function control({ signal, timeoutSeconds }: JobControl): JobControl {
	return { signal, timeoutSeconds };
}

async function removeQuietly(path: string): Promise<void> {
	await rm(path, { force: true, recursive: true }).catch(() => {});
}

async function nonEmptyFile(path: string): Promise<boolean> {
	return stat(path).then(
		(s) => s.isFile() && s.size > 0,
		() => false
	);
}

export interface RenditionOptions extends JobControl {
	durationSeconds: number;
	/** The source's frame rate from its probe; read from the file when not given. */
	frameRate?: number;
	onProgress?: (fraction: number) => void;
	/**
	 * The ladder's versions to make (`planVersions` of the picture's displayed size): the smaller
	 * ones are written beside `output` as `<name>-<short>.mp4`, in the same ffmpeg run. Without
	 * it only the largest is made (capped all the same).
	 */
	versions?: readonly PlannedVersion[];
}

/** A smaller version made beside the largest. */
export interface MadeVersion {
	short: number;
	path: string;
}

/** Where the smaller version `short` of `output` is written: `clip.mp4` → `clip-360.mp4`. */
export function versionPath(output: string, short: number): string {
	return output.replace(/(\.mp4)?$/, `-${short}.mp4`);
}

/**
 * Keep the first picture and sound streams only, and none of the source's metadata or chapters
 * (which also drops the location a phone stores).
 */
export const FIRST_PICTURE_AND_SOUND_ARGS: readonly string[] = [
	'-map',
	'0:v:0',
	'-map',
	'0:a:0?',
	'-map_metadata',
	'-1',
	'-map_chapters',
	'-1',
	'-sn',
	'-dn'
];

/** An MP4 that starts playing before it has fully downloaded (index at the front). */
export const WEB_MP4_MUX_ARGS: readonly string[] = [
	// Phone files with sparse streams otherwise stop with "Too many packets buffered".
	'-max_muxing_queue_size',
	'1024',
	'-movflags',
	'+faststart',
	'-f',
	'mp4'
];

/**
 * How every web video Kinelume makes is encoded (renditions and segment cuts alike): H.264 high
 * profile with a keyframe every second, so that later cuts and seeks stay close, and AAC sound.
 */
export const WEB_ENCODING_ARGS: readonly string[] = [
	'-c:v',
	'libx264',
	'-preset',
	'veryfast',
	'-crf',
	'23',
	'-pix_fmt',
	'yuv420p',
	'-profile:v',
	'high',
	'-force_key_frames',
	'expr:gte(t,n_forced*1)',
	'-sc_threshold',
	'0',
	// Autorotation has already turned the pixels; a leftover tag would turn them again.
	'-metadata:s:v:0',
	'rotate=0',
	'-c:a',
	'aac',
	'-b:a',
	'128k'
];

/** The picture and sound streams of input 0 besides the video map (the filter graph gives the picture). */
const SOUND_AND_NO_METADATA_ARGS: readonly string[] = FIRST_PICTURE_AND_SOUND_ARGS.slice(2);

/**
 * One version's encoder settings: the web encoding (CRF 23, a keyframe every second at the same
 * instants in every version, so a player can change version at any second) with the rung's
 * bitrate cap (a VBV buffer of twice the cap: short peaks allowed, no long ones) and sound rate.
 */
export function versionEncodingArgs(rung: Rung): string[] {
	const args = [...WEB_ENCODING_ARGS];
	args.splice(args.indexOf('-b:a') + 1, 1, `${rung.audioKbps}k`);
	return [
		...args,
		'-maxrate',
		`${rung.videoKbps}k`,
		'-bufsize',
		`${rung.videoKbps * 2}k`,
		'-ac',
		'2'
	];
}

/** The largest version's rung when no plan is given: the 720 cap. */
const TOP_RUNG: PlannedVersion = { short: BOX_SHORT, videoKbps: 2200, audioKbps: 128, top: true };

/** Even long side of the box for a short side (16:9). */
function boxLong(short: number): number {
	return Math.round((short * 16) / 9 / 2) * 2;
}

/**
 * The ffmpeg arguments for encoding `versions` of input 0 in one run (one decode, one encode per
 * version): a filter graph splitting the picture (after `pre` filters) into each version's box,
 * then one MP4 output per version with `perOutput` arguments (such as `-t`) before its settings.
 * The largest version goes to `output`, the others beside it. Returns the arguments and what the
 * smaller versions will be.
 */
export function versionOutputs(
	output: string,
	versions: readonly PlannedVersion[] | undefined,
	pre: string[],
	perOutput: string[] = []
): { args: string[]; smaller: MadeVersion[] } {
	const plan = versions?.length ? versions : [TOP_RUNG];
	const labels = plan.map((_, i) => `[v${i}]`);
	const boxes = plan.map((v) =>
		v.top ? fitBoxFilter(BOX_LONG, BOX_SHORT) : fitBoxFilter(boxLong(v.short), v.short)
	);
	const head = pre.length ? `[0:v:0]${pre.join(',')},` : '[0:v:0]';
	const graph =
		plan.length === 1
			? `${head}${boxes[0]}${labels[0]}`
			: `${head}split=${plan.length}${plan.map((_, i) => `[s${i}]`).join('')};` +
				boxes.map((box, i) => `[s${i}]${box}${labels[i]}`).join(';');
	const args = ['-filter_complex', graph];
	const smaller: MadeVersion[] = [];
	for (const [i, version] of plan.entries()) {
		const path = version.top ? output : versionPath(output, version.short);
		if (!version.top) smaller.push({ short: version.short, path });
		args.push(
			...perOutput,
			'-map',
			labels[i],
			...SOUND_AND_NO_METADATA_ARGS,
			...versionEncodingArgs(version),
			...WEB_MP4_MUX_ARGS,
			path
		);
	}
	return { args, smaller };
}

/**
 * The web rendition: H.264 (yuv420p) and AAC 128k in MP4 with the index first, fitted into
 * 1280 × 720 turned to the picture's orientation, rotation applied to the pixels, a keyframe
 * every second (so stream-copied segment cuts land within a second of where asked), frame rate
 * kept up to 60. A source without sound gets a rendition without sound: a made-up silent track
 * would make the silence detector report the whole recording as one pause, and the player and
 * waveform handle a missing track. Metadata is dropped (phones store the place of recording).
 * Capped by the ladder (src/lib/media/ladder.ts); with `opts.versions`, the smaller versions are
 * made in the same run and returned. The output files are removed if the run fails.
 */
export async function makeRendition(
	input: string,
	output: string,
	opts: RenditionOptions
): Promise<{ smaller: MadeVersion[] }> {
	const frameRate = opts.frameRate ?? (await probeFile(input, control(opts))).video?.frameRate ?? 0;
	// Dropping frames before scaling spares the scaler the frames that would be thrown away.
	const { args, smaller } = versionOutputs(
		output,
		opts.versions,
		frameRate > MAX_FRAME_RATE ? [`fps=${MAX_FRAME_RATE}`] : []
	);

	let reported = 0;
	const report = (fraction: number) => {
		// Progress only moves forward, whatever order ffmpeg's reports come in.
		if (!opts.onProgress || fraction <= reported) return;
		reported = fraction;
		opts.onProgress(fraction);
	};

	await mkdir(dirname(output), { recursive: true });
	try {
		await runFfmpeg(['-y', '-i', input, ...args], {
			...control(opts),
			onProgress: opts.onProgress
				? ({ outTimeSeconds }) => {
						if (opts.durationSeconds > 0) {
							// 1 is kept for "finished", which the faststart rewrite still stands between.
							report(Math.min(0.99, outTimeSeconds / opts.durationSeconds));
						}
					}
				: undefined
		});
	} catch (error) {
		await removeQuietly(output);
		for (const made of smaller) await removeQuietly(made.path);
		throw error;
	}
	report(1);
	return { smaller };
}

export interface PosterOptions extends JobControl {
	durationSeconds: number;
	count?: number;
	/** Widest a still may be (the default: the largest version's 1280). */
	maxWidth?: number;
	/**
	 * Fit the stills in the box of this ladder short side instead (360: 640 × 360, turned to the
	 * picture), never enlarged: a patient's poster is the first thing a slow phone link carries.
	 */
	fitShort?: number;
	/** JPEG quality on ffmpeg's 2–31 scale (lower is better; stills default to 3). */
	quality?: number;
}

/** Segment posters: the smallest version's box, at a quality where a busy picture stays clear. */
export const PHONE_POSTER = { fitShort: LADDER[0].short, quality: 5 } as const;

/** Where posters are taken, as fractions of the duration: 10%, 50%, 90% for three. */
export function posterFractions(count: number): number[] {
	if (count <= 1) return [0.5];
	return Array.from({ length: count }, (_, i) => 0.1 + (0.8 * i) / (count - 1));
}

/**
 * JPEG stills at 10%/50%/90% of the recording (for three), written as `1.jpg`, `2.jpg`, … in
 * `outputDir`, at most 1280 px wide. Returns their paths in time order.
 */
export async function makePosters(
	input: string,
	outputDir: string,
	opts: PosterOptions
): Promise<string[]> {
	const { durationSeconds, count = 3, maxWidth = BOX_LONG, fitShort, quality } = opts;
	const filter = fitShort ? fitBoxFilter(boxLong(fitShort), fitShort) : fitWidthFilter(maxWidth);
	await mkdir(outputDir, { recursive: true });
	const paths: string[] = [];
	for (const [index, fraction] of posterFractions(count).entries()) {
		const path = join(outputDir, `${index + 1}.jpg`);
		const grab = (seconds: number) =>
			grabStill(input, seconds, path, { filter, quality, ...control(opts) });
		await grab(Math.max(0, durationSeconds * fraction));
		// A soundtrack that outlasts the picture can put a late seek past the last frame.
		if (!(await nonEmptyFile(path))) await grab(0);
		if (!(await nonEmptyFile(path))) {
			throw new MediaError('No still picture could be taken from this video.', 'failed');
		}
		paths.push(path);
	}
	return paths;
}

export interface SpriteOptions extends JobControl {
	durationSeconds: number;
	intervalSeconds?: number;
	tileWidth?: number;
	/**
	 * Decode keyframes only: many times faster, and exact when the input is a rendition from
	 * makeRendition (a keyframe every second) and the interval is whole seconds. Wrong for
	 * originals, whose keyframes can be seconds apart.
	 */
	keyframesOnly?: boolean;
}

const SPRITE_TARGET_TILES = 100;
// Keeps the sheet far below JPEG's 65,535-pixel limit whatever interval a caller asks for.
const SPRITE_MAX_TILES = 400;
const SPRITE_COLUMNS = 10;

/** Seconds between sprite tiles: whole seconds, at least 1, about 100 tiles at most. */
export function spriteInterval(durationSeconds: number): number {
	return Math.max(1, Math.ceil(durationSeconds / SPRITE_TARGET_TILES));
}

/**
 * One JPEG sheet of thumbnails for the timeline, tile i showing the first frame at or after
 * i × interval. Thumbnails are taken first and counted, then tiled, so the layout returned is
 * exactly what the sheet holds even when the picture ends before the sound.
 */
export async function makeSprite(
	input: string,
	output: string,
	opts: SpriteOptions
): Promise<SpriteLayout> {
	const { durationSeconds, tileWidth: requestedWidth = 160 } = opts;
	const tileWidth = Math.max(2, Math.round(requestedWidth / 2) * 2);
	const intervalSeconds = Math.max(
		opts.intervalSeconds ?? spriteInterval(durationSeconds),
		durationSeconds / SPRITE_MAX_TILES,
		0.04
	);

	const scratch = await mkdtemp(join(dirname(output), '.sprite-'));
	try {
		await runFfmpeg(
			[
				'-y',
				...(opts.keyframesOnly ? ['-skip_frame', 'nokey'] : []),
				'-i',
				input,
				'-map',
				'0:v:0',
				'-vf',
				`select='gte(t,selected_n*${intervalSeconds})',scale=w=${tileWidth}:h='max(2,round(ow*ih/(iw*sar)/2)*2)',setsar=1`,
				'-vsync',
				'vfr',
				'-q:v',
				'4',
				'-f',
				'image2',
				join(scratch, '%05d.jpg')
			],
			control(opts)
		);
		const thumbs = (await readdir(scratch)).filter((name) => name.endsWith('.jpg')).sort();
		const count = Math.min(thumbs.length, SPRITE_MAX_TILES);
		if (count === 0) {
			throw new MediaError('No thumbnails could be taken from this video.', 'failed');
		}
		const { video } = await probeFile(join(scratch, thumbs[0]), control(opts));
		const tileHeight = video?.height ?? 0;
		const columns = Math.min(count, SPRITE_COLUMNS);
		const rows = Math.ceil(count / columns);

		await mkdir(dirname(output), { recursive: true });
		await runFfmpeg(
			[
				'-y',
				'-framerate',
				'1',
				'-i',
				join(scratch, '%05d.jpg'),
				'-vf',
				`tile=${columns}x${rows}:nb_frames=${count}`,
				'-frames:v',
				'1',
				'-q:v',
				'4',
				'-f',
				'image2',
				'-update',
				'1',
				output
			],
			control(opts)
		);
		return { columns, rows, intervalSeconds, tileWidth, tileHeight, count };
	} catch (error) {
		await removeQuietly(output);
		throw error;
	} finally {
		await removeQuietly(scratch);
	}
}

export interface WaveformOptions extends JobControl {
	peaksPerSecond?: number;
	/** From the probe; the file is probed when not given. */
	hasAudio?: boolean;
}

export interface Waveform {
	peaksPerSecond: number;
	/** Loudest sample in each bucket, 0 (silence) to 1 (full scale). */
	peaks: number[];
}

const WAVEFORM_SAMPLE_RATE = 8000;

/**
 * Peaks for the studio's waveform: the first audio track mixed to mono at 8 kHz, streamed from
 * ffmpeg as 16-bit PCM and reduced to the largest absolute sample per bucket. A recording without
 * sound has no peaks.
 */
export async function makeWaveform(input: string, opts: WaveformOptions = {}): Promise<Waveform> {
	const { peaksPerSecond = 20 } = opts;
	if (!(peaksPerSecond > 0 && peaksPerSecond <= WAVEFORM_SAMPLE_RATE)) {
		throw new RangeError(`peaksPerSecond must be between 0 and ${WAVEFORM_SAMPLE_RATE}`);
	}
	const hasAudio = opts.hasAudio ?? (await probeFile(input, control(opts))).audio !== null;
	if (!hasAudio) return { peaksPerSecond, peaks: [] };

	const peaks: number[] = [];
	let sampleIndex = 0;
	let carry: Buffer | null = null;
	const take = (chunk: Buffer) => {
		// Samples are two bytes; a chunk may end halfway through one.
		const data: Buffer = carry ? Buffer.concat([carry, chunk]) : chunk;
		const whole = data.length - (data.length % 2);
		carry = whole < data.length ? data.subarray(whole) : null;
		for (let offset = 0; offset < whole; offset += 2) {
			const bucket = Math.floor((sampleIndex * peaksPerSecond) / WAVEFORM_SAMPLE_RATE);
			const level = Math.abs(data.readInt16LE(offset)) / 32768;
			while (peaks.length <= bucket) peaks.push(0);
			if (level > peaks[bucket]) peaks[bucket] = level;
			sampleIndex++;
		}
	};

	await runFfmpeg(
		[
			'-i',
			input,
			'-map',
			'0:a:0',
			'-vn',
			'-sn',
			'-dn',
			'-ac',
			'1',
			'-ar',
			String(WAVEFORM_SAMPLE_RATE),
			'-c:a',
			'pcm_s16le',
			'-f',
			's16le',
			'pipe:1'
		],
		{ ...control(opts), onStdout: take }
	);
	// Three decimals are finer than any waveform is drawn and keep the JSON small.
	return { peaksPerSecond, peaks: peaks.map((peak) => Math.round(peak * 1000) / 1000) };
}
