import { describe, expect, it } from 'vitest';
import type { Cue } from '$lib/captions/types';
import { Studio } from './studio.svelte';

const cue = (id: string, start: number, end: number, text: string): Cue => ({
	id,
	start,
	end,
	text
});

describe('Studio.fixAll', () => {
	it('fixes every finding of a kind as one undo step, saved once, and says why the rest stayed', () => {
		// BBC common practice (no BBC figure): about 1 s on screen for the shortest caption.
		const studio = new Studio({
			cues: [
				cue('a', 0, 0.5, 'Rest.'),
				cue('b', 3, 3.4, 'Lift.'),
				cue('c', 3.4, 6, 'And lower it slowly.'),
				cue('d', 8, 8.5, 'Good.')
			],
			duration: 20,
			frameRate: 25,
			profileId: 'bbc'
		});
		const saved: number[][] = [];
		studio.onEdit = (cues) => saved.push(cues.map((c) => c.end));
		const before = studio.cues;

		const result = studio.fixAll('too-short');
		expect(result?.fixed).toBe(2);
		expect(studio.cues.map((c) => c.end)).toEqual([1, 3.4, 6, 9]);
		expect(result?.unfixed).toEqual({
			[studio.cues[1].key]:
				'The next cue starts as it ends, so there is no free time to show it longer.'
		});
		expect(saved).toEqual([[1, 3.4, 6, 9]]);
		expect(studio.findings.map((f) => `${f.index}:${f.kind}`)).toEqual(['1:too-short']);

		studio.undo();
		expect(studio.cues).toBe(before);
		expect(studio.history.canUndo).toBe(false);
	});

	it('waits while a kept draft waits for an answer', () => {
		const studio = new Studio({
			cues: [cue('a', 0, 0.5, 'Rest.'), cue('b', 3, 3.5, 'Lift.')],
			duration: 20,
			frameRate: null,
			profileId: 'bbc'
		});
		studio.locked = true;
		expect(studio.fixAll('too-short')).toBeNull();
		expect(studio.note).toMatch(/restore/);
		expect(studio.cues.map((c) => c.end)).toEqual([0.5, 3.5]);
	});
});
