import { describe, expect, it } from 'vitest';
import {
	clockTime,
	instantAt,
	describeExerciseDays,
	describeWeekdays,
	nextSessionWhen,
	restWords,
	itemDayStatus,
	itemSchedule,
	pauseOn,
	sessionMinutes,
	summariseDay
} from './schedule';

describe('session times through the day (09:00–19:00, common practice)', () => {
	it('spreads sessions evenly, to the quarter hour', () => {
		expect(sessionMinutes(1).map(clockTime)).toEqual(['09:00']);
		expect(sessionMinutes(2).map(clockTime)).toEqual(['09:00', '19:00']);
		expect(sessionMinutes(3).map(clockTime)).toEqual(['09:00', '14:00', '19:00']);
		expect(sessionMinutes(4).map(clockTime)).toEqual(['09:00', '12:15', '15:45', '19:00']);
		expect(sessionMinutes(0)).toEqual([]);
	});
});

describe('a local time as an instant', () => {
	it('is 09:00 local in winter and summer in London (GMT, then BST)', () => {
		expect(new Date(instantAt('2026-01-15', 540, 'Europe/London')).toISOString()).toBe(
			'2026-01-15T09:00:00.000Z'
		);
		expect(new Date(instantAt('2026-07-15', 540, 'Europe/London')).toISOString()).toBe(
			'2026-07-15T08:00:00.000Z'
		);
	});

	it('stays on the wall clock on the day clocks go forward (London, 29 March 2026)', () => {
		// The tz database: the UK changes at 01:00 UTC on the last Sunday of March (from memory).
		expect(new Date(instantAt('2026-03-29', 540, 'Europe/London')).toISOString()).toBe(
			'2026-03-29T08:00:00.000Z'
		);
		expect(new Date(instantAt('2026-03-29', 19 * 60, 'Europe/London')).toISOString()).toBe(
			'2026-03-29T18:00:00.000Z'
		);
	});

	it('works east of Greenwich and across the date line', () => {
		expect(new Date(instantAt('2026-06-01', 540, 'Pacific/Auckland')).toISOString()).toBe(
			'2026-05-31T21:00:00.000Z'
		);
		expect(new Date(instantAt('2026-06-01', 540, 'America/Los_Angeles')).toISOString()).toBe(
			'2026-06-01T16:00:00.000Z'
		);
	});

	it('moves a time the clocks skip an hour later (New York, 8 March 2026, 02:30)', () => {
		expect(new Date(instantAt('2026-03-08', 150, 'America/New_York')).toISOString()).toBe(
			'2026-03-08T07:30:00.000Z'
		);
	});
});

describe('programme days', () => {
	const programme = {
		startDate: '2026-03-02',
		endDate: '2026-03-29',
		pauses: [{ fromDate: '2026-03-10', toDate: '2026-03-11', reason: 'Review visit' }]
	};

	it('names the pause a date falls in', () => {
		expect(pauseOn(programme, '2026-03-09')).toBeUndefined();
		expect(pauseOn(programme, '2026-03-11')?.reason).toBe('Review visit');
	});

	it('asks for sessions within the dates, on scheduled weekdays, outside pauses', () => {
		const daily = itemSchedule(programme, { sessionsPerDay: 3, daysPerWeek: 7 });
		expect(itemDayStatus(daily, '2026-03-01', [])).toMatchObject({
			kind: 'rest',
			reason: 'no-day'
		});
		expect(itemDayStatus(daily, '2026-03-02', [])).toEqual({ kind: 'due', done: 0, of: 3 });
		expect(itemDayStatus(daily, '2026-03-10', []).kind).toBe('rest');
		expect(itemDayStatus(daily, '2026-03-29', []).kind).toBe('due');
		expect(itemDayStatus(daily, '2026-03-30', []).kind).toBe('rest');
		expect(
			itemDayStatus(itemSchedule({ ...programme, endDate: null }, daily), '2027-01-01', []).kind
		).toBe('due');
	});
});

