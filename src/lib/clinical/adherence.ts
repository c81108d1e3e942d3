/**
 * Adherence: sessions logged over sessions prescribed, on the patient's own calendar days.
 *
 * Decisions (DEVELOPERS.md, "Clinical computations"):
 * - What was prescribed: the weekdays the clinician chose, or "any N days a week", counted in
 *   Monday-first calendar weeks. No weekday is ever invented for the patient: with "any 3 days a
 *   week", Tuesday, Thursday and Saturday count exactly as Monday, Wednesday and Friday would.
 * - One definition of a session done (`countsAsSession`) for the patient's screens and the
 *   clinician's figures.
 * - Logs are counted by the local date the patient logged them on (store it with the log, from
 *   `localDateOf(instant, zoneAtTheTime)`), so moving time zone never moves old sessions.
 * - Each day counts at most the sessions prescribed that day; further sessions, and sessions on
 *   days with none prescribed (rest days, pauses), are reported as `extra` and never raise the
 *   ratio. So extra sessions on Monday cannot hide a missed Tuesday, the ratio stays within
 *   0–100%, and doing more than prescribed — itself worth a look after surgery — stays visible.
 * - No sessions prescribed in a window gives a ratio of null, not 0 or NaN.
 */
import {
	addDays,
	daysBetween,
	datesFrom,
	isoWeekStart,
	weekdayOf,
	type LocalDate,
	type Weekday
} from './calendar';

/** An inclusive run of paused days. */
export interface Pause {
	from: LocalDate;
	to: LocalDate;
}

/** When a programme (or one exercise in it) asks for sessions. */
export interface Schedule {
	startDate: LocalDate;
	/** Last day, included; null while the programme runs on. */
	endDate: LocalDate | null;
	sessionsPerDay: number;
	/** Exercise days a week, 1–7: any that many days of each Monday-first week, unless `weekdays` is given. */
	daysPerWeek: number;
	/** The weekdays the clinician chose; when given it wins over `daysPerWeek`. */
	weekdays?: readonly Weekday[] | null;
	pauses?: readonly Pause[];
}

/**
 * The one definition of a session that counts, used by the patient's Today and the clinician's
 * figures alike: a log with at least one set done. A log of no sets (stopped before the first,
 * e.g. for pain) is kept for its pain score but is not a session done.
 */
export function countsAsSession(log: { setsDone: number }): boolean {
	return log.setsDone >= 1;
}

/** True when the clinician chose weekdays; otherwise any `daysPerWeek` days of each week count. */
export function hasChosenWeekdays(
	schedule: Pick<Schedule, 'weekdays'>
): schedule is { weekdays: readonly Weekday[] } {
	return !!schedule.weekdays && schedule.weekdays.length > 0;
}

/** The chosen weekdays, Monday first, without repeats; null for "any N days a week". */
export function chosenWeekdays(schedule: Pick<Schedule, 'weekdays'>): Weekday[] | null {
	if (!hasChosenWeekdays(schedule)) return null;
	return [...new Set(schedule.weekdays)].sort((a, b) => a - b);
}

function checkDaysPerWeek(schedule: Schedule): void {
	if (
		!Number.isInteger(schedule.daysPerWeek) ||
		schedule.daysPerWeek < 1 ||
		schedule.daysPerWeek > 7
	) {
		throw new RangeError(
			`Days a week must be a whole number from 1 to 7, not ${schedule.daysPerWeek}.`
		);
	}
}

function isPaused(schedule: Schedule, date: LocalDate): boolean {
	return (schedule.pauses ?? []).some((p) => date >= p.from && date <= p.to);
}

/** Inside the programme's dates and not paused: a day on which sessions may be asked for. */
export function isProgrammeDay(schedule: Schedule, date: LocalDate): boolean {
	if (date < schedule.startDate) return false;
	if (schedule.endDate !== null && date > schedule.endDate) return false;
	return !isPaused(schedule, date);
}

