import { execFile } from 'node:child_process';
import { readdirSync, readFileSync } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { shiftAndClip } from '$lib/captions/segment';
import type { Suggestion } from '$lib/captions/suggest';
import type { Cue } from '$lib/captions/types';
import { renderDemoClip } from '../../src/scripts/demo/clips/encoding';
import { DEMO_CLIPS, type DemoClip } from '../../src/scripts/demo/clips/scripts';
import { planDemoClip } from '../../src/scripts/demo/clips/timeline';
import { cutSegment } from '$lib/server/media/cut';
import { detectSceneChanges, detectSilences } from '$lib/server/media/detect';
import { ffmpegPath } from '$lib/server/media/ffmpeg';
import { makeRendition } from '$lib/server/media/outputs';
import { MediaError, probeFile } from '$lib/server/media/probe';
import { suggestForRecording } from '$lib/server/segments/suggest';

/*
 * Real ffmpeg on media this file makes itself: a lavfi pattern with tones and digital silence at
 * known times, and a short generated demo clip whose script says where each exercise begins.
 */

const run = promisify(execFile);
let dir: string;
const file = (name: string) => join(dir, name);

/** Measured figures, printed once at the end for the report. */
const figures: Record<string, string> = {};
const timed = async <T>(label: string, work: () => Promise<T>): Promise<T> => {
	const began = performance.now();
	const result = await work();
	figures[label] = `${((performance.now() - began) / 1000).toFixed(2)} s`;
	return result;
};
const worst = (errors: number[]) => `${Math.max(...errors.map(Math.abs)).toFixed(3)} s`;

// Synthetic media: the picture cuts red → test pattern → blue at 4 s and 8 s; the sound is tone
// and digital silence. The 0.8 s silence is shorter than the detector's minimum and must not count;
// the last silence runs to the end of the file.
const SYNTH_FPS = 25;
const SYNTH_SECONDS = 12;
const SYNTH_CUTS = [4, 8];
const SYNTH_SOUND: [kind: 'tone' | 'quiet', seconds: number][] = [
	['tone', 1],
	['quiet', 0.8],
	['tone', 0.2],
	['quiet', 2],
	['tone', 2.5],
	['quiet', 2.5],
	['tone', 1],
	['quiet', 2]
];
const SYNTH_SILENCES = [
	{ start: 2, end: 4 },
	{ start: 6.5, end: 9 },
	{ start: 10, end: SYNTH_SECONDS }
];

async function makeSynthetic(path: string): Promise<void> {
	const pictures = ['color=c=red:', 'testsrc=', 'color=c=blue:'];
	const inputs = [
		...pictures.flatMap((p) => ['-f', 'lavfi', '-i', `${p}s=320x180:r=${SYNTH_FPS}:d=4`]),
		...SYNTH_SOUND.flatMap(([kind, seconds]) =>
			kind === 'tone'
				? ['-f', 'lavfi', '-i', `sine=f=440:sample_rate=48000:d=${seconds}`]
				: // This build's anullsrc has no duration option; -t limits the input instead.
					['-f', 'lavfi', '-t', String(seconds), '-i', 'anullsrc=r=48000:cl=mono']
		)
	];
	const audio = SYNTH_SOUND.map((_, i) => `[${i + pictures.length}:a]`).join('');
	await run(ffmpegPath(), [
		'-hide_banner',
		'-loglevel',
		'error',
		'-y',
		...inputs,
		'-filter_complex',
		`[0:v][1:v][2:v]concat=n=3:v=1:a=0[v];${audio}concat=n=${SYNTH_SOUND.length}:v=0:a=1[a]`,
		'-map',
		'[v]',
		'-map',
		'[a]',
		'-c:v',
		'libx264',
		'-preset',
		'veryfast',
		'-pix_fmt',
		'yuv420p',
		// Like a rendition from makeRendition: a keyframe every second.
		'-force_key_frames',
		'expr:gte(t,n_forced*1)',
		'-c:a',
		'aac',
		'-movflags',
		'+faststart',
		path
	]);
}

