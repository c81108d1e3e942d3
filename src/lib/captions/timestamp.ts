/**
 * WebVTT timestamps (W3C WebVTT "WebVTT timestamp" and the parser's "collect a WebVTT
 * timestamp"): optional hours, minutes and seconds 00–59, a full stop, exactly three digits.
 */

// Hours may have any number of digits when present: the parser reads a first field that is not
// exactly two digits as hours, so "0:00:00.000" is accepted (web-platform-tests timings-too-short).
const TIMESTAMP = /^(?:(\d+):)?(\d{2}):(\d{2})\.(\d{3})$/;

/** Seconds for a WebVTT timestamp, or null when the text is not one. */
export function parseTimestamp(text: string): number | null {
	const m = TIMESTAMP.exec(text);
	if (!m) return null;
	const [hours, minutes, seconds, millis] = [m[1] ?? '0', m[2], m[3], m[4]].map(Number);
	if (minutes > 59 || seconds > 59) return null;
	return hours * 3600 + minutes * 60 + seconds + millis / 1000;
}

export interface FormatOptions {
	/** 'always' writes HH:MM:SS.mmm (files); 'auto' drops zero hours (messages to people). */
	hours?: 'always' | 'auto';
}

/** Writes seconds as a WebVTT timestamp, rounded to the millisecond. */
export function formatTimestamp(seconds: number, options: FormatOptions = {}): string {
	if (!Number.isFinite(seconds) || seconds < 0) {
		throw new RangeError(`A caption time must be zero or more seconds, not ${seconds}`);
	}
	const total = Math.round(seconds * 1000);
	const millis = total % 1000;
	const s = Math.floor(total / 1000) % 60;
	const m = Math.floor(total / 60_000) % 60;
	const h = Math.floor(total / 3_600_000);
	const pad = (n: number, width = 2) => String(n).padStart(width, '0');
	const rest = `${pad(m)}:${pad(s)}.${pad(millis, 3)}`;
	return options.hours === 'auto' && h === 0 ? rest : `${pad(h)}:${rest}`;
}

/** Rounds to whole milliseconds, the only precision a caption file can hold. */
export function toMillis(seconds: number): number {
	return Math.round(seconds * 1000) / 1000;
}

/** 1-based column where the end time starts on a timing line, for pointing at it in messages. */
export function endTimeColumn(timingLine: string): number {
	const arrow = timingLine.indexOf('-->');
	if (arrow < 0) return 1;
	const after = timingLine.slice(arrow + 3);
	return timingLine.length - after.trimStart().length + 1;
}
