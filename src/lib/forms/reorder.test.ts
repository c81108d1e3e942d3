import { describe, expect, it } from 'vitest';
import { moveBy } from './reorder';

describe('moveBy', () => {
	it('moves an item up or down one place', () => {
		expect(moveBy(['a', 'b', 'c'], 1, -1)).toEqual(['b', 'a', 'c']);
		expect(moveBy(['a', 'b', 'c'], 1, 1)).toEqual(['a', 'c', 'b']);
		expect(moveBy(['a', 'b', 'c'], 0, 2)).toEqual(['b', 'c', 'a']);
	});

	it('leaves the list as it is past either end, and never changes the original', () => {
		const list = ['a', 'b'];
		expect(moveBy(list, 0, -1)).toEqual(['a', 'b']);
		expect(moveBy(list, 1, 1)).toEqual(['a', 'b']);
		expect(moveBy(list, 5, -1)).toEqual(['a', 'b']);
		expect(moveBy(list, 0, 1)).not.toBe(list);
		expect(list).toEqual(['a', 'b']);
	});
});
