import { describe, expect, it } from 'vitest';
import { formatDate, formatDateRange, formatDay, formatShortDate, ISO_DATE_PATTERN } from './dates';

describe('dates for people', () => {
	it('writes a day as "24 Nov 2026", the same in every month', () => {
		expect(formatDate('2026-11-24')).toBe('24 Nov 2026');
		expect(formatDate('2026-09-03')).toBe('3 Sep 2026');
		expect(formatShortDate('2026-11-24')).toBe('24 Nov');
	});

	it('puts the weekday in front for a patient’s day, the year when asked', () => {
		// 24 November 2026 is a Tuesday; 1 March 2026 a Sunday (the Gregorian calendar).
		expect(formatDay('2026-11-24')).toBe('Tuesday 24 Nov');
		expect(formatDay('2026-03-01', { year: true })).toBe('Sunday 1 Mar 2026');
	});

	it('writes a run of days in the same words', () => {
		expect(formatDateRange('2026-11-24', '2026-11-30')).toBe('24–30 Nov 2026');
		expect(formatDateRange('2026-12-29', '2027-01-04')).toBe('29 Dec 2026 – 4 Jan 2027');
	});

	it('never leaves an ISO date in its words', () => {
		for (const text of [
			formatDate('2026-11-24'),
			formatDay('2026-11-24', { year: true }),
			formatDateRange('2026-11-24', '2027-01-02')
		]) {
			expect(text).not.toMatch(ISO_DATE_PATTERN);
		}
		expect('from 2026-11-24').toMatch(ISO_DATE_PATTERN);
	});
});
