import { describe, expect, it } from 'vitest';
import { ariaSortOf, nextDirection, sortHref, withParams } from './sorting';

const current = { sort: 'date' as 'date' | 'title' | 'pain', dir: 'desc' as const };

describe('list sorting links', () => {
	it('turns the current column the other way and starts another at its own first direction', () => {
		expect(nextDirection(current, 'date', 'desc')).toBe('asc');
		expect(nextDirection({ ...current, dir: 'asc' }, 'date', 'desc')).toBe('desc');
		expect(nextDirection(current, 'title', 'asc')).toBe('asc');
		expect(nextDirection(current, 'pain', 'desc')).toBe('desc');
	});

	it('tells assistive technology the sort of the current column only (WAI-ARIA aria-sort)', () => {
		expect(ariaSortOf(current, 'date')).toBe('descending');
		expect(ariaSortOf({ ...current, dir: 'asc' }, 'date')).toBe('ascending');
		expect(ariaSortOf(current, 'title')).toBeUndefined();
	});

	it('keeps the other parameters, goes back to page one and leaves defaults out', () => {
		const url = new URL('https://clinic.example/recordings?q=knee&page=3&status=ready');
		expect(sortHref(url, current, 'title', 'asc')).toBe(
			'/recordings?q=knee&status=ready&sort=title&dir=asc'
		);
		expect(withParams(url, { q: '', status: null, page: null })).toBe('/recordings');
		expect(withParams(url, { page: 4 })).toBe('/recordings?q=knee&page=4&status=ready');
	});
});