/** A day that can be an exercise day: a programme day, on a chosen weekday when there are any. */
function isExerciseDayCandidate(schedule: Schedule, date: LocalDate): boolean {
	if (!isProgrammeDay(schedule, date)) return false;
	const weekdays = chosenWeekdays(schedule);
	return weekdays === null || weekdays.includes(weekdayOf(date));
}

/**
 * Exercise days asked for in one Monday-first week of an "any N days a week" schedule: N in a full
 * week; in a week cut short by the start, the end or a pause, N in proportion to the days left,
 * rounded to the nearest whole day (our choice), and never more than the days left.
 */
export function daysAskedInWeek(schedule: Schedule, weekStart: LocalDate): number {
	checkDaysPerWeek(schedule);
	const open = datesFrom(weekStart, addDays(weekStart, 6)).filter((d) =>
		isProgrammeDay(schedule, d)
	).length;
	return Math.min(open, Math.round((schedule.daysPerWeek * open) / 7));
}

/**
 * Exercise days a week asks for once the days with sessions are known (`doneDays`, open days of
 * that week): `daysAskedInWeek`, except that a short week rounded down to none still counts a day
 * the patient exercised on — offered, done, and so counted rather than left as extra.
 */
export function daysAskedGivenDone(
	schedule: Schedule,
	weekStart: LocalDate,
	doneDays: ReadonlySet<LocalDate>
): number {
	const asked = daysAskedInWeek(schedule, weekStart);
	return asked === 0 && doneDays.size > 0 ? 1 : asked;
}

/**
 * Sessions asked for on one date by a schedule with chosen weekdays: 0 outside the programme, on
 * other weekdays and on paused days. An "any N days a week" schedule asks for no particular day,
 * so it answers null.
 */
export function sessionsPrescribedOn(schedule: Schedule, date: LocalDate): number | null {
	if (!hasChosenWeekdays(schedule)) return null;
	return isExerciseDayCandidate(schedule, date) ? schedule.sessionsPerDay : 0;
}

/** Adherence over one window of days. */
export interface AdherenceWindow {
	from: LocalDate;
	to: LocalDate;
	prescribed: number;
	/** Logged sessions that count: at most the prescribed number each day. */
	counted: number;
	/** Logged sessions beyond the prescription (more than asked, or on a day without sessions). */
	extra: number;
	/** counted ÷ prescribed, 0–1; null when nothing was prescribed. */
	ratio: number | null;
	/** The ratio as a whole percentage; null when nothing was prescribed. */
	percent: number | null;
}

/**
 * Sessions a patient may do on a date: those asked on a chosen weekday, or, for "any N days a
 * week", a day's sessions on every programme day (any of them may be one of the N). For reminders
 * and planning, never for adherence.
 */
export function sessionsOfferedOn(schedule: Schedule, date: LocalDate): number {
	return (
		sessionsPrescribedOn(schedule, date) ??
		(isProgrammeDay(schedule, date) ? schedule.sessionsPerDay : 0)
	);
}

interface Tally {
	prescribed: number;
	counted: number;
	extra: number;
}

/** Sessions logged on each date. */
function logsPerDay(loggedDates: readonly LocalDate[]): Map<LocalDate, number> {
	const perDay = new Map<LocalDate, number>();
	for (const date of loggedDates) perDay.set(date, (perDay.get(date) ?? 0) + 1);
	return perDay;
}

/**
 * The days `from`–`to` of a schedule with chosen weekdays. Each day counts at most the sessions
 * asked that day. `inProgress` (today) asks only for what is already logged: it cannot be missed yet.
 */
