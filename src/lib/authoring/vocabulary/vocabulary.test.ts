import { describe, expect, it } from 'vitest';
import en from './en.json';
import {
	draftVocabularyExtraSchema,
	draftVocabularySchema,
	englishVocabulary,
	mergeVocabulary,
	vocabularyExtrasSchema,
	vocabularyFor
} from './index';

describe('drafting vocabulary files', () => {
	it('the English data file is a valid vocabulary', () => {
		expect(draftVocabularySchema.safeParse(en).success).toBe(true);
	});

	it('rejects a phrase with an unknown placeholder, an unclosed group or a stray key', () => {
		const bad = (patch: object) =>
			draftVocabularySchema.safeParse({ ...englishVocabulary, ...patch }).success;
		expect(bad({ dosage: ['{bogus} times'] })).toBe(false);
		expect(bad({ dosage: ['hold {reps:amount} seconds'] })).toBe(false);
		expect(bad({ cautions: ['stop (if'] })).toBe(false);
		expect(bad({ cautions: ['… pain'] })).toBe(false);
		expect(bad({ position: { kneeling: ['kneel'] } })).toBe(false);
		expect(bad({ surprise: [] })).toBe(false);
		expect(bad({ vagueAmounts: [{ phrase: 'a few', min: 4, max: 3 }] })).toBe(false);
	});

	it('accepts a clinic file of additions keyed by primary language subtag only', () => {
		const extra = { en: { cautions: ['stop straight away if'], numbers: { thrice: 3 } } };
		expect(vocabularyExtrasSchema.safeParse(extra).success).toBe(true);
		expect(vocabularyExtrasSchema.safeParse({ 'en-GB': extra.en }).success).toBe(false);
		expect(draftVocabularyExtraSchema.safeParse({ titleMaxWords: 0 }).success).toBe(false);
	});

	it('merging adds words without losing built-in ones and overrides single values', () => {
		const merged = mergeVocabulary(englishVocabulary, {
			position: { standing: ['on your feet'] },
			vagueAmounts: [{ phrase: 'a few', min: 2, max: 4 }],
			titleMaxWords: 7
		});
		expect(merged.position.standing).toEqual([
			...(englishVocabulary.position.standing ?? []),
			'on your feet'
		]);
		expect(merged.position.supine).toEqual(englishVocabulary.position.supine);
		expect(merged.vagueAmounts.find((v) => v.phrase === 'a few')).toEqual({
			phrase: 'a few',
			min: 2,
			max: 4
		});
		expect(merged.titleMaxWords).toBe(7);
		expect(draftVocabularySchema.safeParse(merged).success).toBe(true);
	});

	it('picks the vocabulary by primary subtag, English when there is none', () => {
		expect(vocabularyFor('en-AU')).toBe(englishVocabulary);
		expect(vocabularyFor('xx')).toBe(englishVocabulary);
		expect(vocabularyFor('en', { en: { negators: ['hardly'] } }).negators).toContain('hardly');
	});
});
