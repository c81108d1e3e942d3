import { describe, expect, it } from 'vitest';
import { checkCues, profiles, tagProblem, wordsPerMinute, type Finding } from './checks';
import type { Cue } from './types';

const cue = (id: string, start: number, end: number, text: string): Cue => ({
	id,
	start,
	end,
	text
});
const kinds = (findings: Finding[]) => findings.map((f) => `${f.cueId}:${f.kind}:${f.severity}`);

describe('wordsPerMinute', () => {
	it('matches the BBC worked example: 2 words shown for 1 s is 120 wpm', () => {
		// BBC Subtitle Guidelines (2026 edition), reading rate worked example (REFERENCES.md, read).
		expect(wordsPerMinute(2, 1)).toBe(120);
	});
});

describe('profiles cite their sources', () => {
	it('bbc: 37 characters, 2 lines, 160–180 wpm with 0.3 s per word as the floor, 1 s gaps', () => {
		const p = profiles.bbc;
		// BBC Subtitle Guidelines (2026 edition), REFERENCES.md (read).
		expect([p.maxCharsPerLine.value, p.maxLines.value, p.targetWordsPerMinute.value]).toEqual([
			37, 2, 180
		]);
		// BBC: minimum about 0.3 s per word = 60 / 0.3 = 200 wpm (computed).
		expect(p.maxWordsPerMinute.value).toBe(200);
		// BBC: gaps between subtitles, if any, at least 1 s.
		expect(p.minGapSeconds.value).toBe(1);
		for (const limit of Object.values(p).filter((v) => typeof v === 'object')) {
			expect(limit.source).toMatch(/BBC|Common practice/);
		}
	});

	it('dcmp: 32 characters, never under 2 s, never above 225 wpm, 160 wpm for adult special interest', () => {
		const p = profiles.dcmp;
		// DCMP Captioning Key, REFERENCES.md (read).
		expect([
			p.maxCharsPerLine.value,
			p.minSecondsHard?.value,
			p.maxWordsPerMinute.value,
			p.targetWordsPerMinute.value
		]).toEqual([32, 2, 225, 160]);
		// Two lines is recalled from memory, and the source says so.
		expect(p.maxLines.source).toMatch(/memory/);
	});
});

