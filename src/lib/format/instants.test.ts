import { describe, expect, it } from 'vitest';
import { formatInstant } from './instants';

// Time-zone rules from the IANA tz database as Node's ICU ships it: London keeps GMT (UTC+0) in
// winter and BST (UTC+1) from the last Sunday of March to the last Sunday of October; New York
// is UTC−5 in winter (EST) and UTC−4 in summer (EDT).
describe('formatInstant', () => {
	const winter = '2026-12-01T14:05:00Z';
	const summer = '2026-07-01T14:05:00Z';

	it('shows the wall-clock time of the zone, not of the process', () => {
		expect(formatInstant(winter, 'Europe/London', 'time')).toBe('14:05');
		expect(formatInstant(summer, 'Europe/London', 'time')).toBe('15:05');
		expect(formatInstant(winter, 'America/New_York', 'time')).toBe('09:05');
		expect(formatInstant(summer, 'America/New_York', 'time')).toBe('10:05');
	});

	it('moves the date when the zone is past midnight', () => {
		expect(formatInstant('2026-12-01T23:30:00Z', 'Australia/Sydney', 'date')).toBe('2 Dec 2026');
		expect(formatInstant('2026-12-01T23:30:00Z', 'Europe/London', 'date')).toBe('1 Dec 2026');
	});

	it('words each style', () => {
		expect(formatInstant(winter, 'Europe/London')).toBe('1 Dec 2026, 14:05');
		expect(formatInstant(winter, 'Europe/London', 'date')).toBe('1 Dec 2026');
		// The same words as a calendar date (format/dates), September included.
		expect(formatInstant('2026-09-03T09:00:00Z', 'Europe/London', 'date')).toBe('3 Sep 2026');
		expect(formatInstant(winter, 'Europe/London', 'date-time-zone')).toBe('1 Dec 2026, 14:05 GMT');
		expect(formatInstant(summer, 'Europe/London', 'date-time-zone')).toBe('1 Jul 2026, 15:05 BST');
	});

	it('takes a Date, an ISO string or epoch milliseconds alike', () => {
		const date = new Date(winter);
		expect(formatInstant(date, 'UTC')).toBe(formatInstant(winter, 'UTC'));
		expect(formatInstant(date.getTime(), 'UTC')).toBe('1 Dec 2026, 14:05');
	});
});