function tallyChosenDays(
	schedule: Schedule,
	perDay: Map<LocalDate, number>,
	from: LocalDate,
	to: LocalDate,
	inProgress: LocalDate | null
): Tally {
	const tally: Tally = { prescribed: 0, counted: 0, extra: 0 };
	for (const date of datesFrom(from, to)) {
		const asked = isExerciseDayCandidate(schedule, date) ? schedule.sessionsPerDay : 0;
		const done = perDay.get(date) ?? 0;
		const counted = Math.min(asked, done);
		tally.prescribed += date === inProgress ? counted : asked;
		tally.counted += counted;
		tally.extra += done - counted;
	}
	return tally;
}

/**
 * The part `from`–`to` of one Monday-first week of an "any N days a week" schedule.
 * - Days logged in the week before `from` use up the week's days first (they were counted then).
 * - The best logged days in the part count, up to the days still asked; each counts at most the
 *   sessions a day; the rest of what was logged is extra.
 * - A day is missed only when it can no longer be made up: the part asks for at least as many days
 *   as the week's remaining days after `to` cannot hold. So a window ending on a Wednesday does not
 *   count a week as missed that the patient may finish by Sunday, and consecutive windows add up
 *   to the week's days.
 * - `inProgress` (today) counts as a day still to come unless something was logged on it, and then
 *   it asks only for what was logged.
 */
function tallyFlexibleWeekPart(
	schedule: Schedule,
	perDay: Map<LocalDate, number>,
	weekStart: LocalDate,
	from: LocalDate,
	to: LocalDate,
	inProgress: LocalDate | null
): Tally {
	const spd = schedule.sessionsPerDay;
	const week = datesFrom(weekStart, addDays(weekStart, 6));
	const open = (d: LocalDate) => isProgrammeDay(schedule, d);
	const logged = (d: LocalDate) => perDay.get(d) ?? 0;
	const asked = daysAskedGivenDone(
		schedule,
		weekStart,
		new Set(week.filter((d) => open(d) && logged(d) > 0))
	);

	const doneBefore = week.filter((d) => d < from && open(d) && logged(d) > 0).length;
	const stillAsked = Math.max(0, asked - doneBefore);
	const part = week.filter((d) => d >= from && d <= to);
	const doneInPart = part
		.filter((d) => open(d) && logged(d) > 0)
		.sort((x, y) => logged(y) - logged(x) || (x < y ? -1 : 1));
	const countedDays = doneInPart.slice(0, stillAsked);
	const countedSet = new Set(countedDays);

	const daysStillToCome =
		week.filter((d) => d > to && open(d)).length +
		(inProgress !== null &&
		part.includes(inProgress) &&
		open(inProgress) &&
		logged(inProgress) === 0
			? 1
			: 0);
	const openInPart = part.filter((d) => open(d) && !(d === inProgress && logged(d) === 0)).length;
	const mustInPart = Math.min(openInPart, Math.max(0, stillAsked - daysStillToCome));
	const askedDays = Math.min(stillAsked, Math.max(mustInPart, countedDays.length));

	const tally: Tally = { prescribed: 0, counted: 0, extra: 0 };
	for (const d of part) {
		const done = logged(d);
		const counted = countedSet.has(d) ? Math.min(spd, done) : 0;
		tally.counted += counted;
		tally.extra += done - counted;
		if (countedSet.has(d)) tally.prescribed += d === inProgress ? counted : spd;
	}
	tally.prescribed += (askedDays - countedDays.length) * spd;
	return tally;
}

function windowOf(from: LocalDate, to: LocalDate, tally: Tally): AdherenceWindow {
	const ratio = tally.prescribed === 0 ? null : tally.counted / tally.prescribed;
	return {
		from,
		to,
		...tally,
		ratio,
		percent: ratio === null ? null : Math.round(ratio * 100)
	};
}

