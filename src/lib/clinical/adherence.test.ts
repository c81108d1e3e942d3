import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
	adherence,
	adherenceSummary,
	adherenceToDate,
	combinedAdherence,
	chosenWeekdays,
	countsAsSession,
	daysAskedInWeek,
	describeAdherence,
	sessionsPrescribedOn,
	type Schedule
} from './adherence';
import { addDays, datesFrom, localDateOf } from './calendar';

// 2026-05-04 is a Monday (from the calendar).
const daily: Schedule = {
	startDate: '2026-05-04',
	endDate: null,
	sessionsPerDay: 3,
	daysPerWeek: 7
};

const repeat = (date: string, n: number) => Array.from({ length: n }, () => date);

/** Sessions asked from `from` to `to` when nothing is logged and every day is complete. */
const prescribedSessions = (s: Schedule, from: string, to: string) =>
	adherence(s, [], to, datesFrom(from, to).length).prescribed;

describe('sessions prescribed', () => {
	it('keeps the weekdays the clinician chose, Monday first, and invents none', () => {
		expect(chosenWeekdays({ weekdays: [4, 2, 2] })).toEqual([2, 4]);
		expect(chosenWeekdays({ weekdays: [] })).toBeNull();
		expect(chosenWeekdays({})).toBeNull();
		// "Any 3 days a week" asks for no particular day.
		expect(sessionsPrescribedOn({ ...daily, daysPerWeek: 3 }, '2026-05-11')).toBeNull();
		expect(() => adherence({ ...daily, daysPerWeek: 0 }, [], '2026-05-17', 7)).toThrow(
			'from 1 to 7'
		);
	});

	it('asks for any N days of a full week, and fewer in a week cut short (our rounding)', () => {
		const s: Schedule = { ...daily, daysPerWeek: 3 };
		expect(daysAskedInWeek(s, '2026-05-11')).toBe(3);
		// Starts on Saturday 9 May: 2 of 7 days left, 3 × 2/7 ≈ 0.86 → 1 day.
		expect(daysAskedInWeek({ ...s, startDate: '2026-05-09' }, '2026-05-04')).toBe(1);
		// Five days paused: 2 left, 1 day asked; every day of a week paused asks for none.
		expect(
			daysAskedInWeek({ ...s, pauses: [{ from: '2026-05-11', to: '2026-05-15' }] }, '2026-05-11')
		).toBe(1);
		expect(
			daysAskedInWeek({ ...s, pauses: [{ from: '2026-05-11', to: '2026-05-17' }] }, '2026-05-11')
		).toBe(0);
		// Every day a week is every open day, however few.
		expect(daysAskedInWeek({ ...daily, startDate: '2026-05-09' }, '2026-05-04')).toBe(2);
	});

	it('counts a programme with chosen weekdays that starts mid-week only from its start', () => {
		// Starts Wednesday 6 May, Monday/Wednesday/Friday, twice a day.
		const s: Schedule = {
			...daily,
			startDate: '2026-05-06',
			weekdays: [1, 3, 5],
			sessionsPerDay: 2
		};
		expect(prescribedSessions(s, '2026-05-04', '2026-05-10')).toBe(4); // Wed + Fri
		expect(prescribedSessions(s, '2026-05-11', '2026-05-17')).toBe(6); // Mon + Wed + Fri
		expect(sessionsPrescribedOn(s, '2026-05-04')).toBe(0);
		expect(sessionsPrescribedOn(s, '2026-05-06')).toBe(2);
		expect(sessionsPrescribedOn(s, '2026-05-07')).toBe(0);
	});

	it('uses an explicit weekday list, and stops after the end date', () => {
		const s: Schedule = { ...daily, weekdays: [2, 4], endDate: '2026-05-14' };
		expect(prescribedSessions(s, '2026-05-04', '2026-05-17')).toBe(4 * 3); // Tue 5, Thu 7, Tue 12, Thu 14
		expect(sessionsPrescribedOn(s, '2026-05-19')).toBe(0);
	});

	it('leaves out paused days', () => {
		const s: Schedule = { ...daily, pauses: [{ from: '2026-05-12', to: '2026-05-14' }] };
		expect(prescribedSessions(s, '2026-05-11', '2026-05-17')).toBe(4 * 3);
		expect(sessionsPrescribedOn({ ...s, weekdays: [2] }, '2026-05-12')).toBe(0);
	});

	it('counts a log as a session only when at least one set was done', () => {
		expect(countsAsSession({ setsDone: 1 })).toBe(true);
		expect(countsAsSession({ setsDone: 0 })).toBe(false);
	});
});

