/**
 * Adherence: sessions logged over sessions prescribed, on the patient's own calendar days.
 *
 * Decisions (DEVELOPERS.md, "Clinical computations"):
 * - Which weekdays count: an explicit `weekdays` list when the programme has one; otherwise
 *   `daysPerWeek` spread over the ISO week by SPREAD_WEEKDAYS (3 → Monday, Wednesday, Friday).
 *   Weeks are calendar weeks, so a programme starting on a Wednesday prescribes nothing on the
 *   Monday before it.
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
	daysPerWeek: number;
	/** The weekdays to exercise on; when given it wins over `daysPerWeek`. */
	weekdays?: readonly Weekday[];
	pauses?: readonly Pause[];
}

/** The weekdays used for each number of days a week when no list is given (our choice: spread through the week, weekends last). */
export const SPREAD_WEEKDAYS: Record<number, readonly Weekday[]> = {
	1: [1],
	2: [1, 4],
	3: [1, 3, 5],
	4: [1, 2, 4, 5],
	5: [1, 2, 3, 4, 5],
	6: [1, 2, 3, 4, 5, 6],
	7: [1, 2, 3, 4, 5, 6, 7]
};

/** The weekdays a schedule exercises on, Monday first. */
export function scheduledWeekdays(schedule: Schedule): Weekday[] {
	if (schedule.weekdays && schedule.weekdays.length > 0) {
		return [...new Set(schedule.weekdays)].sort((a, b) => a - b);
	}
	const spread = SPREAD_WEEKDAYS[schedule.daysPerWeek];
	if (!spread) {
		throw new RangeError(
			`Days a week must be a whole number from 1 to 7, not ${schedule.daysPerWeek}.`
		);
	}
	return [...spread];
}

function isPaused(schedule: Schedule, date: LocalDate): boolean {
	return (schedule.pauses ?? []).some((p) => date >= p.from && date <= p.to);
}

/** Sessions prescribed on one local date: 0 outside the programme, on other weekdays and on paused days. */
export function sessionsPrescribedOn(schedule: Schedule, date: LocalDate): number {
	if (date < schedule.startDate) return 0;
	if (schedule.endDate !== null && date > schedule.endDate) return 0;
	if (!scheduledWeekdays(schedule).includes(weekdayOf(date))) return 0;
	if (isPaused(schedule, date)) return 0;
	return schedule.sessionsPerDay;
}

/** Sessions prescribed from `from` to `to`, both included. */
export function prescribedSessions(schedule: Schedule, from: LocalDate, to: LocalDate): number {
	let total = 0;
	for (const date of datesFrom(from, to)) total += sessionsPrescribedOn(schedule, date);
	return total;
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
 * Adherence over the `days` days ending on `endingOn` (included). Pass yesterday for complete
 * days only, so that today's sessions not yet done do not count as missed.
 */
export function adherence(
	schedule: Schedule,
	loggedDates: readonly LocalDate[],
	endingOn: LocalDate,
	days: number
): AdherenceWindow {
	if (!Number.isInteger(days) || days < 1) {
		throw new RangeError(`A window is a whole number of days, at least 1, not ${days}.`);
	}
	const from = addDays(endingOn, 1 - days);
	const perDay = new Map<LocalDate, number>();
	for (const date of loggedDates) {
		if (date >= from && date <= endingOn) perDay.set(date, (perDay.get(date) ?? 0) + 1);
	}
	let prescribed = 0;
	let counted = 0;
	let extra = 0;
	for (const date of datesFrom(from, endingOn)) {
		const asked = sessionsPrescribedOn(schedule, date);
		const done = perDay.get(date) ?? 0;
		prescribed += asked;
		counted += Math.min(asked, done);
		extra += Math.max(0, done - asked);
	}
	const ratio = prescribed === 0 ? null : counted / prescribed;
	return {
		from,
		to: endingOn,
		prescribed,
		counted,
		extra,
		ratio,
		percent: ratio === null ? null : Math.round(ratio * 100)
	};
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

/** Several schedules (one per exercise) added together over one window. */
export function combinedAdherence(
	items: readonly { schedule: Schedule; loggedDates: readonly LocalDate[] }[],
	endingOn: LocalDate,
	days: number
): AdherenceWindow {
	const windows = items.map((i) => adherence(i.schedule, i.loggedDates, endingOn, days));
	const sum = (key: 'prescribed' | 'counted' | 'extra') =>
		windows.reduce((total, w) => total + w[key], 0);
	const prescribed = sum('prescribed');
	const counted = sum('counted');
	const ratio = prescribed === 0 ? null : counted / prescribed;
	return {
		from: addDays(endingOn, 1 - days),
		to: endingOn,
		prescribed,
		counted,
		extra: sum('extra'),
		ratio,
		percent: ratio === null ? null : Math.round(ratio * 100)
	};
}

/** E.g. "18 of 21 sessions (86%), 2 extra" or "No sessions prescribed in these 7 days". */
export function describeAdherence(window: AdherenceWindow): string {
	const days = daysBetween(window.from, window.to) + 1;
	if (window.percent === null) {
		const base = `No sessions prescribed in these ${days} days`;
		return window.extra > 0 ? `${base}; ${window.extra} logged anyway` : base;
	}
	const noun = window.prescribed === 1 ? 'session' : 'sessions';
	const extra = window.extra > 0 ? `, ${window.extra} extra` : '';
	return `${window.counted} of ${window.prescribed} ${noun} (${window.percent}%)${extra}`;
}

/**
 * Adherence over the `days` days ending on `today`, where today counts only the sessions already
 * logged (at most today's prescription): a day in progress cannot be missed yet, yet a session
 * done this morning shows at once. The days before today count in full, as in `adherence`.
 */
export function adherenceToDate(
	items: readonly { schedule: Schedule; loggedDates: readonly LocalDate[] }[],
	today: LocalDate,
	days: number
): AdherenceWindow {
	if (!Number.isInteger(days) || days < 1) {
		throw new RangeError(`A window is a whole number of days, at least 1, not ${days}.`);
	}
	const past = days > 1 ? combinedAdherence(items, addDays(today, -1), days - 1) : null;
	const now = combinedAdherence(items, today, 1);
	const prescribed = (past?.prescribed ?? 0) + now.counted;
	const counted = (past?.counted ?? 0) + now.counted;
	const ratio = prescribed === 0 ? null : counted / prescribed;
	return {
		from: addDays(today, 1 - days),
		to: today,
		prescribed,
		counted,
		extra: (past?.extra ?? 0) + now.extra,
		ratio,
		percent: ratio === null ? null : Math.round(ratio * 100)
	};
}
