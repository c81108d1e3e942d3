/**
 * Encodes demo clips to H.264/AAC MP4 through the app's ffmpeg runner (so FFMPEG_PATH and the
 * binary choice apply), and keeps rendered clips in a folder so unchanged scripts are not drawn
 * again. Frames are drawn in this process and piped to ffmpeg's stdin.
 */
import { createHash } from 'node:crypto';
import { existsSync } from 'node:fs';
import { mkdir, mkdtemp, readdir, readFile, rename, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runFfmpeg } from '../../../lib/server/media/ffmpeg';
import { rgbaFrames } from './drawing';
import { DEMO_CLIPS, type DemoClip, type DemoCue, type DemoSection } from './scripts';
import { SAMPLE_RATE, soundtrack } from './sound';
import { planDemoClip } from './timeline';

export interface RenderOptions {
	width?: number;
	height?: number;
	fps?: number;
	onProgress?: (fraction: number) => void;
}

export interface DemoRenderResult {
	durationSeconds: number;
	cues: DemoCue[];
	sections: DemoSection[];
}

// Bump when the drawing or sound changes, so cached clips are rendered again.
const RENDERER_VERSION = 7;

/** Renders one clip to an MP4 at outputPath; resolves with the timing the captions need. */
export async function renderDemoClip(
	clip: DemoClip,
	outputPath: string,
	opts: RenderOptions = {}
): Promise<DemoRenderResult> {
	const width = opts.width ?? 640;
	const height = opts.height ?? 360;
	const fps = opts.fps ?? 12;
	if (width % 2 || height % 2) throw new Error('Width and height must be even for 4:2:0 video.');
	const plan = planDemoClip(clip);
	const frameCount = Math.round(plan.durationSeconds * fps);

	const scratch = await mkdtemp(join(tmpdir(), 'kinelume-demo-'));
	try {
		const audioPath = join(scratch, 'audio.s16le');
		await writeFile(audioPath, soundtrack(plan));

		const args = [
			'-y',
			'-f',
			'rawvideo',
			'-pix_fmt',
			'rgba',
			'-s',
			`${width}x${height}`,
			'-r',
			String(fps),
			'-i',
			'pipe:0',
			'-f',
			's16le',
			'-ar',
			String(SAMPLE_RATE),
			'-ac',
			'1',
			'-i',
			audioPath,
			'-map',
			'0:v',
			'-map',
			'1:a',
			'-c:v',
			'libx264',
			'-preset',
			'veryfast',
			'-tune',
			'animation',
			'-crf',
			'22',
			'-pix_fmt',
			'yuv420p',
			// Keyframes every 2 s keep later stream-copy cuts close to the asked-for times.
			'-g',
			String(fps * 2),
			'-c:a',
			'aac',
			'-b:a',
			'96k',
			'-metadata',
			`title=${clip.title}`,
			'-metadata',
			'comment=Kinelume generated demonstration; invented scenario',
			'-movflags',
			'+faststart',
			'-f',
			'mp4',
			outputPath
		];
		const draw = rgbaFrames(clip, plan, width, height);
		async function* frames() {
			for (let i = 0; i < frameCount; i++) {
				yield draw(i / fps);
				if (opts.onProgress && i % fps === 0) opts.onProgress(i / frameCount);
			}
		}
		// The renderer runs outside the app (no database), so it takes no machine slot.
		await runFfmpeg(args, { input: frames(), slot: false });
		opts.onProgress?.(1);
		return { durationSeconds: plan.durationSeconds, cues: plan.cues, sections: plan.sections };
	} finally {
		await rm(scratch, { recursive: true, force: true });
	}
}

// ---------------------------------------------------------------------------------------------
// Cache

export interface EnsuredDemoClip extends DemoRenderResult {
	clip: DemoClip;
	path: string;
	/** Whether this call rendered it (false: it came from the cache). */
	rendered: boolean;
	seconds: number;
}

export function demoClipHash(clip: DemoClip, opts: Omit<RenderOptions, 'onProgress'> = {}): string {
	const key = JSON.stringify({
		v: RENDERER_VERSION,
		clip,
		width: opts.width ?? 640,
		height: opts.height ?? 360,
		fps: opts.fps ?? 12
	});
	return createHash('sha256').update(key).digest('hex').slice(0, 16);
}

/**
 * Renders each missing clip into dir, one at a time (two cores: ffmpeg already uses the second
 * while this process draws). Files are named by a hash of script and renderer, so a re-run with
 * nothing changed only reads the sidecar JSON; stale versions of a clip are removed.
 */
export async function ensureDemoClips(
	dir: string,
	opts: Omit<RenderOptions, 'onProgress'> & {
		clips?: DemoClip[];
		onProgress?: (clip: DemoClip, fraction: number) => void;
	} = {}
): Promise<EnsuredDemoClip[]> {
	await mkdir(dir, { recursive: true });
	const results: EnsuredDemoClip[] = [];
	for (const clip of opts.clips ?? DEMO_CLIPS) {
		const began = performance.now();
		const base = `${clip.id}-${demoClipHash(clip, opts)}`;
		const path = join(dir, `${base}.mp4`);
		const sidecar = join(dir, `${base}.json`);
		let result: DemoRenderResult | null = null;
		let rendered = false;
		if (existsSync(path) && existsSync(sidecar)) {
			try {
				result = JSON.parse(await readFile(sidecar, 'utf8')) as DemoRenderResult;
			} catch {
				result = null;
			}
		}
		if (!result) {
			const partial = join(dir, `${base}.partial-${process.pid}.mp4`);
			try {
				result = await renderDemoClip(clip, partial, {
					width: opts.width,
					height: opts.height,
					fps: opts.fps,
					onProgress: opts.onProgress ? (f) => opts.onProgress?.(clip, f) : undefined
				});
				await rename(partial, path);
			} finally {
				await rm(partial, { force: true });
			}
			await writeFile(sidecar, JSON.stringify(result, null, '\t'));
			rendered = true;
			const stale = new RegExp(`^${clip.id.replace(/[^\w-]/g, '')}-[0-9a-f]{16}\\.(mp4|json)$`);
			for (const name of await readdir(dir)) {
				if (stale.test(name) && !name.startsWith(base)) {
					await rm(join(dir, name), { force: true });
				}
			}
		}
		results.push({
			...result,
			clip,
			path,
			rendered,
			seconds: (performance.now() - began) / 1000
		});
	}
	return results;
}
