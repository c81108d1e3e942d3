import { join, resolve } from 'node:path';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Suggestion } from '$lib/captions/suggest';
import { ensureDemoClips } from '../../src/scripts/demo/clips/encoding';
import { DEMO_CLIPS } from '../../src/scripts/demo/clips/scripts';
import { planDemoClip } from '../../src/scripts/demo/clips/timeline';
import { demoSegmentPlan, UNCONFIRMED_DEMO_CLIP } from '../../src/scripts/demo/segments';
import { makeRendition } from '$lib/server/media/outputs';
import { suggestForRecording } from '$lib/server/segments/suggest';

/*
 * The demo's own clips, drawn at the demo's own size and frame rate, through the same rendition
 * the app makes: the suggestions must land on the exercises the clip scripts know. Drawn clips are
 * kept (by script hash) in tests/.run so a second run only reads them.
 */

const CACHE = resolve('tests/.run/demo-clips');
const TOLERANCE_SECONDS = 0.5;
let scratch: string;
const results = new Map<string, { suggestions: Suggestion[]; durationSeconds: number }>();

beforeAll(async () => {
	scratch = await mkdtemp(join(tmpdir(), 'kinelume-segments-demo-'));
	const clips = await ensureDemoClips(CACHE);
	for (const { clip, path, durationSeconds, cues } of clips) {
		const rendition = join(scratch, `${clip.id}.mp4`);
		await makeRendition(path, rendition, { durationSeconds, frameRate: 12 });
		const suggestions = await suggestForRecording(
			rendition,
			cues.map((c, i) => ({ id: String(i + 1), ...c })),
			durationSeconds
		);
		results.set(clip.id, { suggestions, durationSeconds });
	}
}, 600_000);

afterAll(async () => {
	const worst = DEMO_CLIPS.map((clip) => {
		const { boundaries } = planDemoClip(clip);
		const found = results.get(clip.id)?.suggestions ?? [];
		return `${clip.id}: ${Math.max(...found.map((s, i) => Math.abs(s.time - (boundaries[i] ?? Infinity)))).toFixed(3)} s`;
	});
	console.info(`demo suggestions, worst distance from the script: ${worst.join(', ')}`);
	if (scratch) await rm(scratch, { recursive: true, force: true });
});

describe.each(DEMO_CLIPS.map((clip) => [clip.title, clip] as const))(
	'demo clip “%s”',
	(_, clip) => {
		const plan = planDemoClip(clip);
		const exercises = plan.sections.filter((s) => s.kind === 'exercise');

		it(`suggests each exercise change within ${TOLERANCE_SECONDS} s, named as the script names it`, () => {
			const { suggestions } = results.get(clip.id)!;
			// Source of truth: the clip's script (planDemoClip), where every exercise starts with a cut.
			expect(suggestions.map((s) => s.time)).toHaveLength(plan.boundaries.length);
			suggestions.forEach((s, i) => {
				expect(
					Math.abs(s.time - plan.boundaries[i]),
					`${s.time} vs ${plan.boundaries[i]}`
				).toBeLessThanOrEqual(TOLERANCE_SECONDS);
			});
			expect(suggestions.map((s) => s.name)).toEqual(exercises.map((e) => e.title));
		});

		it('gives the demo one segment per exercise, from the suggestions, the introduction left out', () => {
			const { suggestions, durationSeconds } = results.get(clip.id)!;
			const segments = demoSegmentPlan(clip, suggestions, durationSeconds);
			expect(segments.map((s) => s.title)).toEqual(exercises.map((e) => e.title));
			segments.forEach((s, i) => {
				expect(s.start).toBe(suggestions[i].time);
				expect(Math.abs(s.start - exercises[i].start)).toBeLessThanOrEqual(TOLERANCE_SECONDS);
				expect(s.end).toBe(i + 1 < segments.length ? segments[i + 1].start : durationSeconds);
			});
		});
	}
);

describe('the demo plan', () => {
	it('falls back to the script where no suggestion is near, and leaves one clip for the clinician', () => {
		const clip = DEMO_CLIPS[0];
		const plan = planDemoClip(clip);
		const segments = demoSegmentPlan(clip, [], plan.durationSeconds);
		expect(segments.map((s) => s.start)).toEqual(plan.boundaries);
		expect(DEMO_CLIPS.map((c) => c.id)).toContain(UNCONFIRMED_DEMO_CLIP);
	});
});
