import { describe, expect, it } from 'vitest';
import { checkCues, profiles } from '$lib/captions/checks';
import { splitSource } from './findings';
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
