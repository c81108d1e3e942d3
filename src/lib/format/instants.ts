/**
 * Moments in time (a save, an upload, an expiry) in words, in a named time zone. Pages format
 * them with the viewer's zone rather than the process's, so the server's rendering and the
 * browser's agree, and a server running in UTC still shows a clinic its own wall-clock times.
 * Calendar dates without a time (a session's day, an operation date) are LocalDate strings and
 * never pass through here (lib/clinical/calendar, lib/followup/words).
 */

/** Used when nobody has said otherwise (signed-out pages, new clinics and patients). */
export const DEFAULT_TIME_ZONE = 'Europe/London';

export type InstantStyle =
	/** 1 Dec 2026, 14:05 */
	| 'date-time'
	/** 1 Dec 2026, 14:05 GMT — for e-mails, read away from the page */
	| 'date-time-zone'
	/** 1 Dec 2026 */
	| 'date'
	/** 1 December 2026 */
	| 'long-date'
	/** 14:05 */
	| 'time';

const OPTIONS: Record<InstantStyle, Intl.DateTimeFormatOptions> = {
	'date-time': { dateStyle: 'medium', timeStyle: 'short' },
	'date-time-zone': {
		day: 'numeric',
		month: 'short',
		year: 'numeric',
		hour: '2-digit',
		minute: '2-digit',
		hourCycle: 'h23',
		timeZoneName: 'short'
	},
	date: { dateStyle: 'medium' },
	'long-date': { dateStyle: 'long' },
	time: { timeStyle: 'short' }
};

const formatters = new Map<string, Intl.DateTimeFormat>();

/** `value` (a Date, an ISO string or epoch milliseconds) in `timeZone`, in British English. */
export function formatInstant(
	value: Date | string | number,
	timeZone: string,
	style: InstantStyle = 'date-time'
): string {
	const key = `${timeZone}\n${style}`;
	let formatter = formatters.get(key);
	if (!formatter) {
		formatter = new Intl.DateTimeFormat('en-GB', { ...OPTIONS[style], timeZone });
		formatters.set(key, formatter);
	}
	return formatter.format(value instanceof Date ? value : new Date(value));
}
