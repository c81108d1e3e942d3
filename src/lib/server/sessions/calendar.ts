/**
 * The patient's reminders as an iCalendar file (RFC 5545, written by the `ics` package): one
 * event per session on each day sessions are offered (lib/clinical/adherence decides which: the
 * chosen weekdays, or every programme day for "any N days a week", said in the event's words), at
 * the times the Today page suggests, each with an alarm.
 * Events are written in UTC, one by one rather than as a repeating rule, so 09:00 stays 09:00 on
 * the patient's wall clock across clock changes, pauses are simply left out, and the dosage in
 * each event's words is that week's.
 */
import { createEvents, type EventAttributes } from 'ics';
import {
	addDays,
	datesFrom,
	programmeWeek,
	type LocalDate,
	type Weekday
} from '$lib/clinical/calendar';
import { describeDosage, dosageForWeek, sessionSeconds, type Dosage } from '$lib/dosage';
import type { Progression } from '$lib/dosage/types';
import { sessionsOfferedOn } from '$lib/clinical/adherence';
import {
	instantAt,
	itemSchedule,
	sessionMinutes,
	type ProgrammeDays
} from '$lib/sessions/schedule';

/** Without an end date, reminders cover this many days from today. */
export const OPEN_ENDED_DAYS = 56;
/** Reminders never cover more than this many days, whatever the end date. */
export const MAX_DAYS = 120;
/** The alarm goes off this many minutes before a session. */
export const ALARM_MINUTES_BEFORE = 5;

export interface CalendarItem {
	title: string;
	dosage: Dosage;
	progression: Progression;
	/** The weekdays the clinician chose; null for any `daysPerWeek` days (reminded every day). */
	weekdays: Weekday[] | null;
}

export interface CalendarInput extends ProgrammeDays {
	programmeId: string;
	title: string;
	timeZone: string;
	/** The patient's today: reminders start here (or at the programme's start, if later). */
	today: LocalDate;
	items: CalendarItem[];
	/** The app's address, for the link in each event. */
	origin: string;
}

export interface ReminderDay {
	date: LocalDate;
	sessions: number;
	lines: string[];
	minutesLong: number;
}

/**
 * The days reminders cover and what each holds: the exercises asked for that day, the most
 * sessions any of them asks for, and that week's dosage. Pure, so tested without the file format.
 */
export function reminderDays(input: CalendarInput): ReminderDay[] {
	const from = input.today > input.startDate ? input.today : input.startDate;
	const cap = addDays(from, (input.endDate ? MAX_DAYS : OPEN_ENDED_DAYS) - 1);
	const to = input.endDate && input.endDate < cap ? input.endDate : cap;
	const days: ReminderDay[] = [];
	for (const date of datesFrom(from, to)) {
		const week = Math.max(1, programmeWeek(input.startDate, date));
		const asked = input.items
			.map((item) => {
				const dosage = dosageForWeek(item.dosage, item.progression, week);
				const schedule = itemSchedule(input, dosage, item.weekdays);
				return { item, dosage, schedule, sessions: sessionsOfferedOn(schedule, date) };
			})
			.filter((a) => a.sessions > 0);
		if (asked.length === 0) continue;
		const seconds = asked.reduce((sum, a) => sum + sessionSeconds(a.dosage), 0);
		days.push({
			date,
			sessions: Math.max(...asked.map((a) => a.sessions)),
			lines: asked.map(
				(a) =>
					`- ${a.item.title}: ${describeDosage(a.dosage, a.item.weekdays)}${
						a.item.weekdays === null && a.dosage.daysPerWeek < 7
							? ` Leave it out once this week's ${a.dosage.daysPerWeek} ${a.dosage.daysPerWeek === 1 ? 'day is' : 'days are'} done.`
							: ''
					}`
			),
			// A session's estimate, rounded up to 5 minutes, never under 5.
			minutesLong: Math.max(5, Math.ceil(seconds / 60 / 5) * 5)
		});
	}
	return days;
}

const CAUTION =
	'Stop and contact your clinician if pain is sharp or getting worse. This programme was prescribed for you and does not replace an assessment.';

/** The events of the file, in time order. */
export function reminderEvents(input: CalendarInput): EventAttributes[] {
	const link = new URL('/today', input.origin).toString();
	return reminderDays(input).flatMap((day) =>
		sessionMinutes(day.sessions).map((minutes, i): EventAttributes => {
			const session = day.sessions === 1 ? 'your session' : `session ${i + 1} of ${day.sessions}`;
			return {
				uid: `${input.programmeId}-${day.date}-${i + 1}@kinelume`,
				start: instantAt(day.date, minutes, input.timeZone),
				startInputType: 'utc',
				startOutputType: 'utc',
				duration: { minutes: day.minutesLong },
				title: `Home exercises: ${session}`,
				description: [
					`${input.title}, ${session} today.`,
					...day.lines,
					'',
					`Open your exercises: ${link}`,
					'',
					CAUTION
				].join('\n'),
				url: link,
				busyStatus: 'FREE',
				transp: 'TRANSPARENT',
				alarms: [
					{
						action: 'display',
						description: `Time for your home exercises (${session})`,
						trigger: { minutes: ALARM_MINUTES_BEFORE, before: true }
					}
				]
			};
		})
	);
}

/** The whole .ics file (CRLF line ends, folded lines, as RFC 5545 asks). */
export function calendarFile(input: CalendarInput): string {
	const { error, value } = createEvents(reminderEvents(input), {
		productId: '-//Kinelume//Home exercise reminders//EN',
		method: 'PUBLISH',
		calName: `${input.title} — reminders`
	});
	if (error || value === null) throw error ?? new Error('The calendar file could not be made.');
	return value;
}