// A three-exercise variant of the first demo script, small and at a low frame rate so it renders
// in a few seconds; its structure (cuts, chimes, pauses) is the full clip's.
const SOURCE_CLIP = DEMO_CLIPS[0];
const DEMO: DemoClip = {
	...SOURCE_CLIP,
	id: `${SOURCE_CLIP.id}-three`,
	exercises: SOURCE_CLIP.exercises.slice(0, 3)
};
const DEMO_FPS = 8;
const plan = planDemoClip(DEMO);
const demoCues: Cue[] = plan.cues.map((c, i) => ({ id: `cue-${i + 1}`, ...c }));

beforeAll(async () => {
	dir = await mkdtemp(join(tmpdir(), 'kinelume-segments-'));
	await timed('make synthetic 12 s clip', () => makeSynthetic(file('synthetic.mp4')));
	await timed('render demo clip', () =>
		renderDemoClip(DEMO, file('demo.mp4'), { width: 320, height: 180, fps: DEMO_FPS })
	);
	await timed('demo rendition (makeRendition)', () =>
		makeRendition(file('demo.mp4'), file('demo-rendition.mp4'), {
			durationSeconds: plan.durationSeconds,
			frameRate: DEMO_FPS
		})
	);
}, 60_000);

afterAll(async () => {
	console.info(`segments: ${JSON.stringify(figures, null, '\t')}`);
	if (dir) await rm(dir, { recursive: true, force: true });
});

describe('detectors on synthetic media with known silences and cuts', () => {
	it('finds each silence of 1.5 s or more within ±0.2 s, closing the last at the end', async () => {
		const found = await timed('detectSilences, 12 s', () => detectSilences(file('synthetic.mp4')));
		// Source of truth: the sound layout this file generated (SYNTH_SOUND).
		expect(found).toHaveLength(SYNTH_SILENCES.length);
		const errors = found.flatMap((s, i) => [
			s.start - SYNTH_SILENCES[i].start,
			s.end - SYNTH_SILENCES[i].end
		]);
		for (const error of errors) expect(Math.abs(error)).toBeLessThanOrEqual(0.2);
		figures['synthetic silence edges, worst error'] = worst(errors);
	});

	it('finds each hard cut within ±0.2 s, and nothing in the moving test pattern', async () => {
		const found = await timed('detectSceneChanges, 12 s', () =>
			detectSceneChanges(file('synthetic.mp4'))
		);
		// Source of truth: the picture layout this file generated (cuts at 4 s and 8 s).
		expect(found.map((c) => c.time)).toHaveLength(SYNTH_CUTS.length);
		const errors = found.map((c, i) => c.time - SYNTH_CUTS[i]);
		for (const error of errors) expect(Math.abs(error)).toBeLessThanOrEqual(0.2);
		for (const change of found) expect(change.score).toBeGreaterThan(0.3);
		figures['synthetic cuts, worst error'] = worst(errors);
	});

	it('finds no silence in a file without sound, and still finds its cuts', async () => {
		const silent = file('no-sound.mp4');
		await run(ffmpegPath(), [
			'-loglevel',
			'error',
			'-y',
			'-i',
			file('synthetic.mp4'),
			'-an',
			'-c',
			'copy',
			silent
		]);
		expect(await detectSilences(silent)).toEqual([]);
		expect((await detectSceneChanges(silent)).map((c) => c.time)).toEqual(SYNTH_CUTS);
	});

	it('keeps to its thresholds: a longer minimum drops the 2 s silences', async () => {
		const found = await detectSilences(file('synthetic.mp4'), { minSeconds: 2.2 });
		expect(found).toHaveLength(1);
		expect(found[0].start).toBeCloseTo(6.5, 1);
	});
});

