/**
 * When the weekly digest is due. A digest belongs to an ISO week (named by its Monday) and is
 * due from a weekday and hour of that week in one time zone; once due it stays due until sent,
 * so a worker that was down at the hour sends it when it comes back.
 */
import {
	addDays,
	isoWeekStart,
	localDateOf,
	startOfLocalDay,
	type LocalDate,
	type Weekday
} from '../clinical/calendar';

export interface DigestSchedule {
	/** ISO weekday the digest goes out on: 1 = Monday. */
	weekday: Weekday;
	/** Hour of that day, 0–23, on the local clock. */
	hour: number;
	timeZone: string;
}

/** The week a digest sent at `now` belongs to, and the instant that week's digest falls due. */
export function digestWeek(
	now: Date,
	schedule: DigestSchedule
): { weekStart: LocalDate; dueAt: Date; due: boolean } {
	const weekStart = isoWeekStart(localDateOf(now, schedule.timeZone));
	const day = addDays(weekStart, schedule.weekday - 1);
	// Hours after local midnight; on a clock-change day this lands an hour off, which a weekly
	// e-mail can bear.
	const dueAt = new Date(startOfLocalDay(day, schedule.timeZone) + schedule.hour * 3_600_000);
	return { weekStart, dueAt, due: now.getTime() >= dueAt.getTime() };
}
