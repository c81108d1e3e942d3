import { describe, expect, it } from 'vitest';
import {
	anyWordExpression,
	byTitle,
	excerptParts,
	hasFilters,
	libraryQueryString,
	MARK_CLOSE,
	MARK_OPEN,
	matchesFilters,
	matchExpression,
	MAX_TERMS,
	NO_FILTERS,
	parseLibraryQuery,
	searchTerms
} from './search';

describe('searchTerms', () => {
	it('lowercases and splits on anything but letters and digits', () => {
		expect(searchTerms('Knee-Bends, seated!')).toEqual(['knee', 'bends', 'seated']);
	});

	it('keeps accented letters and digits, and drops repeats', () => {
		expect(searchTerms('café 90 café')).toEqual(['café', '90']);
	});

	it('throws away FTS5 syntax so nothing typed becomes an operator', () => {
		expect(searchTerms('"knee" OR (hip) NEAR/2 * -ankle ^foot')).toEqual([
			'knee',
			'or',
			'hip',
			'near',
			'2',
			'ankle',
			'foot'
		]);
	});

	it('keeps at most a few words', () => {
		expect(searchTerms('a b c d e f g h i j k')).toHaveLength(MAX_TERMS);
	});
});

describe('matchExpression', () => {
	it('quotes each word as a prefix and requires all of them', () => {
		expect(matchExpression(['knee', 'ben'])).toBe('"knee"* AND "ben"*');
	});

	it('quotes words that spell operators, so they are only words', () => {
		expect(matchExpression(['not', 'near'])).toBe('"not"* AND "near"*');
	});

	it('is null without words', () => {
		expect(matchExpression([])).toBeNull();
	});

	it('offers an any-word fallback only for two words or more', () => {
		expect(anyWordExpression(['knee', 'hip'])).toBe('"knee"* OR "hip"*');
		expect(anyWordExpression(['knee'])).toBeNull();
	});
});

describe('parseLibraryQuery and libraryQueryString', () => {
	it('reads every filter and the page', () => {
		const query = parseLibraryQuery(
			new URLSearchParams(
				'q=heel+slide&region=knee&position=supine&movement=active&phase=2&equipment=towel&page=3'
			)
		);
		expect(query).toEqual({
			q: 'heel slide',
			filters: {
				region: 'knee',
				position: 'supine',
				movement: 'active',
				phase: 2,
				equipment: 'towel'
			},
			page: 3
		});
		expect(libraryQueryString(query)).toBe(
			'?q=heel+slide&region=knee&position=supine&movement=active&phase=2&equipment=towel&page=3'
		);
	});

	it('falls back to "any" for what it cannot read', () => {
		const query = parseLibraryQuery(new URLSearchParams('phase=zero&page=-4'));
		expect(query).toEqual({ q: '', filters: NO_FILTERS, page: 1 });
		expect(libraryQueryString(query)).toBe('');
		expect(hasFilters(query.filters)).toBe(false);
	});

	it('says when any filter is set', () => {
		expect(hasFilters({ ...NO_FILTERS, phase: 1 })).toBe(true);
		expect(hasFilters({ ...NO_FILTERS, equipment: 'chair' })).toBe(true);
	});
});

describe('excerptParts', () => {
	it('splits a snippet into plain and marked parts', () => {
		expect(excerptParts(`Slide the ${MARK_OPEN}heel${MARK_CLOSE} towards you`)).toEqual([
			{ text: 'Slide the ', marked: false },
			{ text: 'heel', marked: true },
			{ text: ' towards you', marked: false }
		]);
	});

	it('copes with a mark left open and with none at all', () => {
		expect(excerptParts(`${MARK_OPEN}knee`)).toEqual([{ text: 'knee', marked: true }]);
		expect(excerptParts('plain')).toEqual([{ text: 'plain', marked: false }]);
		expect(excerptParts('')).toEqual([]);
	});

	it('leaves markup in the text as text', () => {
		expect(excerptParts(`<b>${MARK_OPEN}x${MARK_CLOSE}</b>`)).toEqual([
			{ text: '<b>', marked: false },
			{ text: 'x', marked: true },
			{ text: '</b>', marked: false }
		]);
	});
});

describe('matchesFilters and byTitle', () => {
	const card = {
		title: 'Heel slides',
		slug: 'heel-slides',
		bodyRegion: 'Knee',
		position: 'supine',
		movementType: 'active-assisted',
		phase: 2,
		equipment: ['Towel', 'Bed']
	};

	it('passes with no filters and with each filter that fits', () => {
		expect(matchesFilters(card, NO_FILTERS)).toBe(true);
		expect(
			matchesFilters(card, {
				region: 'Knee',
				position: 'supine',
				movement: 'active-assisted',
				phase: 2,
				equipment: 'Bed'
			})
		).toBe(true);
	});

	it('fails on any filter that does not fit', () => {
		expect(matchesFilters(card, { ...NO_FILTERS, region: 'Hip' })).toBe(false);
		expect(matchesFilters(card, { ...NO_FILTERS, phase: 1 })).toBe(false);
		expect(matchesFilters(card, { ...NO_FILTERS, equipment: 'Chair' })).toBe(false);
	});

	it('orders titles alphabetically, ignoring case and reading numbers as numbers', () => {
		const titles = ['step 10', 'Step 2', 'ankle pumps', 'Bridging'].map((title, i) => ({
			...card,
			title,
			slug: `s${i}`
		}));
		expect(titles.sort(byTitle).map((t) => t.title)).toEqual([
			'ankle pumps',
			'Bridging',
			'Step 2',
			'step 10'
		]);
	});
});