describe('suggestForRecording on a generated demo clip with its script', () => {
	let suggestions: Suggestion[];

	beforeAll(async () => {
		suggestions = await timed(`suggestForRecording, ${plan.durationSeconds} s clip`, () =>
			suggestForRecording(file('demo-rendition.mp4'), demoCues, plan.durationSeconds)
		);
	}, 30_000);

	it('suggests every true boundary within ±1 s and nothing else above the default score', () => {
		// Source of truth: the known script of the generated clip (planDemoClip's boundaries).
		expect(plan.boundaries).toHaveLength(DEMO.exercises.length);
		expect(suggestions).toHaveLength(plan.boundaries.length);
		const errors = suggestions.map((s, i) => s.time - plan.boundaries[i]);
		for (const error of errors) expect(Math.abs(error)).toBeLessThanOrEqual(1);
		for (const s of suggestions) expect(s.score).toBeGreaterThanOrEqual(0.5);
		figures['demo boundaries, worst error'] = worst(errors);
	});

	it('lists the caption phrase, gap, silence and scene change behind each suggestion', () => {
		expect(suggestions.length).toBeGreaterThan(0);
		for (const s of suggestions) {
			const kinds = new Set(s.signals.map((signal) => signal.kind));
			// Known script of the generated clip: each exercise opens with "Exercise one: …" after
			// a silent pause and a cut to its title card.
			expect(kinds.has('ordinal') || kinds.has('announcing-phrase')).toBe(true);
			expect(kinds).toContain('exercise-name-change');
			expect(kinds).toContain('long-gap');
			expect(kinds).toContain('silence');
			expect(kinds).toContain('scene-change');
			for (const signal of s.signals) expect(signal.detail).not.toBe('');
		}
	});
});

describe('cutSegment', () => {
	it('cuts the start, middle and end of a clip to within one frame, cues shifted to match', async () => {
		const rendition = file('demo-rendition.mp4');
		const frame = 1 / DEMO_FPS;
		// Known script of the generated clip: intro, then one segment per exercise.
		const edges = [0, ...plan.boundaries, plan.durationSeconds];
		const picks = [0, 1, edges.length - 2];
		const errors: number[] = [];
		for (const i of picks) {
			const [start, end] = [edges[i], edges[i + 1]];
			const output = file(`segment-${i}.mp4`);
			const progress: number[] = [];
			const { durationSeconds } = await timed(`cutSegment ${start}–${end} s`, () =>
				cutSegment(rendition, output, { start, end, onProgress: (f) => progress.push(f) })
			);
			const probed = await probeFile(output);
			expect(probed.durationSeconds).toBe(durationSeconds);
			expect(Math.abs(durationSeconds - (end - start))).toBeLessThanOrEqual(frame + 1e-3);
			errors.push(durationSeconds - (end - start));
			expect(progress.at(-1)).toBe(1);

			const section = plan.sections[i];
			const shifted = shiftAndClip(demoCues, start, end);
			const inside = demoCues.filter((c) => c.start >= start && c.end <= end);
			expect(shifted).toHaveLength(inside.length);
			expect(shifted[0].start).toBeCloseTo(inside[0].start - start, 3);
			for (const cue of shifted) expect(cue.end).toBeLessThanOrEqual(end - start + 1e-9);
			// The picture matches the cues: the scripted pause ends the segment, except after the last.
			if (i < edges.length - 2) {
				const silences = await detectSilences(output, { minSeconds: 1.5 });
				const pause = silences.at(-1);
				expect(pause?.start).toBeCloseTo(section.narrationEnd - start, 0);
				expect(Math.abs((pause?.end ?? 0) - durationSeconds)).toBeLessThanOrEqual(0.2);
			}
		}
		figures['demo cut lengths, worst error'] = worst(errors);
	}, 30_000);

	it('keeps a cut off the keyframes exact: the 4 s picture change lands 1.7 s into 2.3–7.7', async () => {
		const output = file('synthetic-cut.mp4');
		const { durationSeconds } = await cutSegment(file('synthetic.mp4'), output, {
			start: 2.3,
			end: 7.7
		});
		expect(Math.abs(durationSeconds - 5.4)).toBeLessThanOrEqual(1 / SYNTH_FPS);
		const changes = await detectSceneChanges(output);
		expect(changes).toHaveLength(1);
		expect(Math.abs(changes[0].time - (4 - 2.3))).toBeLessThanOrEqual(1 / SYNTH_FPS + 1e-3);
		// A cue from 3.5 s to 5 s straddles 4 s: each side keeps its part (W3C WebVTT timing is in
		// seconds; the split is ours).
		const cue: Cue = { id: 'straddle', start: 3.5, end: 5, text: 'Hold.' };
		expect(shiftAndClip([cue], 2.3, 4)).toEqual([{ ...cue, start: 1.2, end: 1.7 }]);
		expect(shiftAndClip([cue], 4, 7.7)).toEqual([{ ...cue, start: 0, end: 1 }]);
	});

	it('refuses a segment that ends before it starts, and leaves no file', async () => {
		await expect(
			cutSegment(file('synthetic.mp4'), file('never.mp4'), { start: 5, end: 5 })
		).rejects.toThrow(RangeError);
		await expect(probeFile(file('never.mp4'))).rejects.toBeInstanceOf(MediaError);
	});

	it('throws a MediaError when the input cannot give the length asked for', async () => {
		const output = file('too-long.mp4');
		await expect(
			cutSegment(file('synthetic.mp4'), output, { start: 10, end: 14 })
		).rejects.toMatchObject({ name: 'MediaError', kind: 'failed' });
		await expect(probeFile(output)).rejects.toBeInstanceOf(MediaError);
	});
});

