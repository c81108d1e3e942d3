/**
 * Calendar days as a patient lives them. Dates are 'YYYY-MM-DD' strings in the patient's own time
 * zone (the same form as `patient.operationDate`); instants are `Date` or epoch milliseconds.
 * Day arithmetic works on the dates themselves, so a 23- or 25-hour day around a clock change is
 * still one day. Only instants need a time zone, and those conversions use Intl.DateTimeFormat.
 */

/** A calendar date 'YYYY-MM-DD' (proleptic Gregorian, as ISO 8601). */
export type LocalDate = string;

/** ISO 8601 weekday: 1 = Monday … 7 = Sunday. */
export type Weekday = 1 | 2 | 3 | 4 | 5 | 6 | 7;

const DAY_MS = 86_400_000;
const DATE_PATTERN = /^(\d{4})-(\d{2})-(\d{2})$/;

/** The date as day number since 1970-01-01, or null when the text is not a real calendar date. */
function toDayNumber(date: string): number | null {
	const m = DATE_PATTERN.exec(date);
	if (!m) return null;
	const [year, month, day] = [Number(m[1]), Number(m[2]), Number(m[3])];
	const ms = Date.UTC(year, month - 1, day);
	const back = new Date(ms);
	// Date.UTC rolls 2026-02-30 over into March; a real date survives the round trip.
	if (back.getUTCFullYear() !== year || back.getUTCMonth() !== month - 1) return null;
	if (back.getUTCDate() !== day) return null;
	return ms / DAY_MS;
}

function dayNumber(date: LocalDate): number {
	const n = toDayNumber(date);
	if (n === null) throw new RangeError(`"${date}" is not a calendar date written YYYY-MM-DD.`);
	return n;
}

function fromDayNumber(n: number): LocalDate {
	return new Date(n * DAY_MS).toISOString().slice(0, 10);
}

/** True when the text is a real calendar date written 'YYYY-MM-DD' (2026-02-30 is not). */
export function isLocalDate(text: string): boolean {
	return toDayNumber(text) !== null;
}

const formatters = new Map<string, Intl.DateTimeFormat>();

function formatterFor(timeZone: string): Intl.DateTimeFormat {
	let f = formatters.get(timeZone);
	if (!f) {
		f = new Intl.DateTimeFormat('en-US', {
			timeZone,
			calendar: 'gregory',
			numberingSystem: 'latn',
			year: 'numeric',
			month: '2-digit',
			day: '2-digit'
		});
		formatters.set(timeZone, f);
	}
	return f;
}

/** True when Intl knows the IANA time zone name (e.g. 'Europe/London'). */
export function isTimeZone(timeZone: string): boolean {
	try {
		formatterFor(timeZone);
		return true;
	} catch {
		return false;
	}
}

/** The patient's calendar date at an instant, in their IANA time zone. */
export function localDateOf(instant: Date | number, timeZone: string): LocalDate {
	const parts = formatterFor(timeZone).formatToParts(instant);
	const get = (type: string) => parts.find((p) => p.type === type)?.value ?? '';
	return `${get('year').padStart(4, '0')}-${get('month')}-${get('day')}`;
}

/**
 * The first instant (epoch ms) of a local date in a time zone. Where a clock change skips
 * midnight (America/Santiago in September), the day starts at the change, e.g. 01:00.
 * Found by bisection, assuming the local date never runs backwards (true of every tz rule in use).
 */
export function startOfLocalDay(date: LocalDate, timeZone: string): number {
	const utcMidnight = dayNumber(date) * DAY_MS;
	// Offsets in use lie within −12 h … +14 h, so local midnight lies in this window.
	let low = utcMidnight - 15 * 3_600_000; // before the day starts
	let high = utcMidnight + 13 * 3_600_000; // after the day has started
	while (high - low > 1) {
		const mid = Math.floor((low + high) / 2);
		if (localDateOf(mid, timeZone) >= date) high = mid;
		else low = mid;
	}
	return high;
}

