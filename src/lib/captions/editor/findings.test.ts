import { describe, expect, it } from 'vitest';
import { checkCues, profiles } from '$lib/captions/checks';
import { groupFindings, splitSource } from './findings';
import { plainCues, sameCues, withKeys } from './rows';

describe('splitSource', () => {
	it('takes the quoted guideline out of a finding', () => {
		const [finding] = checkCues(
			[{ id: '', start: 0, end: 1, text: 'One two three four five six seven eight.' }],
			profiles.bbc
		).filter((f) => f.kind === 'reading-rate');
		const { text, source } = splitSource(finding.message, profiles.bbc);
		expect(text).toBe('Reading rate 480 words per minute (8 words in 1 s); at most 200.');
		expect(source).toBe(profiles.bbc.maxWordsPerMinute.source);
	});
	it('leaves a message without a source as it is', () => {
		expect(splitSource('Has no text.', profiles.dcmp)).toEqual({
			text: 'Has no text.',
			source: null
		});
	});
});

describe('groupFindings', () => {
	it('names each kind once with its count and its guideline, in cue order', () => {
		const cues = [
			{ id: '', start: 0, end: 3, text: 'Lie on your back with both legs straight out.' },
			{ id: '', start: 3.4, end: 6, text: 'Bend one knee.' },
			{ id: '', start: 6.3, end: 10, text: 'Keep that foot flat on the bed as you slide it.' },
			{ id: '', start: 11, end: 13, text: 'Rest.' }
		];
		const groups = groupFindings(checkCues(cues, profiles.bbc), profiles.bbc);
		expect(groups.map((g) => [g.title, g.items.length, g.fixAll])).toEqual([
			['Lines too long', 2, true],
			['Gaps too short', 2, true]
		]);
		// BBC Subtitle Guidelines (2026 edition): 37 characters per line; gaps of at least 1 s.
		expect(groups[0].sources).toEqual([profiles.bbc.maxCharsPerLine.source]);
		expect(groups[1].sources).toEqual([profiles.bbc.minGapSeconds.source]);
		expect(groups[0].items.map((i) => [i.finding.index, i.text])).toEqual([
			[0, 'A line has 45 characters; at most 37.'],
			[2, 'A line has 47 characters; at most 37.']
		]);
	});

	it('lists every guideline a kind quotes, once each, and offers Fix all only for mechanical fixes', () => {
		const cues = [
			// 300 words per minute: over the BBC's 200 floor (an error).
			{ id: '', start: 0, end: 2, text: 'Keep your heel on the bed\nand slide it up.' },
			// 190 words per minute: over the 180 target only (a warning).
			{ id: '', start: 5, end: 8.158, text: 'Keep your heel on the bed\nand slide it up.' },
			{ id: '', start: 9.5, end: 11.5, text: 'Rest.' },
			{ id: '', start: 11, end: 13.5, text: 'Rest again.' },
			{ id: '', start: 12.5, end: 14.5, text: 'And once more.' }
		];
		const groups = groupFindings(checkCues(cues, profiles.bbc), profiles.bbc);
		const rate = groups.find((g) => g.kind === 'reading-rate')!;
		expect(rate.sources).toEqual([
			profiles.bbc.maxWordsPerMinute.source,
			profiles.bbc.targetWordsPerMinute.source
		]);
		expect([rate.errors, rate.fixAll]).toEqual([1, true]);
		const overlaps = groups.find((g) => g.kind === 'overlap')!;
		expect([overlaps.items.length, overlaps.fixAll, overlaps.sources]).toEqual([2, false, []]);
		// Errors of order and overlap come before reading and layout.
		expect(groups.map((g) => g.kind)).toEqual(['overlap', 'reading-rate']);
	});
});

describe('row keys', () => {
	it('gives every cue its own key, keeping existing ones and renewing copies', () => {
		const first = withKeys([
			{ id: 'a', start: 0, end: 1, text: 'Lift.' },
			{ id: 'a', start: 1, end: 2, text: 'Lower.' }
		]);
		expect(new Set(first.map((c) => c.key)).size).toBe(2);
		const copied = withKeys([first[0], { ...first[0], start: 3, end: 4 }, first[1]]);
		expect(copied[0].key).toBe(first[0].key);
		expect(copied[2].key).toBe(first[1].key);
		expect(copied[1].key).not.toBe(first[0].key);
		expect(plainCues(copied)[0]).toEqual({ id: 'a', start: 0, end: 1, text: 'Lift.' });
		expect(sameCues(first, plainCues(first))).toBe(true);
	});
});