/** Process ids of ffmpeg processes whose command line names `path` (Linux /proc). */
function ffmpegReading(path: string): number[] {
	return readdirSync('/proc').flatMap((entry) => {
		if (!/^\d+$/.test(entry)) return [];
		try {
			const args = readFileSync(`/proc/${entry}/cmdline`, 'utf8').split('\0');
			return args[0].includes('ffmpeg') && args.includes(path) ? [Number(entry)] : [];
		} catch {
			return []; // the process ended while we looked
		}
	});
}

/** Waits, without a time limit of its own (the test's applies), until `condition` holds. */
async function until(condition: () => boolean): Promise<void> {
	while (!condition()) await new Promise((resolve) => setTimeout(resolve, 5));
}

describe('cancelling detection', () => {
	it('stops suggestion part-way when its signal aborts', async () => {
		const suggest = (signal?: AbortSignal) =>
			suggestForRecording(file('demo-rendition.mp4'), demoCues, plan.durationSeconds, {
				signal
			});
		// Aborts once a detector's ffmpeg is really reading the file (seen in /proc), not after a delay.
		const rendition = file('demo-rendition.mp4');
		const controller = new AbortController();
		const running = suggest(controller.signal);
		await until(() => ffmpegReading(rendition).length > 0);
		controller.abort();
		// runFfmpeg rejects only once the process has exited, so nothing is left decoding.
		await expect(running).rejects.toMatchObject({ name: 'MediaError', kind: 'aborted' });
		expect(ffmpegReading(rendition)).toEqual([]);
	});

	it('kills a detector that has already started ffmpeg', async () => {
		const controller = new AbortController();
		// With hasVideo given there is no probe: ffmpeg is spawned before the call returns.
		const running = detectSceneChanges(file('demo-rendition.mp4'), {
			signal: controller.signal,
			hasVideo: true
		});
		controller.abort();
		await expect(running).rejects.toMatchObject({ name: 'MediaError', kind: 'aborted' });
	});

	it('does not start when the signal is already aborted', async () => {
		await expect(
			detectSceneChanges(file('synthetic.mp4'), { signal: AbortSignal.abort(), hasVideo: true })
		).rejects.toMatchObject({ kind: 'aborted' });
		await expect(
			detectSilences(file('synthetic.mp4'), { signal: AbortSignal.abort() })
		).rejects.toMatchObject({ kind: 'aborted' });
	});
});
