/**
 * When a patient's sessions fall: which days a programme runs, the times of day its sessions are
 * suggested at (the calendar reminders use the same times), and how far through today the
 * patient is. Dates are the patient's own 'YYYY-MM-DD'; instants are epoch milliseconds.
 */
import {
	chosenWeekdays,
	daysAskedGivenDone,
	isProgrammeDay,
	sessionsPrescribedOn,
	type Schedule
} from '$lib/clinical/adherence';
import {
	describeWeekdays,
	isoWeekStart,
	localDateOf,
	startOfLocalDay,
	type LocalDate,
	type Weekday
} from '$lib/clinical/calendar';

/** Sessions are spread over the waking day, from 09:00 to 19:00 (common practice). */
export const FIRST_SESSION_MINUTE = 9 * 60;
export const LAST_SESSION_MINUTE = 19 * 60;

/**
 * Minutes after local midnight of each of `count` sessions: one at 09:00, two at 09:00 and
 * 19:00, three at 09:00, 14:00 and 19:00 …, evenly spaced and rounded to a quarter hour.
 */
export function sessionMinutes(count: number): number[] {
	if (!Number.isInteger(count) || count < 1) return [];
	if (count === 1) return [FIRST_SESSION_MINUTE];
	const span = LAST_SESSION_MINUTE - FIRST_SESSION_MINUTE;
	return Array.from(
		{ length: count },
		(_, i) => FIRST_SESSION_MINUTE + Math.round((span * i) / (count - 1) / 15) * 15
	);
}

/** "09:00", "14:15" — a time of day on the 24-hour clock. */
export function clockTime(minutes: number): string {
	const h = Math.floor(minutes / 60);
	const m = minutes % 60;
	return `${String(h).padStart(2, '0')}:${String(m).padStart(2, '0')}`;
}

/** Minutes since local midnight at an instant, on the patient's wall clock. */
export function minutesIntoDay(instant: number, timeZone: string): number {
	const parts = new Intl.DateTimeFormat('en-GB', {
		timeZone,
		hourCycle: 'h23',
		hour: '2-digit',
		minute: '2-digit'
	}).formatToParts(instant);
	const get = (type: string) => Number(parts.find((p) => p.type === type)?.value ?? 0);
	return get('hour') * 60 + get('minute');
}

/**
 * The instant a local wall-clock time happens on a date in a time zone. Counting from the start
 * of the local day would be an hour out on the days clocks change, so the guess is corrected by
 * what the clock really reads then. A time the clocks skip (02:30 on a spring-forward night)
 * comes out an hour later, as calendar programs do.
 */
export function instantAt(date: LocalDate, minutes: number, timeZone: string): number {
	const dayStart = startOfLocalDay(date, timeZone);
	let instant = dayStart + minutes * 60_000;
	for (let i = 0; i < 2; i++) {
		const sameDay = localDateOf(instant, timeZone) === date;
		const seen = sameDay ? minutesIntoDay(instant, timeZone) : minutes + 24 * 60;
		if (seen === minutes) break;
		instant += (minutes - seen) * 60_000;
	}
	return instant;
}

export interface ProgrammeDays {
	startDate: LocalDate;
	endDate: LocalDate | null;
	pauses: { fromDate: LocalDate; toDate: LocalDate }[];
}

/** The pause a date falls in, if any. */
export function pauseOn<P extends { fromDate: LocalDate; toDate: LocalDate }>(
	programme: { pauses: P[] },
	date: LocalDate
): P | undefined {
	return programme.pauses.find((p) => p.fromDate <= date && date <= p.toDate);
}

/**
 * One exercise's schedule in the terms of lib/clinical/adherence, so the patient is asked for
 * exactly the sessions their clinician's adherence figures count: on the weekdays the clinician
 * chose, or on any `daysPerWeek` days of each week.
 */
export function itemSchedule(
	programme: ProgrammeDays,
	dosage: { sessionsPerDay: number; daysPerWeek: number },
	weekdays: readonly Weekday[] | null = null
): Schedule {
	return {
		startDate: programme.startDate,
		endDate: programme.endDate,
		sessionsPerDay: dosage.sessionsPerDay,
		daysPerWeek: dosage.daysPerWeek,
		weekdays,
		pauses: programme.pauses.map((p) => ({ from: p.fromDate, to: p.toDate }))
	};
}

export type ItemDayStatus =
	/** Sessions are asked for today and not all are done. */
	| { kind: 'due'; done: number; of: number }
	/** Today's sessions are all done. */
	| { kind: 'done'; done: number; of: number }
	/**
	 * No sessions are asked for today: another weekday's exercise (`other-weekday`), this week's
	 * days already done (`week-done`), or a day outside the programme or paused (`no-day`).
	 * `done` counts any sessions logged today all the same.
	 */
	| { kind: 'rest'; reason: 'other-weekday' | 'week-done' | 'no-day'; done: number };

