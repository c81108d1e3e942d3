/** A dosage in the words a patient reads on their programme. */
import { describeWeekdays, type Weekday } from '../clinical/calendar';
import type { Dosage } from './types';

const count = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;

/** Times a day in words: "once a day", "twice a day", "3 times a day". */
export function timesADay(n: number): string {
	if (n === 1) return 'once a day';
	if (n === 2) return 'twice a day';
	return `${n} times a day`;
}

/**
 * E.g. "1 set of 8 reps, hold 5 seconds, rest 30 seconds between sets; 3 times a day, every day."
 * With the weekdays a clinician chose, the days are named: "…; once a day, on Tuesday and Friday."
 */
export function describeDosage(d: Dosage, weekdays?: readonly Weekday[] | null): string {
	const parts = [`${count(d.sets, 'set', 'sets')} of ${count(d.reps, 'rep', 'reps')}`];
	if (d.holdSeconds > 0) parts.push(`hold ${count(d.holdSeconds, 'second', 'seconds')}`);
	if (d.sets > 1 && d.restSeconds > 0) {
		parts.push(`rest ${count(d.restSeconds, 'second', 'seconds')} between sets`);
	}
	const days =
		weekdays && weekdays.length > 0 && weekdays.length < 7
			? `on ${describeWeekdays(weekdays)}`
			: d.daysPerWeek === 7
				? 'every day'
				: `${count(d.daysPerWeek, 'day', 'days')} a week`;
	return `${parts.join(', ')}; ${timesADay(d.sessionsPerDay)}, ${days}.`;
}
