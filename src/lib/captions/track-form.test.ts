import { describe, expect, it } from 'vitest';
import { languageTag, trackDetails } from './track-form';

describe('languageTag', () => {
	it('takes a tag, trimmed, and lets a blank through for the form to decide', () => {
		expect(languageTag.parse(' en-GB ')).toBe('en-GB');
		expect(languageTag.parse('')).toBe('');
	});

	it('refuses what is not a tag in words that quote it', () => {
		const result = languageTag.safeParse('English please');
		expect(result.error?.issues.map((i) => i.message)).toEqual([
			'“English please” is not a language tag. Use a BCP 47 tag such as en, en-GB or cy.'
		]);
	});
});

describe('trackDetails', () => {
	it('says every problem at once, each on its field', () => {
		const result = trackDetails.safeParse({
			kind: 'metadata',
			language: ' ',
			label: 'x'.repeat(101)
		});
		expect(result.error?.issues.map((i) => [i.path.join('.'), i.message])).toEqual([
			['kind', 'Choose one of the kinds listed.'],
			['language', 'Give the language as a tag, such as en-GB.'],
			['label', 'Keep the name to 100 characters.']
		]);
	});
});