/**
 * Where one exercise stands today, from its schedule and the dates of the sessions done this
 * week up to today (one date per session that counts; other dates are ignored). With "any N days
 * a week" today is an exercise day until the week's N days are done, and stays one once a session
 * was logged on it.
 */
export function itemDayStatus(
	schedule: Schedule,
	today: LocalDate,
	sessionDatesThisWeek: readonly LocalDate[]
): ItemDayStatus {
	const weekStart = isoWeekStart(today);
	const doneToday = sessionDatesThisWeek.filter((d) => d === today).length;
	const chosen = sessionsPrescribedOn(schedule, today);
	let of: number;
	if (chosen !== null) {
		if (chosen === 0) {
			const weekday = chosenWeekdays(schedule) !== null && isProgrammeDay(schedule, today);
			return { kind: 'rest', reason: weekday ? 'other-weekday' : 'no-day', done: doneToday };
		}
		of = chosen;
	} else {
		if (!isProgrammeDay(schedule, today))
			return { kind: 'rest', reason: 'no-day', done: doneToday };
		// The days adherence counts: open days of this week with a session, up to today.
		const doneDays = new Set(
			sessionDatesThisWeek.filter(
				(d) => d >= weekStart && d <= today && isProgrammeDay(schedule, d)
			)
		);
		const daysBefore = [...doneDays].filter((d) => d < today).length;
		const asked = daysAskedGivenDone(schedule, weekStart, doneDays);
		if (doneToday === 0 && daysBefore > 0 && daysBefore >= asked) {
			return { kind: 'rest', reason: 'week-done', done: 0 };
		}
		of = schedule.sessionsPerDay;
	}
	const done = Math.min(doneToday, of);
	return done >= of ? { kind: 'done', done, of } : { kind: 'due', done, of };
}

export { describeWeekdays };

/** The days a schedule asks for, in words: "every day", "Tuesday and Friday", "any 3 days a week". */
export function describeExerciseDays(schedule: Pick<Schedule, 'weekdays' | 'daysPerWeek'>): string {
	const chosen = chosenWeekdays(schedule);
	if (chosen !== null) return describeWeekdays(chosen);
	if (schedule.daysPerWeek >= 7) return 'every day';
	return schedule.daysPerWeek === 1
		? 'any 1 day a week'
		: `any ${schedule.daysPerWeek} days a week`;
}

/**
 * Why no session is asked for today, in the patient's words, from the status and the days the
 * exercise is for (`describeExerciseDays`).
 */
export function restWords(status: Extract<ItemDayStatus, { kind: 'rest' }>, days: string): string {
	switch (status.reason) {
		case 'other-weekday':
			return `Not today: this exercise is for ${days}.`;
		case 'week-done':
			return `This week's days are done: this exercise is for ${days}.`;
		case 'no-day':
			return 'No session is asked for today.';
	}
}

export interface DaySummary {
	/** Sessions logged today, over all exercises due today (capped at each one's sessions). */
	done: number;
	/** Sessions due today, over all exercises. */
	due: number;
	/**
	 * The next session, numbered from 1 among the day's sessions, with its suggested time;
	 * null when today's are all done. Session k is done when every exercise due today with at
	 * least k sessions has k logged.
	 */
	next: { number: number; of: number; minutes: number } | null;
}

/** How far through today a patient is, from each exercise's status. */
export function summariseDay(statuses: ItemDayStatus[]): DaySummary {
	let done = 0;
	let due = 0;
	let sessions = 0;
	let nextNumber = Infinity;
	for (const status of statuses) {
		if (status.kind === 'rest') continue;
		done += status.done;
		due += status.of;
		sessions = Math.max(sessions, status.of);
		if (status.done < status.of) nextNumber = Math.min(nextNumber, status.done + 1);
	}
	if (!Number.isFinite(nextNumber)) return { done, due, next: null };
	return {
		done,
		due,
		next: { number: nextNumber, of: sessions, minutes: sessionMinutes(sessions)[nextNumber - 1] }
	};
}

/** How late a suggested session may still be called "a good time" (common practice: evening). */
export const LATEST_GOOD_MINUTE = 21 * 60;

/**
 * When the next session is, in words: "around 14:00" ahead of its time; "now is a good time
 * (suggested for 09:00)" once its time has come during the day; late at night only the
 * suggested time, since midnight is not a good time to exercise.
 */
export function nextSessionWhen(suggestedMinutes: number, nowMinutes: number): string {
	if (suggestedMinutes > nowMinutes) return `around ${clockTime(suggestedMinutes)}`;
	if (nowMinutes < LATEST_GOOD_MINUTE) {
		return `now is a good time (suggested for ${clockTime(suggestedMinutes)})`;
	}
	return `suggested for ${clockTime(suggestedMinutes)}; if it is late for you, start fresh tomorrow`;
}