describe('any N days a week (the review’s cases)', () => {
	const threeAWeek: Schedule = { ...daily, sessionsPerDay: 1, daysPerWeek: 3 };
	// Four weeks from Monday 4 May 2026; Tuesday 5 is the first Tuesday.
	const tueThuSat = [0, 7, 14, 21].flatMap((w) =>
		[1, 3, 5].map((d) => addDays('2026-05-04', w + d))
	);

	it('reads 100%, not 0%, for a patient who exercised on Tuesday, Thursday and Saturday', () => {
		const w = adherence(threeAWeek, tueThuSat, '2026-05-31', 28);
		expect(w).toMatchObject({ prescribed: 12, counted: 12, extra: 0, percent: 100 });
		expect(describeAdherence(w)).toBe('12 of 12 sessions (100%)');
	});

	it('counts days beyond the week’s N as extra, and missed days once the week is over', () => {
		// Week of 11 May: four days logged (one extra); week of 18 May: one day only.
		const logs = ['2026-05-11', '2026-05-12', '2026-05-13', '2026-05-14', '2026-05-20'];
		expect(adherence(threeAWeek, logs, '2026-05-24', 14)).toMatchObject({
			prescribed: 6,
			counted: 4,
			extra: 1
		});
	});

	it('does not count a week as missed while it can still be finished', () => {
		// Nothing yet on Monday to Wednesday 18–20 May: Thursday to Sunday can still hold 3 days.
		expect(adherence(threeAWeek, [], '2026-05-20', 3)).toMatchObject({ prescribed: 0 });
		// By Friday night only two days are left: one day is already missed.
		expect(adherence(threeAWeek, [], '2026-05-22', 5)).toMatchObject({ prescribed: 1, counted: 0 });
		// A day done early in the week counts at once.
		expect(adherence(threeAWeek, ['2026-05-18'], '2026-05-20', 3)).toMatchObject({
			prescribed: 1,
			counted: 1,
			percent: 100
		});
	});

	it('gives a window that starts mid-week the week’s days not already done before it', () => {
		// Sessions Monday and Tuesday 11–12 May; the window is Wednesday 13 to Sunday 17.
		const logs = ['2026-05-11', '2026-05-12'];
		expect(adherence(threeAWeek, logs, '2026-05-17', 5)).toMatchObject({
			prescribed: 1,
			counted: 0
		});
	});

	it('keeps chosen weekdays strict: Tuesday sessions do not count for Monday', () => {
		const monWedFri: Schedule = { ...threeAWeek, weekdays: [1, 3, 5] };
		expect(adherence(monWedFri, tueThuSat, '2026-05-31', 28)).toMatchObject({
			prescribed: 12,
			counted: 0,
			extra: 12
		});
	});
});