/** The date `days` days after `date` (negative goes back). */
export function addDays(date: LocalDate, days: number): LocalDate {
	if (!Number.isInteger(days)) throw new RangeError(`A number of days must be whole, not ${days}.`);
	return fromDayNumber(dayNumber(date) + days);
}

/** Whole days from `from` to `to`: 0 for the same date, negative when `to` is earlier. */
export function daysBetween(from: LocalDate, to: LocalDate): number {
	return dayNumber(to) - dayNumber(from);
}

/** ISO weekday of a date: 1 = Monday … 7 = Sunday. */
export function weekdayOf(date: LocalDate): Weekday {
	// 1970-01-01 was a Thursday (ISO 4).
	return (((((dayNumber(date) + 3) % 7) + 7) % 7) + 1) as Weekday;
}

/** The Monday on or before a date (ISO 8601 weeks start on Monday). */
export function isoWeekStart(date: LocalDate): LocalDate {
	return addDays(date, 1 - weekdayOf(date));
}

/** Every date from `from` to `to`, both included; empty when `to` is before `from`. */
export function datesFrom(from: LocalDate, to: LocalDate): LocalDate[] {
	const start = dayNumber(from);
	const count = dayNumber(to) - start + 1;
	return Array.from({ length: Math.max(0, count) }, (_, i) => fromDayNumber(start + i));
}

/** Time since an event (an operation, a programme start) in completed weeks and leftover days. */
export interface TimeSince {
	/** Whole days since the event; the event's own date is day 0; negative before it. */
	days: number;
	/** Completed weeks: days 0–6 are week 0, days 7–13 week 1; negative before the event. */
	weeks: number;
	/** Days into the current week, 0–6. */
	extraDays: number;
}

/**
 * Time after an operation as completed weeks: the operation date is day 0, days 0–6 are week 0,
 * days 7–13 week 1. Protocols write elapsed time ("weeks 2–6"), so a phase starting at week 2
 * begins on day 14 and a table's bounds compare directly with `weeks`.
 */
export function weeksSince(eventDate: LocalDate, date: LocalDate): TimeSince {
	const days = daysBetween(eventDate, date);
	const weeks = Math.floor(days / 7);
	return { days, weeks, extraDays: days - weeks * 7 };
}

/**
 * The programme week a date falls in, counting the start date's week as week 1 (days 0–6), as
 * progression rules do ("week 1 = first week"); 0 or less before the start.
 */
export function programmeWeek(startDate: LocalDate, date: LocalDate): number {
	return Math.floor(daysBetween(startDate, date) / 7) + 1;
}

/** "6 weeks 3 days", "1 week", "0 days" — time since an event in plain words; "in 3 days" before it. */
export function describeTimeSince(since: TimeSince): string {
	if (since.days < 0) {
		const ahead = -since.days;
		return `in ${ahead} ${ahead === 1 ? 'day' : 'days'}`;
	}
	const parts: string[] = [];
	if (since.weeks > 0) parts.push(`${since.weeks} ${since.weeks === 1 ? 'week' : 'weeks'}`);
	if (since.extraDays > 0 || since.weeks === 0) {
		parts.push(`${since.extraDays} ${since.extraDays === 1 ? 'day' : 'days'}`);
	}
	return parts.join(' ');
}

const WEEKDAY_NAMES = [
	'Monday',
	'Tuesday',
	'Wednesday',
	'Thursday',
	'Friday',
	'Saturday',
	'Sunday'
];

/** "every day", "Monday, Wednesday and Friday". */
export function describeWeekdays(weekdays: readonly Weekday[]): string {
	if (weekdays.length === 7) return 'every day';
	const names = weekdays.map((d) => WEEKDAY_NAMES[d - 1]);
	return names.length === 1 ? names[0] : `${names.slice(0, -1).join(', ')} and ${names.at(-1)}`;
}
