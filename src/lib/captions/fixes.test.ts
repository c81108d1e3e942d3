import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { checkCues, profiles, type FindingKind } from './checks';
import {
	FIX_ALL_KINDS,
	closeGap,
	extendIntoGap,
	fixAllOfKind,
	reflowLines,
	splitCue
} from './fixes';
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

/** Every visible word of a track, in order, whatever lines and cues they are in. */
const wordsOf = (cues: readonly Cue[]) =>
	cues.flatMap((c) => plainText(c.text).split(/\s+/).filter(Boolean));
const kindsOf = (cues: readonly Cue[], kind: FindingKind, profile = profiles.bbc) =>
	checkCues(cues, profile).filter((f) => f.kind === kind);

describe('fixAllOfKind', () => {
	const whole = { duration: 60 };

	it('re-flows every line that is too long in one step, keeping words and times', () => {
		// BBC Subtitle Guidelines (2026 edition): at most 37 characters per line.
		const cues = [
			cue('1', 0, 4, 'Lie on your back with both legs straight out.'),
			cue('2', 5, 9, 'Bend one knee and keep that foot flat on the bed.'),
			cue('3', 10, 13, 'Breathe out.'),
			cue('4', 14, 18, 'Slide your heel up towards you, then slowly back down.')
		];
		expect(kindsOf(cues, 'line-too-long')).toHaveLength(3);
		const out = fixAllOfKind(cues, 'line-too-long', profiles.bbc, whole);
		expect(out).toMatchObject({ fixed: 3, unfixed: [] });
		expect(out.cues.map((c) => c.text)).toEqual([
			'Lie on your back with\nboth legs straight out.',
			'Bend one knee and keep\nthat foot flat on the bed.',
			'Breathe out.',
			'Slide your heel up towards you,\nthen slowly back down.'
		]);
		expect(out.cues.map((c) => [c.start, c.end])).toEqual(cues.map((c) => [c.start, c.end]));
		expect(out.cues[2]).toBe(cues[2]);
		expect(wordsOf(out.cues)).toEqual(wordsOf(cues));
		expect(checkCues(out.cues, profiles.bbc)).toEqual([]);
	});

	it('closes every gap shorter than the minimum and leaves longer ones', () => {
		// BBC: gaps between subtitles, if any, at least 1 s.
		const cues = [
			cue('a', 0, 2),
			cue('b', 2.4, 4),
			cue('c', 4.5, 6),
			cue('d', 8, 10),
			cue('e', 10.2, 12)
		];
		const out = fixAllOfKind(cues, 'gap-too-short', profiles.bbc, whole);
		expect(out).toMatchObject({ fixed: 3, unfixed: [] });
		expect(out.cues.map((c) => c.end)).toEqual([2.4, 4.5, 6, 10.2, 12]);
	});

	it('shows short cues longer in the free time after them, and says why where there is none', () => {
		// Common practice (no BBC figure): about 1 s on screen for the shortest caption.
		const cues = [
			cue('a', 0, 0.5, 'Rest.'),
			cue('b', 3, 4.5, 'Lift.'),
			cue('c', 5, 5.4, 'Lift.'),
			cue('d', 5.4, 7, 'And lower.'),
			cue('e', 9, 9.5, 'Good.')
		];
		const out = fixAllOfKind(cues, 'too-short', profiles.bbc, { duration: 9.8 });
		expect(out.fixed).toBe(1);
		expect(out.cues.map((c) => c.end)).toEqual([1, 4.5, 5.4, 7, 9.5]);
		expect(out.unfixed).toEqual([
			{
				index: 2,
				why: 'The next cue starts as it ends, so there is no free time to show it longer.'
			},
			{
				index: 4,
				why: 'It needs 1 s on screen; there is room for 0.8 s before the recording ends.'
			}
		]);
	});

	it('leaves a cue read too fast as it is when the free time after it is not enough', () => {
		// 12 words at the BBC's 180 words per minute need 4 s; there is room for 3 s before the next cue.
		const cues = [
			cue('a', 1, 3, 'Keep your heel on the bed\nand slide it up towards you.'),
			cue('b', 4, 6, 'Now rest.')
		];
		const out = fixAllOfKind(cues, 'reading-rate', profiles.bbc, whole);
		expect(out.cues).toEqual(cues);
		expect(out).toMatchObject({
			fixed: 0,
			unfixed: [
				{ index: 0, why: 'It needs 4 s on screen; there is room for 3 s before the next cue.' }
			]
		});
		// With 5 s free it is shown for the 4 s it needs.
		const roomy = fixAllOfKind([cues[0], cue('b', 6, 8)], 'reading-rate', profiles.bbc, whole);
		expect(roomy.cues[0].end).toBe(5);
	});

	it('splits an over-long cue at its sentences into the fewest parts that fit', () => {
		// Common practice (no BBC figure): about 7 s at most on screen; 16 s needs three parts.
		const text =
			'Lie on your back with both knees bent. Slide one heel up towards you, keeping it on the bed. Then slowly slide it back down again.';
		const cues = [cue('a', 0, 16, text), cue('b', 17, 19, 'Rest.')];
		const out = fixAllOfKind(cues, 'too-long', profiles.bbc, whole);
		expect(out).toMatchObject({ fixed: 1, unfixed: [] });
		expect(out.cues.map((c) => [c.id, c.start, c.end, c.text])).toEqual([
			['a', 0, 4.75, 'Lie on your back\nwith both knees bent.'],
			['a.2', 4.75, 11.375, 'Slide one heel up towards you,\nkeeping it on the bed.'],
			['a.3', 11.375, 16, 'Then slowly slide it back down again.'],
			['b', 17, 19, 'Rest.']
		]);
		// Time is shared by characters, so each part is read at the rate the whole cue was.
		expect(wordsOf(out.cues)).toEqual(wordsOf(cues));
		expect(checkCues(out.cues, profiles.bbc)).toEqual([]);
	});

	it('splits a cue whose words do not fit in two lines, unless a part would flash by', () => {
		// DCMP Captioning Key: 32 characters per line; two lines; never under 2 s on screen.
		const text =
			'Keep your heel on the bed and slide it up towards you, then slowly lower it again.';
		const out = fixAllOfKind(
			[cue('a', 0, 8, text), cue('b', 9, 11, 'Now rest.')],
			'line-too-long',
			profiles.dcmp,
			whole
		);
		expect(out.cues.map((c) => [c.start, c.end, c.text])).toEqual([
			[0, 5.333, 'Keep your heel on the bed\nand slide it up towards you,'],
			[5.333, 8, 'then slowly lower it again.'],
			[9, 11, 'Now rest.']
		]);
		const brief = [cue('a', 0, 3, text), cue('b', 5, 8, 'Now rest.')];
		const refused = fixAllOfKind(brief, 'line-too-long', profiles.dcmp, whole);
		expect(refused.cues).toEqual(brief);
		expect(refused.unfixed).toEqual([
			{ index: 0, why: 'Splitting it would leave a cue on screen too briefly to read.' }
		]);
	});

	it('never cuts a word to make a line fit', () => {
		const cues = [cue('a', 0, 4, 'Keep breathing: Supercalifragilisticexpialidociousness')];
		const out = fixAllOfKind(cues, 'line-too-long', profiles.dcmp, whole);
		expect(out.cues).toEqual(cues);
		expect(out.unfixed[0].why).toMatch(/word longer than a line/);
	});

	it('changes nothing for kinds fixed by hand, or in a track out of order', () => {
		const overlapping = [cue('a', 0, 3), cue('b', 2, 4)];
		expect(fixAllOfKind(overlapping, 'overlap', profiles.bbc, whole)).toEqual({
			cues: overlapping,
			fixed: 0,
			unfixed: [{ index: 1, why: 'This kind is fixed by hand.' }]
		});
		const unordered = [cue('a', 5, 5.5), cue('b', 0, 0.5)];
		const out = fixAllOfKind(unordered, 'too-short', profiles.bbc, whole);
		expect(out.cues).toEqual(unordered);
		expect(out.unfixed.map((u) => u.why)).toEqual([
			'The cues are out of order; put them in order first.',
			'The cues are out of order; put them in order first.'
		]);
	});
});