describe('adherence over the last 7 and 28 days', () => {
	it('divides sessions logged by sessions prescribed', () => {
		const logs = [...repeat('2026-05-11', 3), ...repeat('2026-05-12', 2), '2026-05-13'];
		const w = adherence(daily, logs, '2026-05-17', 7);
		expect(w).toEqual({
			from: '2026-05-11',
			to: '2026-05-17',
			prescribed: 21,
			counted: 6,
			extra: 0,
			ratio: 6 / 21,
			percent: 29
		});
		expect(describeAdherence(w)).toBe('6 of 21 sessions (29%)');
	});

	it('counts only the programme’s own days in a 28-day window that starts before it', () => {
		const logs = datesFrom('2026-05-04', '2026-05-17').flatMap((d) => repeat(d, 3));
		const { last7, last28 } = adherenceSummary(daily, logs, '2026-05-17');
		expect(last7.percent).toBe(100);
		expect(last28).toMatchObject({ from: '2026-04-20', prescribed: 42, counted: 42, percent: 100 });
	});

	it('answers null, not NaN, when nothing was prescribed', () => {
		const before = adherence(daily, ['2026-05-01'], '2026-05-03', 7);
		expect(before.ratio).toBeNull();
		expect(before.percent).toBeNull();
		expect(before.extra).toBe(1);
		expect(describeAdherence(before)).toBe('No sessions were due in these 7 days; 1 logged anyway');
		const paused: Schedule = { ...daily, pauses: [{ from: '2026-05-04', to: '2026-05-31' }] };
		expect(describeAdherence(adherence(paused, [], '2026-05-17', 7))).toBe(
			'No sessions were due in these 7 days'
		);
	});

	it('caps each day at what was prescribed and shows the rest as extra', () => {
		// Five sessions on Monday cannot make up for nothing on Tuesday.
		const s: Schedule = { ...daily, weekdays: [1, 3, 5] };
		const logs = [...repeat('2026-05-11', 5), '2026-05-12'];
		const w = adherence(s, logs, '2026-05-17', 7);
		expect(w).toMatchObject({ prescribed: 9, counted: 3, extra: 3, percent: 33 });
		expect(describeAdherence(w)).toBe('3 of 9 sessions (33%), 3 extra');
	});

	it('ignores logs outside the window', () => {
		const w = adherence(daily, ['2026-05-10', '2026-05-18'], '2026-05-17', 7);
		expect(w).toMatchObject({ counted: 0, extra: 0, percent: 0 });
		expect(() => adherence(daily, [], '2026-05-17', 0)).toThrow('at least 1');
	});

	it('counts sessions on the day they were done across a daylight-saving change (Europe/London, 2026-03-29)', () => {
		const s: Schedule = { ...daily, startDate: '2026-03-23', sessionsPerDay: 2 };
		const zone = 'Europe/London';
		const logs = [
			'2026-03-29T00:30:00Z', // 00:30 GMT on the 29th
			'2026-03-29T22:30:00Z', // 23:30 BST, still the 29th
			'2026-03-29T23:30:00Z' // 00:30 BST on the 30th
		].map((t) => localDateOf(Date.parse(t), zone));
		expect(logs).toEqual(['2026-03-29', '2026-03-29', '2026-03-30']);
		expect(adherence(s, logs, '2026-03-29', 1)).toMatchObject({ prescribed: 2, counted: 2 });
		expect(adherence(s, logs, '2026-03-30', 1)).toMatchObject({ prescribed: 2, counted: 1 });
		// The 23-hour day is still one day of sessions.
		expect(prescribedSessions(s, '2026-03-29', '2026-03-29')).toBe(2);
	});

	it('keeps each session on the date where it was logged when the patient changes time zone', () => {
		// Logged in London until 10 June, then in New York; each log keeps the zone it was made in.
		const s: Schedule = { ...daily, startDate: '2026-06-08', sessionsPerDay: 1 };
		const made: [string, string][] = [
			['2026-06-08T18:00:00Z', 'Europe/London'],
			['2026-06-09T18:00:00Z', 'Europe/London'],
			['2026-06-11T03:30:00Z', 'America/New_York'], // 23:30 on the 10th in New York
			['2026-06-12T03:30:00Z', 'America/New_York'], // 23:30 on the 11th
			['2026-06-12T14:00:00Z', 'America/New_York'] // the 12th
		];
		const logs = made.map(([t, zone]) => localDateOf(Date.parse(t), zone));
		expect(logs).toEqual(['2026-06-08', '2026-06-09', '2026-06-10', '2026-06-11', '2026-06-12']);
		expect(adherence(s, logs, '2026-06-12', 5)).toMatchObject({
			counted: 5,
			extra: 0,
			percent: 100
		});
		// Read in London time, the late New York sessions would land a day later and look doubled.
		const wrong = made.map(([t]) => localDateOf(Date.parse(t), 'Europe/London'));
		expect(adherence(s, wrong, '2026-06-12', 5)).toMatchObject({ counted: 4, extra: 1 });
	});

	it('adds several exercises together', () => {
		const a = { schedule: daily, loggedDates: repeat('2026-05-17', 3) };
		const b = { schedule: { ...daily, sessionsPerDay: 1 }, loggedDates: repeat('2026-05-17', 2) };
		expect(combinedAdherence([a, b], '2026-05-17', 1)).toMatchObject({
			prescribed: 4,
			counted: 4,
			extra: 1,
			percent: 100
		});
		expect(combinedAdherence([], '2026-05-17', 7).ratio).toBeNull();
	});

	it('never goes negative or above 100%, and adds up (property)', () => {
		const schedule = fc.record({
			startDate: fc.integer({ min: 0, max: 60 }).map((n) => addDays('2026-03-01', n)),
			endDate: fc.option(
				fc.integer({ min: 0, max: 90 }).map((n) => addDays('2026-03-01', n)),
				{ nil: null }
			),
			sessionsPerDay: fc.integer({ min: 1, max: 6 }),
			daysPerWeek: fc.integer({ min: 1, max: 7 }),
			weekdays: fc.option(
				fc.uniqueArray(fc.constantFrom(1, 2, 3, 4, 5, 6, 7 as const), { maxLength: 7 }),
				{ nil: undefined }
			),
			pauses: fc.array(
				fc
					.tuple(fc.integer({ min: 0, max: 90 }), fc.integer({ min: 0, max: 10 }))
					.map(([n, len]) => ({
						from: addDays('2026-03-01', n),
						to: addDays('2026-03-01', n + len)
					})),
				{ maxLength: 3 }
			)
		}) as fc.Arbitrary<Schedule>;
		const logs = fc.array(
			fc.integer({ min: 0, max: 100 }).map((n) => addDays('2026-03-01', n)),
			{ maxLength: 200 }
		);
		fc.assert(
			fc.property(schedule, logs, fc.integer({ min: 0, max: 100 }), (s, l, end) => {
				const endingOn = addDays('2026-03-01', end);
				const { last7, last28 } = adherenceSummary(s, l, endingOn);
				for (const w of [last7, last28]) {
					expect(w.prescribed).toBeGreaterThanOrEqual(0);
					expect(w.counted).toBeGreaterThanOrEqual(0);
					expect(w.counted).toBeLessThanOrEqual(w.prescribed);
					expect(w.extra).toBeGreaterThanOrEqual(0);
					expect(w.counted + w.extra).toBe(l.filter((d) => d >= w.from && d <= w.to).length);
					if (w.prescribed === 0) expect(w.ratio).toBeNull();
					else {
						expect(w.ratio).toBeGreaterThanOrEqual(0);
						expect(w.ratio).toBeLessThanOrEqual(1);
						expect(Number.isNaN(w.ratio)).toBe(false);
					}
				}
				const fourWeeks = [0, 7, 14, 21].reduce(
					(t, back) => t + adherence(s, l, addDays(endingOn, -back), 7).prescribed,
					0
				);
				expect(last28.prescribed).toBe(fourWeeks);
			}),
			{ numRuns: 150 }
		);
	});
});

