import { describe, expect, it } from 'vitest';
import { closeGap, extendIntoGap, reflowLines, splitCue } from './fixes';
import { plainText } from './text';
import type { Cue } from './types';

const cue = (id: string, start: number, end: number, text = 'Relax.'): Cue => ({
	id,
	start,
	end,
	text
});

describe('reflowLines', () => {
	it('keeps text that fits on one line', () => {
		expect(reflowLines('Lie on your\nback.', 37)).toBe('Lie on your back.');
	});

	it('balances two lines and prefers breaking after punctuation', () => {
		const text = 'Lie on your back, with both legs straight and your arms by your sides.';
		expect(reflowLines(text, 37)).toBe(
			'Lie on your back, with both legs\nstraight and your arms by your sides.'
		);
		expect(reflowLines('Bend your knee slowly. Then straighten it again fully.', 37)).toBe(
			'Bend your knee slowly.\nThen straighten it again fully.'
		);
	});

	it('never ends a line on a word that belongs to the next', () => {
		const out = reflowLines('Keep the heel of your foot on the bed as you slide it up', 32);
		for (const line of out.split('\n')) {
			expect(line.length).toBeLessThanOrEqual(32);
			expect(line).not.toMatch(/ (the|your|of|a)$/);
		}
	});

	it('cuts inside a word only when the word is longer than a line', () => {
		expect(reflowLines('Supercalifragilistic knee', 10)).toBe('Supercalif\nragilistic\nknee');
	});

	it('keeps tags and measures only visible characters', () => {
		const out = reflowLines(
			'<v Coach><i>Slowly</i> lift your leg about a hand’s width off the bed.</v>',
			37
		);
		expect(out.split('\n')).toHaveLength(2);
		expect(out.startsWith('<v Coach><i>Slowly</i>')).toBe(true);
		for (const line of out.split('\n')) expect(plainText(line).length).toBeLessThanOrEqual(37);
	});
});

describe('extendIntoGap', () => {
	it('lengthens a short cue and leaves the minimum gap before the next', () => {
		const cues = [cue('a', 0, 0.5), cue('b', 4, 6)];
		const out = extendIntoGap(cues, 'a', 2, 1);
		expect(out).toEqual([cue('a', 0, 2), cue('b', 4, 6)]);
		expect(cues[0].end).toBe(0.5);
	});

	it('runs on to the next cue when the gap left would be too short', () => {
		expect(extendIntoGap([cue('a', 0, 0.5), cue('b', 2.5, 4)], 'a', 2, 1)[0].end).toBe(2.5);
	});

	it('does nothing when the cue is long enough or the next cue overlaps', () => {
		const cues = [cue('a', 0, 3), cue('b', 2.5, 4)];
		expect(extendIntoGap(cues, 'a', 2, 1)).toEqual(cues);
		expect(extendIntoGap([cue('a', 0, 1), cue('b', 0.5, 4)], 'a', 2, 1)[0].end).toBe(1);
	});
});

describe('closeGap', () => {
	it('closes a gap up to the limit, and only that', () => {
		const cues = [cue('a', 0, 2), cue('b', 2.3, 4), cue('c', 6, 8)];
		expect(closeGap(cues, 'a', 0.5)[0].end).toBe(2.3);
		expect(closeGap(cues, 'b', 0.5)).toEqual(cues);
	});
});

describe('splitCue', () => {
	it('splits at a sentence end near the middle and shares the time by characters', () => {
		const cues = [cue('7', 10, 16, 'Bend your knee. Then slowly straighten it.'), cue('8', 17, 18)];
		const out = splitCue(cues, '7');
		expect(out.map((c) => c.text)).toEqual([
			'Bend your knee.',
			'Then slowly straighten it.',
			'Relax.'
		]);
		// 15 and 26 visible characters share 6 s: 15/41 × 6 = 2.195 s.
		expect(out.slice(0, 2).map((c) => [c.id, c.start, c.end])).toEqual([
			['7', 10, 12.195],
			['7.2', 12.195, 16]
		]);
	});

	it('falls back to a phrase boundary and carries open tags across', () => {
		const out = splitCue([cue('', 0, 4, '<i>Hold the stretch, and breathe out slowly</i>')], '');
		expect(out.map((c) => c.text)).toEqual([
			'<i>Hold the stretch,</i>',
			'<i>and breathe out slowly</i>'
		]);
		expect(out.map((c) => c.id)).toEqual(['', '']);
	});

	it('leaves a one-word cue alone', () => {
		const cues = [cue('x', 0, 9, 'Stretch')];
		expect(splitCue(cues, 'x')).toEqual(cues);
	});
});