// Properties: tracks in whole milliseconds, sorted and not overlapping, inside a 60 s recording,
// with words of every sort (tags, line breaks, one longer than any line).
const DURATION = 60;
const word = fc.constantFrom(
	'Lift',
	'your',
	'heel,',
	'slowly',
	'and',
	'then',
	'lower',
	'it.',
	'Breathe',
	'out;',
	'keeping',
	'the',
	'knee',
	'straight',
	'towards',
	'you.',
	'<i>gently</i>',
	'<b>hold</b>',
	'Supercalifragilisticexpialidociousness'
);
const cueText = fc
	.array(fc.tuple(word, fc.constantFrom(' ', ' ', ' ', '\n')), { minLength: 1, maxLength: 40 })
	.map((pairs) =>
		pairs
			.map(([w, space]) => w + space)
			.join('')
			.trim()
	);
const track = fc
	.uniqueArray(fc.integer({ min: 0, max: DURATION * 1000 }), { minLength: 2, maxLength: 24 })
	.chain((points) => {
		const sorted = [...points].sort((a, b) => a - b);
		const spans: [number, number][] = [];
		for (let k = 0; k + 1 < sorted.length; k += 2) {
			if (sorted[k + 1] - sorted[k] >= 100) spans.push([sorted[k], sorted[k + 1]]);
		}
		return fc
			.array(cueText, { minLength: spans.length, maxLength: spans.length })
			.map((texts) =>
				spans.map(([s, e], k) => cue(k % 3 === 0 ? '' : `c${k}`, s / 1000, e / 1000, texts[k]))
			);
	})
	.filter((cues) => cues.length > 0);

describe('fixAllOfKind, whatever the track', () => {
	for (const profile of Object.values(profiles)) {
		for (const kind of FIX_ALL_KINDS) {
			it(`${profile.id} ${kind}: keeps every word, makes no overlap, stays inside the recording, and counts truly`, () => {
				fc.assert(
					fc.property(track, (cues) => {
						const before = kindsOf(cues, kind, profile);
						const out = fixAllOfKind(cues, kind, profile, { duration: DURATION });
						expect(wordsOf(out.cues)).toEqual(wordsOf(cues));
						out.cues.forEach((c, k) => {
							expect(c.end).toBeGreaterThan(c.start);
							expect(c.end).toBeLessThanOrEqual(DURATION);
							if (k > 0) expect(c.start).toBeGreaterThanOrEqual(out.cues[k - 1].end);
						});
						// The checks run again: what is left is exactly what was reported left, each with a reason.
						const after = kindsOf(out.cues, kind, profile);
						expect(out.unfixed.map((u) => u.index)).toEqual(after.map((f) => f.index));
						for (const u of out.unfixed) expect(u.why).not.toBe('');
						expect(out.fixed + out.unfixed.length).toBe(before.length);
						if (out.fixed === 0) expect(out.cues).toEqual(cues);
					})
				);
			});
		}
	}
});
