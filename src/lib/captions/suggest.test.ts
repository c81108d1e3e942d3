import { describe, expect, it } from 'vitest';
import { suggestBoundaries, wordListsFor, type SuggestInput } from './suggest';
import type { Cue } from './types';

const cue = (start: number, end: number, text: string): Cue => ({ id: '', start, end, text });
const kinds = (s: { signals: { kind: string }[] }) => s.signals.map((x) => x.kind).sort();

// A known script for a knee class demonstration (invented): intro, ankle pumps with a hold, heel
// slides, straight leg raises, bridge. Expected boundaries are worked out by hand from the rules.
const script: Cue[] = [
	cue(0.5, 6, 'Welcome. Today we will work on your knee.'),
	cue(9, 13, 'The first exercise is ankle pumps.'),
	cue(13.5, 17, 'Point your toes up, then down.'),
	cue(22, 25, 'Hold for five seconds.'),
	cue(25.5, 29, 'And relax.'),
	cue(32.5, 36, 'Next exercise: heel slides.'),
	cue(36.5, 41, 'Slide your heel toward you, then back.'),
	cue(41.5, 45, 'First, bend the knee a little.'),
	cue(48, 52, 'Now we’ll do straight leg raises.'),
	cue(52.5, 58, 'Lift your leg a hand’s width off the bed.'),
	cue(80, 84, 'The next one is the bridge.'),
	cue(86, 92, 'Lift your hips off the bed.'),
	cue(92.5, 99, 'Lower them slowly.'),
	cue(100, 104, 'Well done. That is all for today.')
];

const media: SuggestInput = {
	cues: script,
	silences: [
		{ start: 6.3, end: 8.8 },
		{ start: 17.2, end: 21.8 },
		{ start: 29.3, end: 32.2 },
		{ start: 58.5, end: 79.5 }
	],
	sceneChanges: [31, 46, 95],
	durationSeconds: 110
};

describe('suggestBoundaries on a known cue script with synthetic silences and cuts', () => {
	const suggestions = suggestBoundaries(media, { language: 'en' });

	it('finds the four exercise boundaries and nothing else', () => {
		expect(suggestions.map((s) => s.time)).toEqual([7.55, 31, 46, 69]);
	});

	it('shows which signals support each suggestion', () => {
		expect(suggestions.map(kinds)).toEqual([
			['exercise-name-change', 'long-gap', 'ordinal', 'silence'],
			['announcing-phrase', 'exercise-name-change', 'long-gap', 'scene-change', 'silence'],
			['announcing-phrase', 'exercise-name-change', 'long-gap', 'scene-change'],
			['announcing-phrase', 'exercise-name-change', 'long-gap', 'silence']
		]);
		const names = suggestions.flatMap((s) =>
			s.signals.filter((x) => x.kind === 'exercise-name-change').map((x) => x.detail)
		);
		expect(names).toEqual([
			'"ankle pumps", the first exercise named',
			'"heel slides" after "ankle pumps"',
			'"straight leg raises" after "heel slides"',
			'"bridge" after "straight leg raises"'
		]);
	});

	it('names the exercise announced at each boundary, for a default title', () => {
		// Worked out by hand from the script above: the words after each announcing or ordinal phrase.
		expect(suggestions.map((s) => s.name)).toEqual([
			'Ankle pumps',
			'Heel slides',
			'Straight leg raises',
			'Bridge'
		]);
	});

	it('gives each signal its phrase or its length, for short labels', () => {
		const first = suggestions[0].signals;
		expect(first.find((x) => x.kind === 'ordinal')?.phrase).toBe('first');
		// Hand-worked: captions stop at 6 s and resume at 9 s; the silence runs 6.3–8.8 s.
		expect(first.find((x) => x.kind === 'long-gap')?.seconds).toBe(3);
		expect(first.find((x) => x.kind === 'silence')?.seconds).toBe(2.5);
		const second = suggestions[1].signals;
		expect(second.find((x) => x.kind === 'announcing-phrase')?.phrase).toBe('next exercise');
		expect(second.find((x) => x.kind === 'scene-change')?.phrase).toBeUndefined();
	});

	it('scores more independent evidence higher', () => {
		expect(suggestions.map((s) => s.score)).toEqual([0.82, 0.922, 0.909, 0.88]);
	});

	it('ignores a hold (quiet only), a mid-exercise "first" and a lone camera cut', () => {
		for (const t of [19.5, 41.25, 95]) {
			expect(
				suggestions.some((s) => Math.abs(s.time - t) < 2),
				`${t}`
			).toBe(false);
		}
	});
});

