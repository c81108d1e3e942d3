import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
	addDays,
	datesFrom,
	daysBetween,
	describeTimeSince,
	isLocalDate,
	isoWeekStart,
	isTimeZone,
	localDateOf,
	programmeWeek,
	startOfLocalDay,
	weekdayOf,
	weeksSince
} from './calendar';

const at = (iso: string) => Date.parse(iso);

describe('local dates', () => {
	it('accepts only real calendar dates written YYYY-MM-DD', () => {
		expect(isLocalDate('2026-02-28')).toBe(true);
		expect(isLocalDate('2028-02-29')).toBe(true); // 2028 is a leap year
		expect(isLocalDate('2026-02-29')).toBe(false);
		expect(isLocalDate('2026-13-01')).toBe(false);
		expect(isLocalDate('2026-1-5')).toBe(false);
		expect(isLocalDate('')).toBe(false);
		expect(() => addDays('yesterday', 1)).toThrow('not a calendar date');
	});

	it('knows IANA zone names', () => {
		expect(isTimeZone('Europe/London')).toBe(true);
		expect(isTimeZone('America/New_York')).toBe(true);
		expect(isTimeZone('Mars/Olympus_Mons')).toBe(false);
	});

	it('counts days across month, year and leap-day boundaries', () => {
		expect(addDays('2026-01-31', 1)).toBe('2026-02-01');
		expect(addDays('2026-12-31', 1)).toBe('2027-01-01');
		expect(addDays('2028-02-28', 1)).toBe('2028-02-29');
		expect(addDays('2026-03-01', -1)).toBe('2026-02-28');
		expect(daysBetween('2026-01-01', '2027-01-01')).toBe(365);
		expect(daysBetween('2028-01-01', '2029-01-01')).toBe(366);
		expect(daysBetween('2026-05-10', '2026-05-03')).toBe(-7);
		expect(() => addDays('2026-05-10', 0.5)).toThrow('whole');
	});

	it('counts a daylight-saving day as one day (Europe/London changes on 2026-03-29 and 2026-10-25)', () => {
		expect(daysBetween('2026-03-28', '2026-03-30')).toBe(2);
		expect(daysBetween('2026-10-24', '2026-10-26')).toBe(2);
		expect(datesFrom('2026-03-28', '2026-03-30')).toEqual([
			'2026-03-28',
			'2026-03-29',
			'2026-03-30'
		]);
		expect(datesFrom('2026-03-30', '2026-03-28')).toEqual([]);
	});

	it('gives ISO weekdays and week starts (2026-05-04 is a Monday, from the calendar)', () => {
		expect(weekdayOf('2026-05-04')).toBe(1);
		expect(weekdayOf('2026-05-10')).toBe(7);
		expect(weekdayOf('1970-01-01')).toBe(4); // a Thursday
		expect(weekdayOf('1969-12-29')).toBe(1); // before the epoch too
		expect(isoWeekStart('2026-05-10')).toBe('2026-05-04');
		expect(isoWeekStart('2026-05-04')).toBe('2026-05-04');
		expect(isoWeekStart('2027-01-01')).toBe('2026-12-28'); // a week that spans the new year
	});

	it('round-trips addDays and daysBetween (property)', () => {
		fc.assert(
			fc.property(
				fc.integer({ min: 0, max: 40_000 }),
				fc.integer({ min: -5000, max: 5000 }),
				(base, n) => {
					const date = addDays('1990-01-01', base);
					expect(daysBetween(date, addDays(date, n))).toBe(n);
					expect(isLocalDate(addDays(date, n))).toBe(true);
				}
			)
		);
	});
});

