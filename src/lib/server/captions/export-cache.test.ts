import { describe, expect, it } from 'vitest';
import { exportCache } from './export-cache';

describe('exportCache', () => {
	it('gives back what it keeps and nothing else', () => {
		const cache = exportCache(100);
		cache.set('a', 'WEBVTT\n');
		expect(cache.get('a')).toBe('WEBVTT\n');
		expect(cache.get('b')).toBeUndefined();
	});

	it('drops the least recently used files to stay within its limit', () => {
		const cache = exportCache(10);
		cache.set('a', 'aaaa');
		cache.set('b', 'bbbb');
		// Reading a makes b the oldest, so b goes when c arrives.
		expect(cache.get('a')).toBe('aaaa');
		cache.set('c', 'cccc');
		expect(cache.get('b')).toBeUndefined();
		expect(cache.get('a')).toBe('aaaa');
		expect(cache.get('c')).toBe('cccc');
		expect([cache.size, cache.calculatedSize]).toEqual([2, 8]);
	});

	it('counts a replaced file once', () => {
		const cache = exportCache(10);
		cache.set('a', 'aaaa');
		cache.set('a', 'aaaaaa');
		expect([cache.size, cache.calculatedSize]).toEqual([1, 6]);
		expect(cache.get('a')).toBe('aaaaaa');
	});

	it('does not keep a file larger than the whole cache, nor let it push others out', () => {
		const cache = exportCache(10);
		cache.set('a', 'aaaa');
		cache.set('big', 'x'.repeat(11));
		expect(cache.get('big')).toBeUndefined();
		expect(cache.get('a')).toBe('aaaa');
	});

	it('keeps an empty file', () => {
		const cache = exportCache(10);
		cache.set('empty', '');
		expect(cache.get('empty')).toBe('');
	});
});