describe("today's sessions", () => {
	const programme = { startDate: '2026-03-02', endDate: null, pauses: [] };

	const times = (date: string, n: number) => Array.from({ length: n }, () => date);

	it('counts sessions done against sessions a day', () => {
		const daily = itemSchedule(programme, { sessionsPerDay: 3, daysPerWeek: 7 });
		expect(itemDayStatus(daily, '2026-03-05', times('2026-03-05', 2))).toEqual({
			kind: 'due',
			done: 2,
			of: 3
		});
		expect(itemDayStatus(daily, '2026-03-05', times('2026-03-05', 3))).toEqual({
			kind: 'done',
			done: 3,
			of: 3
		});
		// An extra session does not count past what was asked.
		expect(itemDayStatus(daily, '2026-03-05', times('2026-03-05', 5))).toEqual({
			kind: 'done',
			done: 3,
			of: 3
		});
	});

	it('asks for a chosen-weekday exercise on those weekdays only', () => {
		const monWedFri = itemSchedule(programme, { sessionsPerDay: 1, daysPerWeek: 3 }, [1, 3, 5]);
		// 2026-03-04 is a Wednesday, 2026-03-05 a Thursday.
		expect(itemDayStatus(monWedFri, '2026-03-04', []).kind).toBe('due');
		expect(itemDayStatus(monWedFri, '2026-03-05', ['2026-03-05'])).toEqual({
			kind: 'rest',
			reason: 'other-weekday',
			done: 1
		});
		expect(describeExerciseDays({ weekdays: [1, 3, 5], daysPerWeek: 3 })).toBe(
			'Monday, Wednesday and Friday'
		);
		expect(describeWeekdays([1, 4])).toBe('Monday and Thursday');
		expect(describeWeekdays([1])).toBe('Monday');
		expect(describeWeekdays([1, 2, 3, 4, 5, 6, 7])).toBe('every day');
	});

	it('offers an any-3-days exercise on any day until the week’s three are done, naming no weekday', () => {
		const three = itemSchedule(programme, { sessionsPerDay: 1, daysPerWeek: 3 });
		expect(describeExerciseDays(three)).toBe('any 3 days a week');
		expect(describeExerciseDays({ daysPerWeek: 7 })).toBe('every day');
		// Tuesday 3, Thursday 5 and Saturday 7 March: due each time, then Sunday is free.
		expect(itemDayStatus(three, '2026-03-03', []).kind).toBe('due');
		expect(itemDayStatus(three, '2026-03-05', ['2026-03-03']).kind).toBe('due');
		expect(itemDayStatus(three, '2026-03-07', ['2026-03-03', '2026-03-05', '2026-03-07'])).toEqual({
			kind: 'done',
			done: 1,
			of: 1
		});
		expect(itemDayStatus(three, '2026-03-08', ['2026-03-03', '2026-03-05', '2026-03-07'])).toEqual({
			kind: 'rest',
			reason: 'week-done',
			done: 0
		});
		expect(
			restWords({ kind: 'rest', reason: 'week-done', done: 0 }, describeExerciseDays(three))
		).toBe("This week's days are done: this exercise is for any 3 days a week.");
		expect(
			restWords({ kind: 'rest', reason: 'other-weekday', done: 0 }, 'Tuesday and Friday')
		).toBe('Not today: this exercise is for Tuesday and Friday.');
		// A new week starts on Monday.
		expect(itemDayStatus(three, '2026-03-09', ['2026-03-03']).kind).toBe('due');
	});

	it('sums the day and names the next session with its time', () => {
		expect(
			summariseDay([
				{ kind: 'due', done: 1, of: 3 },
				{ kind: 'done', done: 2, of: 2 },
				{ kind: 'rest', reason: 'other-weekday', done: 0 }
			])
		).toEqual({ done: 3, due: 5, next: { number: 2, of: 3, minutes: 14 * 60 } });
		expect(summariseDay([{ kind: 'done', done: 2, of: 2 }])).toEqual({
			done: 2,
			due: 2,
			next: null
		});
		expect(summariseDay([])).toEqual({ done: 0, due: 0, next: null });
	});
});

describe('a short first week of any N days (review cases)', () => {
	it('offers the first day of a programme that starts on a Sunday, and counts it when done', () => {
		// Sunday 8 March 2026: one open day of the week, 3 × 1/7 rounds to none.
		const sunday = itemSchedule(
			{ startDate: '2026-03-08', endDate: null, pauses: [] },
			{ sessionsPerDay: 1, daysPerWeek: 3 }
		);
		expect(itemDayStatus(sunday, '2026-03-08', []).kind).toBe('due');
		expect(itemDayStatus(sunday, '2026-03-08', ['2026-03-08']).kind).toBe('done');
	});

	it('does not count a paused day towards the week', () => {
		const paused = itemSchedule(
			{
				startDate: '2026-03-02',
				endDate: null,
				pauses: [{ fromDate: '2026-03-02', toDate: '2026-03-02' }]
			},
			{ sessionsPerDay: 1, daysPerWeek: 3 }
		);
		// Logged Monday (paused), Tuesday and Wednesday: Thursday is still an exercise day.
		expect(
			itemDayStatus(paused, '2026-03-05', ['2026-03-02', '2026-03-03', '2026-03-04']).kind
		).toBe('due');
	});
});

describe('when the next session is, in words', () => {
	it('never calls midnight a good time', () => {
		expect(nextSessionWhen(14 * 60, 10 * 60)).toBe('around 14:00');
		expect(nextSessionWhen(9 * 60, 10 * 60)).toBe('now is a good time (suggested for 09:00)');
		expect(nextSessionWhen(19 * 60, 23 * 60 + 50)).toBe(
			'suggested for 19:00; if it is late for you, start fresh tomorrow'
		);
	});
});