describe('checkCues', () => {
	it('passes a well-made track', () => {
		const cues = [
			cue('1', 0, 3, 'Lie on your back\nwith both legs straight.'),
			cue('2', 3, 6, 'Slide your heel toward you.'),
			cue('3', 7.5, 10, 'Then slide it back down.')
		];
		expect(checkCues(cues, profiles.bbc)).toEqual([]);
	});

	it('flags the reading rate with its numbers: 10 words in 2 s is 300 wpm', () => {
		const [f] = checkCues(
			[cue('1', 0, 2, 'Keep your heel on the bed\nand slide it up.')],
			profiles.bbc
		);
		// BBC: 180 wpm target, 200 wpm (0.3 s per word) floor; 300 wpm is over both.
		// The last cue has room after it, so the offered fix is to show it longer.
		expect(f).toMatchObject({ kind: 'reading-rate', severity: 'error', fix: 'extend-into-gap' });
		expect(f.message).toMatch(
			/^Reading rate 300 words per minute \(10 words in 2 s\); at most 200 \(BBC/
		);
	});

	it('warns between the BBC target and its floor: 190 wpm, and offers to extend into the gap', () => {
		// 10 words over 3.158 s = 190 wpm: above 180 (target), under 200 (0.3 s per word).
		const text = 'Keep your heel on the bed\nand slide it up.';
		const findings = checkCues([cue('a', 0, 3.158, text), cue('b', 10, 12, 'Rest.')], profiles.bbc);
		const rate = findings.find((f) => f.kind === 'reading-rate');
		expect(rate).toMatchObject({ severity: 'warning', fix: 'extend-into-gap' });
		expect(rate?.message).toMatch(/^Reading rate 190 words per minute/);
	});

	it('counts words without tags', () => {
		// 2 words for 1 s = 120 wpm (BBC worked example) whatever the markup.
		const findings = checkCues([cue('1', 0, 1, '<v Coach><i>Stand</i> tall</v>')], profiles.bbc);
		expect(findings.filter((f) => f.kind === 'reading-rate')).toEqual([]);
	});

	it('checks line length and line count against the profile', () => {
		const text = 'Lift your leg about a hand’s width off the bed\nHold it there\nLower it slowly';
		// BBC: 37 characters per line and 2 lines; DCMP: 32 characters per line.
		expect(kinds(checkCues([cue('x', 0, 6, text)], profiles.bbc))).toEqual([
			'x:line-too-long:warning',
			'x:too-many-lines:warning'
		]);
		const f = checkCues([cue('y', 0, 6, 'Keep your back flat against the bed.')], profiles.dcmp);
		expect(f.map((x) => x.message)).toEqual([
			'A line has 36 characters; at most 32 (DCMP Captioning Key: 32 characters per line).'
		]);
	});

	it('checks durations: DCMP never under 2 s is an error; BBC common-practice 1 s is a warning', () => {
		const cues = [
			cue('1', 0, 1.5, 'Relax.'),
			cue('2', 5, 5.6, 'Stop.'),
			cue('3', 10, 18, 'Breathe in, and breathe out.')
		];
		// DCMP Captioning Key: adult near-verbatim captions never under 2 s.
		expect(kinds(checkCues(cues, profiles.dcmp))).toEqual([
			'1:too-short:error',
			'2:too-short:error',
			'3:too-long:warning'
		]);
		// Common practice (no BBC figure): 1 s minimum, 7 s maximum.
		expect(kinds(checkCues(cues, profiles.bbc))).toEqual([
			'2:too-short:warning',
			'3:too-long:warning'
		]);
	});

	it('checks timing: end before start, order, overlap and short gaps', () => {
		const cues = [
			cue('a', 4, 3, 'Backwards.'),
			cue('b', 2, 4, 'Out of order.'),
			cue('c', 3.5, 6, 'Overlaps b.'),
			cue('d', 6.4, 9, 'Too close after c.')
		];
		const findings = checkCues(cues, profiles.bbc);
		expect(kinds(findings)).toEqual([
			'a:end-before-start:error',
			'b:out-of-order:error',
			'c:overlap:warning',
			'c:gap-too-short:warning'
		]);
		// BBC: gaps between subtitles, if any, at least 1 s.
		expect(findings[3]).toMatchObject({ fix: 'close-gap' });
		expect(findings[3].message).toMatch(/^A 0.4 s gap before the next cue/);
		expect(findings[2].message).toBe('Overlaps cue "b" by 0.5 s: two captions on screen at once.');
	});

	it('flags empty cues and unbalanced tags', () => {
		const findings = checkCues(
			[cue('e', 0, 2, ' <i></i> '), cue('t', 3, 6, '<i>Point <b>your toes</i></b>')],
			profiles.bbc
		);
		expect(kinds(findings)).toEqual(['e:empty:error', 't:unbalanced-tags:error']);
		expect(tagProblem('<i>Point <b>your toes</i></b>')).toBe('<b> is still open when </i> closes');
		// W3C WebVTT cue text syntax (recalled, not in REFERENCES.md): a voice span that ends the cue may omit </v>.
		expect(tagProblem('<v Coach>Keep going')).toBeNull();
		expect(tagProblem('Bend</i>')).toBe('</i> closes a tag that was never opened');
	});

	it('does not flag a cue given exactly the time it needs, whatever binary fractions do', () => {
		// 1.009 − 0.009 is 0.9999999999999999 in binary; the BBC's common-practice minimum is 1 s.
		expect(checkCues([cue('a', 0.009, 1.009, 'Rest.')], profiles.bbc)).toEqual([]);
		// 123 characters in 8.2 s is 15 per second, DCMP's common-practice top (not 15.000000000000002).
		const text =
			'Straighten the knee completely, tightening the muscles on the front of your thigh, then slowly lower the heel onto the bed.';
		expect(text.length).toBe(123);
		const rates = checkCues([cue('b', 0, 8.2, text)], profiles.dcmp).filter(
			(f) => f.kind === 'reading-rate'
		);
		expect(rates).toEqual([]);
	});

	it('finds nothing in 2,000 well-formed cues (their speed is measured in bench:captions)', () => {
		const many = Array.from({ length: 2000 }, (_, i) =>
			cue(`${i}`, i * 3, i * 3 + 2, 'Slide your heel up.')
		);
		expect(checkCues(many, profiles.bbc)).toEqual([]);
	});
});
