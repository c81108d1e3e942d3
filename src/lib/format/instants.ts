/**
 * Moments in time (a save, an upload, an expiry) in words, in a named time zone. Pages format
 * them with the viewer's zone rather than the process's, so the server's rendering and the
 * browser's agree, and a server running in UTC still shows a clinic its own wall-clock times.
 * Calendar dates without a time (a session's day, an operation date) are LocalDate strings and
 * never pass through here: format/dates writes them, in the same words.
 */

import { localDateOf } from '../clinical/calendar';
import { formatDate } from './dates';

/** Used when nobody has said otherwise (signed-out pages, new clinics and patients). */
export const DEFAULT_TIME_ZONE = 'Europe/London';

export type InstantStyle =
	/** 1 Dec 2026, 14:05 */
	| 'date-time'
	/** 1 Dec 2026, 14:05 GMT — for e-mails, read away from the page */
	| 'date-time-zone'
	/** 1 Dec 2026 */
	| 'date'
	/** 14:05 */
	| 'time';

const timeFormatters = new Map<string, Intl.DateTimeFormat>();

function timeFormatter(timeZone: string, withZone: boolean): Intl.DateTimeFormat {
	const key = `${timeZone}\n${withZone}`;
	let formatter = timeFormatters.get(key);
	if (!formatter) {
		formatter = new Intl.DateTimeFormat('en-GB', {
			hour: '2-digit',
			minute: '2-digit',
			hourCycle: 'h23',
			timeZone,
			...(withZone ? { timeZoneName: 'short' as const } : {})
		});
		timeFormatters.set(key, formatter);
	}
	return formatter;
}

/**
 * `value` (a Date, an ISO string or epoch milliseconds) in `timeZone`: its date written as every
 * date for people is (format/dates), its time on the 24-hour clock.
 */
export function formatInstant(
	value: Date | string | number,
	timeZone: string,
	style: InstantStyle = 'date-time'
): string {
	const instant = value instanceof Date ? value : new Date(value);
	const time = () => timeFormatter(timeZone, style === 'date-time-zone').format(instant);
	if (style === 'time') return time();
	const date = formatDate(localDateOf(instant, timeZone));
	return style === 'date' ? date : `${date}, ${time()}`;
}