describe('suggestBoundaries on synthetic signals alone', () => {
	const none: Cue[] = [];

	it('places a boundary on a scene change inside a silence', () => {
		const out = suggestBoundaries(
			{ cues: none, silences: [{ start: 10, end: 12 }], sceneChanges: [11], durationSeconds: 100 },
			{ language: 'en' }
		);
		expect(out).toMatchObject([{ time: 11, score: 0.545 }]);
	});

	it('places a boundary on a scene change a frame after the silence ends', () => {
		// The first frame at or after a cut at 50.2 s is at 50.25 s at 8 fps; the sound resumes at 50.2 s.
		const out = suggestBoundaries(
			{
				cues: none,
				silences: [{ start: 45.1, end: 50.2 }],
				sceneChanges: [50.25],
				durationSeconds: 100
			},
			{ language: 'en' }
		);
		expect(out.map((s) => s.time)).toEqual([50.25]);
	});

	it('merges signals within 1.5 s and keeps the boundary inside the silence', () => {
		const out = suggestBoundaries(
			{
				cues: none,
				silences: [{ start: 60, end: 61.6 }],
				sceneChanges: [62.8],
				durationSeconds: 100
			},
			{ language: 'en' }
		);
		expect(out.map((s) => [s.time, kinds(s)])).toEqual([[60.8, ['scene-change', 'silence']]]);
		const apart = suggestBoundaries(
			{
				cues: none,
				silences: [{ start: 60, end: 61.6 }],
				sceneChanges: [63.5],
				durationSeconds: 100
			},
			{ language: 'en' }
		);
		expect(apart).toEqual([]);
	});

	it('ignores silences shorter than 1.5 s and gaps shorter than 2.5 s', () => {
		const out = suggestBoundaries(
			{
				cues: [cue(0, 20, 'Stand tall.'), cue(22.4, 40, 'Shift your weight.')],
				silences: [{ start: 20.1, end: 21.5 }],
				sceneChanges: [21],
				durationSeconds: 60
			},
			{ language: 'en', minScore: 0 }
		);
		expect(out.map(kinds)).toEqual([['scene-change']]);
	});

	it('keeps the better of two suggestions closer than the minimum segment', () => {
		const cues = [
			cue(0, 10, 'Warm up.'),
			cue(12, 14, 'Next exercise: step-ups.'),
			cue(15, 30, 'Now we’ll do wall push-ups.')
		];
		const out = suggestBoundaries(
			{ cues, silences: [{ start: 10.2, end: 11.8 }], sceneChanges: [], durationSeconds: 60 },
			{ language: 'en', minSegmentSeconds: 5 }
		);
		expect(out.map((s) => s.time)).toEqual([11]);
	});

	it('reads no count into a hyphenated compound such as "first-week"', () => {
		const cues = [cue(10, 14, 'These are your first-week knee exercises.')];
		const out = suggestBoundaries(
			{ cues, silences: [], sceneChanges: [], durationSeconds: 60 },
			{ language: 'en', minScore: 0 }
		);
		expect(out).toEqual([]);
	});

	it('uses a clinic’s own word lists', () => {
		const cues = [cue(0, 10, 'Warm up.'), cue(20, 24, 'Up next: wall push-ups.')];
		const input = { cues, silences: [], sceneChanges: [], durationSeconds: 60 };
		expect(suggestBoundaries(input, { language: 'en' })).toEqual([]);
		const out = suggestBoundaries(input, {
			language: 'en-GB',
			wordLists: { en: { announcing: ['Up next'] } }
		});
		expect(out.map((s) => [s.time, kinds(s)])).toEqual([
			[15, ['announcing-phrase', 'exercise-name-change', 'long-gap']]
		]);
		expect(out[0].signals.find((s) => s.kind === 'exercise-name-change')?.detail).toBe(
			'"wall push-ups", the first exercise named'
		);
	});

	it('picks the word lists by the cues’ language, and configured lists add to a language’s own', () => {
		// Common practice: a French narration announces the next exercise with "exercice suivant".
		const cues = [cue(0, 10, 'Échauffement.'), cue(20, 24, 'Exercice suivant : la marche.')];
		const input = { cues, silences: [], sceneChanges: [], durationSeconds: 60 };
		expect(suggestBoundaries(input, { language: 'en' })).toEqual([]);
		const french = suggestBoundaries(input, { language: 'fr-CA' });
		expect(french.map((s) => kinds(s))).toEqual([
			['announcing-phrase', 'exercise-name-change', 'long-gap']
		]);
		// Lists configured for French do not leak into English, and never remove built-in words.
		const lists = wordListsFor('fr', {
			fr: { announcing: ['Au suivant'] },
			en: { announcing: ['x'] }
		});
		expect(lists.announcing).toContain('au suivant');
		expect(lists.announcing).toContain('exercice suivant');
		expect(lists.announcing).not.toContain('x');
		expect(wordListsFor('xx-unknown').announcing).toEqual(wordListsFor('en').announcing);
	});

	it('leaves out boundaries too close to either end of the recording', () => {
		const cues = [
			cue(0, 2, 'Hello.'),
			cue(3, 8, 'Next exercise: calf raises.'),
			cue(8.5, 55, 'Rise onto your toes.'),
			cue(55.2, 58, 'Now we’ll do heel raises.')
		];
		expect(
			suggestBoundaries(
				{ cues, silences: [], sceneChanges: [], durationSeconds: 60 },
				{ language: 'en', minSegmentSeconds: 5 }
			)
		).toHaveLength(0);
	});
});

describe('the name after an announcing phrase', () => {
	it('ends at a comma, so a name with a clause after it is still read', () => {
		const cues = [
			{ id: '1', start: 0, end: 3, text: 'First, the heel slide.' },
			{
				id: '2',
				start: 10,
				end: 14,
				text: 'The next exercise is the narrow stance, for your standing balance.'
			}
		];
		const found = suggestBoundaries(
			{ durationSeconds: 20, cues, silences: [], sceneChanges: [] },
			{ language: 'en' }
		);
		expect(found.map((s) => s.name)).toContain('Narrow stance');
	});
});
