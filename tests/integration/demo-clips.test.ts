import { spawn } from 'node:child_process';
import { mkdtemp, rm, stat } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ffmpegPath, ffprobePath } from '$lib/server/media/ffmpeg';
import {
	ensureDemoClips,
	renderDemoClip,
	type DemoRenderResult
} from '../../src/scripts/demo/clips/encoding';
import { DEMO_CLIPS, type DemoClip } from '../../src/scripts/demo/clips/scripts';
import { CAPTION_LIMITS, planDemoClip } from '../../src/scripts/demo/clips/timeline';

const FPS = 12;
const FRAME = 1 / FPS;

// An intro, a pause, then one exercise: the smallest script with a silence and a cut in it.
const SHORT: DemoClip = {
	id: 'renderer-check',
	title: 'Renderer check — one exercise',
	clinic: 'Alder Street Community Clinic',
	pauseSeconds: 3,
	intro: ['A short check of the renderer.'],
	exercises: [
		{
			title: 'Ankle pumps',
			setting: 'supine',
			motion: 'ankle-pump',
			announce: 'Ankle pumps.',
			cues: ['Point your toes, then pull them up.'],
			reps: 2,
			repSeconds: 2
		}
	]
};

function run(bin: string, args: string[]): Promise<{ stdout: string; stderr: string }> {
	return new Promise((resolve, reject) => {
		const child = spawn(bin, args, { stdio: ['ignore', 'pipe', 'pipe'] });
		let stdout = '';
		let stderr = '';
		child.stdout.on('data', (d: Buffer) => (stdout += d.toString()));
		child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
		child.on('error', reject);
		child.on('close', (code) =>
			code === 0
				? resolve({ stdout, stderr })
				: reject(new Error(`${bin} exited ${code}: ${stderr}`))
		);
	});
}

interface Probe {
	format: { duration: string; format_name: string };
	streams: {
		codec_type: string;
		codec_name: string;
		width?: number;
		height?: number;
		duration?: string;
	}[];
}

async function probe(path: string): Promise<Probe> {
	const { stdout } = await run(ffprobePath(), [
		'-v',
		'error',
		'-show_format',
		'-show_streams',
		'-of',
		'json',
		path
	]);
	return JSON.parse(stdout) as Probe;
}

async function silences(path: string): Promise<{ start: number; end: number }[]> {
	const { stderr } = await run(ffmpegPath(), [
		'-hide_banner',
		'-nostats',
		'-i',
		path,
		'-af',
		'silencedetect=noise=-50dB:d=1.5',
		'-f',
		'null',
		'-'
	]);
	const starts = [...stderr.matchAll(/silence_start: ([\d.]+)/g)].map((m) => Number(m[1]));
	const ends = [...stderr.matchAll(/silence_end: ([\d.]+)/g)].map((m) => Number(m[1]));
	return starts.map((start, i) => ({ start, end: ends[i] ?? Number.POSITIVE_INFINITY }));
}

async function sceneChanges(path: string, threshold: number): Promise<number[]> {
	const { stderr } = await run(ffmpegPath(), [
		'-hide_banner',
		'-nostats',
		'-i',
		path,
		'-an',
		'-vf',
		`select='gt(scene,${threshold})',showinfo`,
		'-f',
		'null',
		'-'
	]);
	return [...stderr.matchAll(/pts_time:([\d.]+)/g)].map((m) => Number(m[1]));
}

describe('demo clip scripts', () => {
	it.each(DEMO_CLIPS.map((c) => [c.id, c] as const))(
		'%s keeps to the caption guidelines and lasts 2–4 minutes',
		(_id, clip) => {
			const plan = planDemoClip(clip);
			expect(plan.durationSeconds).toBeGreaterThanOrEqual(120);
			expect(plan.durationSeconds).toBeLessThanOrEqual(240);
			expect(clip.exercises.length).toBeGreaterThanOrEqual(3);
			let previousEnd = Number.NaN;
			for (const cue of plan.cues) {
				const lines = cue.text.split('\n');
				const seconds = cue.end - cue.start;
				const words = cue.text.split(/\s+/).filter(Boolean).length;
				// BBC Subtitle Guidelines (REFERENCES.md): ≤ 2 lines of ≤ 37 characters, ≤ 160 wpm.
				expect(lines.length).toBeLessThanOrEqual(CAPTION_LIMITS.lines);
				for (const line of lines)
					expect(line.length).toBeLessThanOrEqual(CAPTION_LIMITS.charsPerLine);
				expect((words / seconds) * 60).toBeLessThanOrEqual(CAPTION_LIMITS.maxWordsPerMinute);
				expect(seconds).toBeGreaterThanOrEqual(CAPTION_LIMITS.minSeconds);
				// Same guidelines: cues either touch or leave at least a second between them.
				const gap = cue.start - previousEnd;
				if (!Number.isNaN(gap)) expect(gap >= -1e-9 && (gap < 1e-6 || gap >= 1)).toBe(true);
				previousEnd = cue.end;
			}
			// Common practice for home exercise material: the caution is spoken, not only shown.
			const spoken = plan.cues
				.map((c) => c.text.replace(/\n/g, ' '))
				.join(' ')
				.toLowerCase();
			expect(spoken).toMatch(/stop if/);
			expect(spoken).toMatch(/clinician/);
			expect(plan.pauses).toHaveLength(clip.exercises.length);
			for (const p of plan.pauses) expect(p.end - p.start).toBeGreaterThanOrEqual(3);
		}
	);
});

