/**
 * Dates for people, one way on every screen and in every e-mail: "24 Nov 2026" (day, short month,
 * year), with the weekday in front where the day of the week matters to a patient ("Tuesday 24 Nov
 * 2026"). Calendar dates (LocalDate, "2026-11-24") are already the clinic's or patient's own day;
 * moments in time go through format/instants, which writes their date the same way. ISO dates stay
 * in inputs and addresses, never in words.
 */
import type { LocalDate } from '../clinical/calendar';

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
const WEEKDAYS = ['Sunday', 'Monday', 'Tuesday', 'Wednesday', 'Thursday', 'Friday', 'Saturday'];

function parts(date: LocalDate): { year: number; month: string; day: number; weekday: string } {
	const [year, month, day] = date.split('-').map(Number);
	const weekday = WEEKDAYS[new Date(Date.UTC(year, month - 1, day)).getUTCDay()];
	return { year, month: MONTHS[month - 1], day, weekday };
}

/** '2026-11-24' → '24 Nov 2026'. */
export function formatDate(date: LocalDate): string {
	const p = parts(date);
	return `${p.day} ${p.month} ${p.year}`;
}

/** '24 Nov' — a date within the current context, year left out. */
export function formatShortDate(date: LocalDate): string {
	const p = parts(date);
	return `${p.day} ${p.month}`;
}

/**
 * A patient's day with its weekday: 'Tuesday 24 Nov', or 'Tuesday 24 Nov 2026' with the year
 * (when the date may be far off or read on paper).
 */
export function formatDay(date: LocalDate, { year = false }: { year?: boolean } = {}): string {
	const p = parts(date);
	return `${p.weekday} ${p.day} ${p.month}${year ? ` ${p.year}` : ''}`;
}

/**
 * An inclusive run of days: '24–30 Nov 2026', '28 Nov – 4 Dec 2026', '29 Dec 2026 – 4 Jan 2027';
 * without the year ('24–30 Nov') when it goes without saying and the run stays in one year.
 */
export function formatDateRange(
	from: LocalDate,
	to: LocalDate,
	{ year = true }: { year?: boolean } = {}
): string {
	const a = parts(from);
	const b = parts(to);
	const end = year ? ` ${b.year}` : '';
	if (from === to) return `${b.day} ${b.month}${end}`;
	if (a.year !== b.year) return `${formatDate(from)} – ${formatDate(to)}`;
	if (a.month !== b.month) return `${a.day} ${a.month} – ${b.day} ${b.month}${end}`;
	return `${a.day}–${b.day} ${b.month}${end}`;
}

/** An ISO date (2026-11-24) anywhere in `text`: what words for people must never hold. */
export const ISO_DATE_PATTERN = /\b\d{4}-\d{2}-\d{2}\b/;
