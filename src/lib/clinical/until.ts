/**
 * When a restriction ends: "until week N" after the operation, or until a date. Week N is counted
 * in completed weeks as protocols write it (`weeksSince`: days 0–6 are week 0), so "until week 6"
 * holds through day 41 and ends as week 6 begins. A clinician may give a date instead.
 */
import { addDays, isLocalDate, type LocalDate } from './calendar';
import { z } from 'zod';

/** The most weeks after an operation an end may name (a year). */
export const MAX_UNTIL_WEEK = 52;

export const untilSchema = z
	.object({
		untilWeek: z
			.number()
			.int('Write the week as a whole number.')
			.min(1, 'Write a week from 1.')
			.max(MAX_UNTIL_WEEK, `Write a week up to ${MAX_UNTIL_WEEK}.`)
			.nullable()
			.default(null),
		untilDate: z
			.string()
			.refine(isLocalDate, 'Write the end as a real date, e.g. 2026-12-20.')
			.nullable()
			.default(null)
	})
	.refine((u) => u.untilWeek === null || u.untilDate === null, {
		message: 'Give a week or a date for the end, not both.',
		path: ['untilDate']
	});

export type Until = z.output<typeof untilSchema>;

/**
 * The last day a restriction holds, included; null when it has no end, or when it ends at a week
 * after an operation whose date is not recorded (then it holds until someone gives the date).
 */
export function lastDay(until: Until, operationDate: LocalDate | null): LocalDate | null {
	if (until.untilDate !== null) return until.untilDate;
	if (until.untilWeek !== null && operationDate !== null) {
		return addDays(operationDate, 7 * until.untilWeek - 1);
	}
	return null;
}

/** True while the restriction holds on `date`. */
export function holdsOn(until: Until, operationDate: LocalDate | null, date: LocalDate): boolean {
	const last = lastDay(until, operationDate);
	return last === null || date <= last;
}

/** True when the restriction has an end at all (a week or a date). */
export function hasEnd(until: Until): boolean {
	return until.untilWeek !== null || until.untilDate !== null;
}

/**
 * Reads an end as a clinician types it: empty (no end), a whole number or "week 6" (a week after
 * the operation), or a date written YYYY-MM-DD. Anything else is refused with a sentence.
 */
export function parseUntil(
	text: string
): { ok: true; until: Until } | { ok: false; message: string } {
	const t = text.trim().toLowerCase();
	if (t === '') return { ok: true, until: { untilWeek: null, untilDate: null } };
	const week = /^(?:week\s*)?(\d{1,3})$/.exec(t);
	const parsed = untilSchema.safeParse(week ? { untilWeek: Number(week[1]) } : { untilDate: t });
	if (parsed.success) return { ok: true, until: parsed.data };
	return {
		ok: false,
		message: week
			? parsed.error.issues[0].message
			: `"${text.trim()}" is neither a week (e.g. 6) nor a date (e.g. 2026-12-20).`
	};
}

/** An end as typed back into a field: "6", "2026-12-20" or "". */
export function untilText(until: Until): string {
	if (until.untilWeek !== null) return String(until.untilWeek);
	return until.untilDate ?? '';
}
