import { describe, expect, it } from 'vitest';
import { backoffSeconds } from './queue';

describe('retry back-off', () => {
	it('waits four times longer after each failed attempt', () => {
		expect([1, 2, 3].map((attempt) => backoffSeconds(attempt, 10))).toEqual([10, 40, 160]);
		expect(backoffSeconds(1, 0)).toBe(0);
	});
});