describe('the patient’s date of an instant', () => {
	it('follows Europe/London into summer time on 2026-03-29 (clocks go 01:00 GMT → 02:00 BST)', () => {
		expect(localDateOf(at('2026-03-29T00:30:00Z'), 'Europe/London')).toBe('2026-03-29');
		// 23:30 UTC is already 00:30 the next day in BST.
		expect(localDateOf(at('2026-03-29T23:30:00Z'), 'Europe/London')).toBe('2026-03-30');
		expect(localDateOf(at('2026-03-28T23:30:00Z'), 'Europe/London')).toBe('2026-03-28');
	});

	it('follows Europe/London back to GMT on 2026-10-25', () => {
		expect(localDateOf(at('2026-10-24T23:30:00Z'), 'Europe/London')).toBe('2026-10-25'); // BST
		expect(localDateOf(at('2026-10-25T23:30:00Z'), 'Europe/London')).toBe('2026-10-25'); // GMT
	});

	it('follows America/New_York (summer time from 2026-03-08 to 2026-11-01)', () => {
		expect(localDateOf(at('2026-03-08T04:30:00Z'), 'America/New_York')).toBe('2026-03-07'); // EST
		expect(localDateOf(at('2026-03-09T03:30:00Z'), 'America/New_York')).toBe('2026-03-08'); // EDT
		expect(localDateOf(at('2026-11-01T03:30:00Z'), 'America/New_York')).toBe('2026-10-31'); // EDT
		expect(localDateOf(at('2026-11-02T04:30:00Z'), 'America/New_York')).toBe('2026-11-01'); // EST
	});

	it('gives one instant two dates for a patient who changes time zone', () => {
		const evening = at('2026-06-15T02:00:00Z');
		expect(localDateOf(evening, 'Europe/London')).toBe('2026-06-15');
		expect(localDateOf(evening, 'America/New_York')).toBe('2026-06-14');
		expect(localDateOf(new Date(evening), 'Pacific/Kiritimati')).toBe('2026-06-15'); // UTC+14
	});

	it('finds where a local day starts, also on clock-change days', () => {
		expect(startOfLocalDay('2026-06-15', 'Europe/London')).toBe(at('2026-06-14T23:00:00Z'));
		expect(startOfLocalDay('2026-03-29', 'Europe/London')).toBe(at('2026-03-29T00:00:00Z'));
		expect(startOfLocalDay('2026-03-30', 'Europe/London')).toBe(at('2026-03-29T23:00:00Z'));
		expect(startOfLocalDay('2026-03-08', 'America/New_York')).toBe(at('2026-03-08T05:00:00Z'));
		expect(startOfLocalDay('2026-03-09', 'America/New_York')).toBe(at('2026-03-09T04:00:00Z'));
		// Chile moves its clocks at midnight (tz database): on 2026-09-06 the day starts at 01:00.
		expect(startOfLocalDay('2026-09-06', 'America/Santiago')).toBe(at('2026-09-06T04:00:00Z'));
		// …and on 2026-04-05 the evening of the 4th repeats its last hour; the 5th starts after it.
		expect(startOfLocalDay('2026-04-05', 'America/Santiago')).toBe(at('2026-04-05T04:00:00Z'));
	});

	it('maps every instant of a day back to that day (property, Europe/London over 2026)', () => {
		fc.assert(
			fc.property(fc.integer({ min: 0, max: 364 }), (n) => {
				const date = addDays('2026-01-01', n);
				const start = startOfLocalDay(date, 'Europe/London');
				const next = startOfLocalDay(addDays(date, 1), 'Europe/London');
				expect(localDateOf(start, 'Europe/London')).toBe(date);
				expect(localDateOf(next - 1, 'Europe/London')).toBe(date);
				expect([23, 24, 25]).toContain((next - start) / 3_600_000);
			}),
			{ numRuns: 60 }
		);
	});
});

describe('weeks after an operation', () => {
	it('calls the operation date day 0 and days 0–6 week 0 (completed weeks, as protocols count)', () => {
		expect(weeksSince('2026-05-04', '2026-05-04')).toEqual({ days: 0, weeks: 0, extraDays: 0 });
		expect(weeksSince('2026-05-04', '2026-05-10')).toEqual({ days: 6, weeks: 0, extraDays: 6 });
		expect(weeksSince('2026-05-04', '2026-05-11')).toEqual({ days: 7, weeks: 1, extraDays: 0 });
		expect(weeksSince('2026-05-04', '2026-06-18')).toEqual({ days: 45, weeks: 6, extraDays: 3 });
		expect(weeksSince('2026-05-04', '2026-05-01')).toEqual({ days: -3, weeks: -1, extraDays: 4 });
	});

	it('counts weeks across a clock change without losing a day', () => {
		// Operation the day before London's spring change; 14 calendar days later is week 2.
		expect(weeksSince('2026-03-28', '2026-04-11').weeks).toBe(2);
	});

	it('counts programme weeks from 1', () => {
		expect(programmeWeek('2026-05-06', '2026-05-06')).toBe(1);
		expect(programmeWeek('2026-05-06', '2026-05-12')).toBe(1);
		expect(programmeWeek('2026-05-06', '2026-05-13')).toBe(2);
		expect(programmeWeek('2026-05-06', '2026-05-05')).toBe(0);
	});

	it('says the time since in words', () => {
		expect(describeTimeSince(weeksSince('2026-05-04', '2026-06-18'))).toBe('6 weeks 3 days');
		expect(describeTimeSince(weeksSince('2026-05-04', '2026-05-11'))).toBe('1 week');
		expect(describeTimeSince(weeksSince('2026-05-04', '2026-05-04'))).toBe('0 days');
		expect(describeTimeSince(weeksSince('2026-05-04', '2026-05-05'))).toBe('1 day');
		expect(describeTimeSince(weeksSince('2026-05-04', '2026-05-01'))).toBe('in 3 days');
	});
});