describe('adherence to date', () => {
	// Common practice: a day still in progress is not yet a missed day.
	const item = (sessionsPerDay: number, loggedDates: string[]) => ({
		schedule: { ...daily, sessionsPerDay },
		loggedDates
	});

	it('counts today only for the sessions already logged', () => {
		// Monday 11 to Sunday 17 May: 3 a day, all done until Saturday, one so far on Sunday.
		const logs = [
			...datesFrom('2026-05-11', '2026-05-16').flatMap((d) => repeat(d, 3)),
			'2026-05-17'
		];
		const w = adherenceToDate([item(3, logs)], '2026-05-17', 7);
		expect(w).toMatchObject({ from: '2026-05-11', to: '2026-05-17', prescribed: 19, counted: 19 });
		expect(w.percent).toBe(100);
		// The same days judged complete count Sunday's two missing sessions.
		expect(adherence(daily, logs, '2026-05-17', 7)).toMatchObject({ prescribed: 21, counted: 19 });
	});

	it('shows a first session on the programme’s first day, and nothing before it', () => {
		const first = {
			schedule: { ...daily, startDate: '2026-05-17', sessionsPerDay: 2 },
			loggedDates: ['2026-05-17']
		};
		expect(adherenceToDate([first], '2026-05-17', 7)).toMatchObject({
			prescribed: 1,
			counted: 1,
			percent: 100
		});
		expect(adherenceToDate([{ ...first, loggedDates: [] }], '2026-05-17', 7).ratio).toBeNull();
	});

	it('keeps sessions beyond today’s prescription as extra, and refuses an empty window', () => {
		const w = adherenceToDate([item(1, repeat('2026-05-17', 3))], '2026-05-17', 1);
		expect(w).toMatchObject({ prescribed: 1, counted: 1, extra: 2 });
		expect(() => adherenceToDate([], '2026-05-17', 0)).toThrow('at least 1');
	});
});

describe('a week rounded down to no days (review case)', () => {
	it('counts a day done in it instead of calling it extra', () => {
		// Starts Sunday 10 May 2026, any 3 days a week: one open day, asked none, done anyway.
		const s: Schedule = { ...daily, startDate: '2026-05-10', sessionsPerDay: 1, daysPerWeek: 3 };
		expect(adherence(s, ['2026-05-10'], '2026-05-10', 1)).toMatchObject({
			prescribed: 1,
			counted: 1,
			extra: 0
		});
		expect(adherence(s, [], '2026-05-10', 1).ratio).toBeNull();
	});
});
