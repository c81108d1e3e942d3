import { describe, expect, it } from 'vitest';
import { formatLength } from './lengths';

describe('formatLength', () => {
	it('writes a length in minutes and seconds, rounded to the whole second', () => {
		expect(formatLength(158.5)).toBe('2 min 39 s');
		expect(formatLength(158.4)).toBe('2 min 38 s');
		expect(formatLength(39)).toBe('39 s');
		expect(formatLength(120)).toBe('2 min');
		expect(formatLength(3723)).toBe('1 h 2 min 3 s');
		expect(formatLength(3600)).toBe('1 h');
	});

	it('says so for a length under half a second and for no length', () => {
		expect(formatLength(0.2)).toBe('under 1 s');
		expect(formatLength(0)).toBe('0 s');
		expect(formatLength(null)).toBe('—');
		expect(formatLength(Number.NaN)).toBe('—');
	});
});
