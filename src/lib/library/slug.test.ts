import { describe, expect, it } from 'vitest';
import { isSlug, slugify, SLUG_MAX, uniqueSlug } from './slug';

describe('slugify', () => {
	it('joins lowercase words with hyphens', () => {
		expect(slugify('Heel slides, lying on your back')).toBe('heel-slides-lying-on-your-back');
	});

	it('drops accents and symbols', () => {
		expect(slugify('Café-style knee bends (90°)!')).toBe('cafe-style-knee-bends-90');
	});

	it('cuts long titles at a word boundary', () => {
		const slug = slugify('word '.repeat(40));
		expect(slug.length).toBeLessThanOrEqual(SLUG_MAX);
		expect(slug.endsWith('-')).toBe(false);
		expect(isSlug(slug)).toBe(true);
	});

	it('falls back when nothing is left', () => {
		expect(slugify('!!!')).toBe('exercise');
		expect(slugify('日本', 'collection')).toBe('collection');
	});
});

describe('uniqueSlug', () => {
	it('adds the first free number', () => {
		const taken = new Set(['sit-to-stand', 'sit-to-stand-2']);
		expect(uniqueSlug('sit-to-stand', (s) => taken.has(s))).toBe('sit-to-stand-3');
		expect(uniqueSlug('step-ups', (s) => taken.has(s))).toBe('step-ups');
	});

	it('stays within the length limit', () => {
		const base = 'a'.repeat(SLUG_MAX);
		const slug = uniqueSlug(base, (s) => s === base);
		expect(slug.length).toBeLessThanOrEqual(SLUG_MAX);
		expect(isSlug(slug)).toBe(true);
	});
});

describe('isSlug', () => {
	it('accepts slugs and refuses everything else', () => {
		expect(isSlug('knee-bends-2')).toBe(true);
		for (const bad of ['', 'Knee', 'knee--bends', '-knee', 'knee_bends', '../x', 'a'.repeat(81)]) {
			expect(isSlug(bad), bad).toBe(false);
		}
	});
});
