import { describe, expect, it } from 'vitest';
import { endTimeColumn, formatTimestamp, parseTimestamp, toMillis } from './timestamp';

describe('timestamp helpers', () => {
	it('round-trips every millisecond it writes (W3C WebVTT timestamps)', () => {
		for (const s of [0, 0.001, 59.999, 60, 3599.999, 3600, 86399.5, 360000.25]) {
			expect(parseTimestamp(formatTimestamp(s))).toBe(s);
		}
	});

	it('rounds to the millisecond a file can hold', () => {
		expect(toMillis(1.23456)).toBe(1.235);
		expect(formatTimestamp(1.0004)).toBe('00:00:01.000');
	});

	it('points at the end time on a timing line', () => {
		expect(endTimeColumn('00:01.000 --> 00:02.000')).toBe(15);
		expect(endTimeColumn('00:01.000 -->\t 00:02.000 align:start')).toBe(16);
		expect(endTimeColumn('no arrow')).toBe(1);
	});
});