describe('renderDemoClip (short script, 320×180)', () => {
	let dir: string;
	let path: string;
	let result: DemoRenderResult;
	const plan = planDemoClip(SHORT);

	beforeAll(async () => {
		dir = await mkdtemp(join(tmpdir(), 'kinelume-demo-test-'));
		path = join(dir, 'short.mp4');
		const progress: number[] = [];
		result = await renderDemoClip(SHORT, path, {
			width: 320,
			height: 180,
			fps: FPS,
			onProgress: (f) => progress.push(f)
		});
		expect(progress.at(-1)).toBe(1);
	}, 60_000);

	afterAll(async () => {
		if (dir) await rm(dir, { recursive: true, force: true });
	});

	it('returns the scripted timing and cues', () => {
		expect(result.durationSeconds).toBe(plan.durationSeconds);
		expect(result.durationSeconds).toBeGreaterThan(10);
		expect(result.durationSeconds).toBeLessThan(16);
		expect(result.cues.map((c) => c.text)).toEqual([
			'A short check of the renderer.',
			'Ankle pumps.',
			'Point your toes, then pull them up.'
		]);
	});

	it('is H.264 video and AAC audio lasting the script, within one frame', async () => {
		const info = await probe(path);
		expect(info.format.format_name).toContain('mp4');
		const video = info.streams.find((s) => s.codec_type === 'video');
		const audio = info.streams.find((s) => s.codec_type === 'audio');
		expect(video?.codec_name).toBe('h264');
		expect([video?.width, video?.height]).toEqual([320, 180]);
		expect(audio?.codec_name).toBe('aac');
		expect(Math.abs(Number(info.format.duration) - plan.durationSeconds)).toBeLessThanOrEqual(
			FRAME
		);
		expect(Math.abs(Number(video?.duration) - plan.durationSeconds)).toBeLessThanOrEqual(FRAME);
	});

	it('is silent in the scripted pauses and nowhere in the narration', async () => {
		const found = await silences(path);
		for (const pause of plan.pauses) {
			const match = found.find((s) => Math.abs(s.start - pause.start) <= 0.3);
			expect(match, `silence near ${pause.start}`).toBeDefined();
			expect(Math.abs((match?.end ?? 0) - pause.end)).toBeLessThanOrEqual(0.3);
		}
		// Anything else can only be the tail after the last words.
		const narrationEnd = plan.sections.at(-1)!.narrationEnd;
		const others = found.filter(
			(s) => !plan.pauses.some((p) => Math.abs(s.start - p.start) <= 0.3)
		);
		for (const s of others) expect(s.start).toBeGreaterThanOrEqual(narrationEnd - 0.3);
	});

	it('cuts the picture at each boundary and nowhere else', async () => {
		const cuts = await sceneChanges(path, 0.3);
		expect(plan.boundaries.length).toBeGreaterThan(0);
		for (const b of plan.boundaries) {
			expect(
				cuts.some((t) => Math.abs(t - b) <= FRAME + 0.01),
				`cut near ${b}`
			).toBe(true);
		}
		for (const t of cuts) {
			expect(
				plan.boundaries.some((b) => Math.abs(t - b) <= FRAME + 0.01),
				`stray cut at ${t}`
			).toBe(true);
		}
	});
});

describe('ensureDemoClips', () => {
	it('renders once, then answers from the cache', async () => {
		const dir = await mkdtemp(join(tmpdir(), 'kinelume-demo-cache-'));
		try {
			const opts = { clips: [SHORT], width: 160, height: 90, fps: 8 };
			const [first] = await ensureDemoClips(dir, opts);
			expect(first.rendered).toBe(true);
			const written = await stat(first.path);
			const [second] = await ensureDemoClips(dir, opts);
			expect(second.rendered).toBe(false);
			expect(second.path).toBe(first.path);
			expect(second.cues).toEqual(first.cues);
			// Answered from the cache: the clip on disk is the same file, not written again.
			const after = await stat(second.path);
			expect([after.ino, after.mtimeMs]).toEqual([written.ino, written.mtimeMs]);
		} finally {
			await rm(dir, { recursive: true, force: true });
		}
	}, 60_000);
});