function tallySchedule(
	schedule: Schedule,
	loggedDates: readonly LocalDate[],
	from: LocalDate,
	to: LocalDate,
	inProgress: LocalDate | null
): Tally {
	checkDaysPerWeek(schedule);
	const perDay = logsPerDay(loggedDates);
	if (hasChosenWeekdays(schedule)) return tallyChosenDays(schedule, perDay, from, to, inProgress);
	const tally: Tally = { prescribed: 0, counted: 0, extra: 0 };
	for (let weekStart = isoWeekStart(from); weekStart <= to; weekStart = addDays(weekStart, 7)) {
		const partFrom = weekStart < from ? from : weekStart;
		const weekEnd = addDays(weekStart, 6);
		const partTo = weekEnd > to ? to : weekEnd;
		const part = tallyFlexibleWeekPart(schedule, perDay, weekStart, partFrom, partTo, inProgress);
		tally.prescribed += part.prescribed;
		tally.counted += part.counted;
		tally.extra += part.extra;
	}
	return tally;
}

function checkWindow(days: number): void {
	if (!Number.isInteger(days) || days < 1) {
		throw new RangeError(`A window is a whole number of days, at least 1, not ${days}.`);
	}
}

/**
 * Adherence over the `days` days ending on `endingOn` (included), all of them complete days. Pass
 * yesterday for complete days only, or use `adherenceToDate` for a window that ends today.
 * `loggedDates` holds one date per session that counts (`countsAsSession`).
 */
export function adherence(
	schedule: Schedule,
	loggedDates: readonly LocalDate[],
	endingOn: LocalDate,
	days: number
): AdherenceWindow {
	checkWindow(days);
	const from = addDays(endingOn, 1 - days);
	return windowOf(from, endingOn, tallySchedule(schedule, loggedDates, from, endingOn, null));
}

/** Adherence over the last 7 and the last 28 days ending on `endingOn`. */
export function adherenceSummary(
	schedule: Schedule,
	loggedDates: readonly LocalDate[],
	endingOn: LocalDate
): { last7: AdherenceWindow; last28: AdherenceWindow } {
	return {
		last7: adherence(schedule, loggedDates, endingOn, 7),
		last28: adherence(schedule, loggedDates, endingOn, 28)
	};
}

function combined(
	items: readonly { schedule: Schedule; loggedDates: readonly LocalDate[] }[],
	endingOn: LocalDate,
	days: number,
	inProgress: LocalDate | null
): AdherenceWindow {
	checkWindow(days);
	const from = addDays(endingOn, 1 - days);
	const tally: Tally = { prescribed: 0, counted: 0, extra: 0 };
	for (const item of items) {
		const t = tallySchedule(item.schedule, item.loggedDates, from, endingOn, inProgress);
		tally.prescribed += t.prescribed;
		tally.counted += t.counted;
		tally.extra += t.extra;
	}
	return windowOf(from, endingOn, tally);
}

/** Several schedules (one per exercise) added together over one window of complete days. */
export function combinedAdherence(
	items: readonly { schedule: Schedule; loggedDates: readonly LocalDate[] }[],
	endingOn: LocalDate,
	days: number
): AdherenceWindow {
	return combined(items, endingOn, days, null);
}

/** E.g. "18 of 21 sessions (86%), 2 extra" or "No sessions were due in these 7 days". */
export function describeAdherence(window: AdherenceWindow): string {
	const days = daysBetween(window.from, window.to) + 1;
	if (window.percent === null) {
		const base = `No sessions were due in these ${days} days`;
		return window.extra > 0 ? `${base}; ${window.extra} logged anyway` : base;
	}
	const noun = window.prescribed === 1 ? 'session' : 'sessions';
	const extra = window.extra > 0 ? `, ${window.extra} extra` : '';
	return `${window.counted} of ${window.prescribed} ${noun} (${window.percent}%)${extra}`;
}

/**
 * Adherence over the `days` days ending on `today`, where today asks only for the sessions
 * already logged: a day in progress cannot be missed yet, yet a session done this morning shows
 * at once. The days before today count in full, as in `adherence`.
 */
export function adherenceToDate(
	items: readonly { schedule: Schedule; loggedDates: readonly LocalDate[] }[],
	today: LocalDate,
	days: number
): AdherenceWindow {
	return combined(items, today, days, today);
}
