/**
 * A programme as the builder saves it, checked the same way in the browser (before a save) and on
 * the server (at the edge of the form action and the JSON endpoint).
 */
import { z } from 'zod';
import { isLocalDate, type Weekday } from '$lib/clinical/calendar';
import { MAX_RANGE_GUIDES, rangeGuideSchema } from '$lib/clinical/range-guides';
import { parseUntil } from '$lib/clinical/until';
import {
	DOSAGE_FIELD_LABELS,
	dosageSchema,
	PROGRESSED_FIELD,
	progressionSchema
} from '$lib/dosage';

export const MAX_ITEMS = 30;

const localDate = (what: string) =>
	z.string().trim().refine(isLocalDate, `Write the ${what} as a real date, e.g. 2026-11-17.`);

/** A range target or limit as typed: degrees and end as text, read here. */
export const rangeGuideInput = z
	.object({ motion: z.string(), kind: z.string(), degrees: z.string(), until: z.string() })
	.transform((g, ctx) => {
		const until = parseUntil(g.until);
		if (!until.ok) {
			ctx.addIssue({ code: 'custom', path: ['until'], message: until.message });
			return z.NEVER;
		}
		// Blank degrees become NaN, which the guide's own check refuses in words; the guide
		// schema checks the motion and kind against their lists.
		const guide = rangeGuideSchema.safeParse({
			motion: g.motion,
			kind: g.kind,
			// Whole degrees written in digits only ("0x5A" and "1e2" are not degrees).
			degrees: /^\d{1,3}$/.test(g.degrees.trim()) ? Number(g.degrees.trim()) : NaN,
			...until.until
		});
		if (!guide.success) {
			for (const issue of guide.error.issues) {
				ctx.addIssue({ code: 'custom', path: issue.path, message: issue.message });
			}
			return z.NEVER;
		}
		return guide.data;
	});

export const programmeItemSchema = z
	.object({
		/** Present for an item already saved: its id is kept, so logs and printed codes stay valid. */
		id: z.uuid().optional(),
		exerciseId: z.uuid('Choose an exercise.'),
		dosage: dosageSchema,
		/** Ticked weekdays; none means any `daysPerWeek` days of each week. */
		weekdays: z
			.array(
				z
					.number('A weekday is a number from 1 (Monday) to 7 (Sunday).')
					.int('A weekday is a number from 1 (Monday) to 7 (Sunday).')
					.min(1, 'A weekday is a number from 1 (Monday) to 7 (Sunday).')
					.max(7, 'A weekday is a number from 1 (Monday) to 7 (Sunday).')
			)
			.max(7, 'Tick at most the seven days of the week, each once.')
			.default([])
			.transform((days) =>
				days.length === 0 ? null : ([...new Set(days)].sort((a, b) => a - b) as Weekday[])
			),
		rangeGuides: z
			.array(rangeGuideInput)
			.max(MAX_RANGE_GUIDES, `Keep to ${MAX_RANGE_GUIDES} range targets and limits an exercise.`)
			.default([]),
		progression: progressionSchema
	})
	.superRefine(({ dosage, weekdays }, ctx) => {
		if (weekdays && weekdays.length !== dosage.daysPerWeek) {
			ctx.addIssue({
				code: 'custom',
				path: ['weekdays'],
				message: `${weekdays.length} ${weekdays.length === 1 ? 'weekday is' : 'weekdays are'} ticked but days a week is ${dosage.daysPerWeek}. Tick ${dosage.daysPerWeek} ${dosage.daysPerWeek === 1 ? 'weekday' : 'weekdays'}, change days a week, or untick all for any ${dosage.daysPerWeek} days.`
			});
		}
	})
	.superRefine(({ dosage, progression }, ctx) => {
		const field = PROGRESSED_FIELD[progression.kind];
		if (field && progression.kind !== 'none' && progression.ceiling < dosage[field]) {
			ctx.addIssue({
				code: 'custom',
				path: ['progression', 'ceiling'],
				message: `The most it rises to (${progression.ceiling}) is below where it starts (${dosage[field]}). Raise the most, or lower the ${DOSAGE_FIELD_LABELS[field].toLowerCase()}.`
			});
		}
	});

export const programmeSaveSchema = z
	.object({
		title: z
			.string()
			.trim()
			.min(1, 'Give the programme a title.')
			.max(120, 'Keep the title under 120 characters.'),
		startDate: localDate('start date'),
		endDate: z
			.string()
			.trim()
			.refine(
				(d) => d === '' || isLocalDate(d),
				'Write the end date as a real date, or leave it empty.'
			)
			.transform((d) => (d === '' ? null : d)),
		note: z.string().trim().max(2000, 'Keep the note to the patient under 2000 characters.'),
		items: z
			.array(programmeItemSchema)
			.max(MAX_ITEMS, `A programme holds at most ${MAX_ITEMS} exercises.`)
	})
	.superRefine((p, ctx) => {
		if (p.endDate && p.endDate < p.startDate) {
			ctx.addIssue({
				code: 'custom',
				path: ['endDate'],
				message: 'The end date is before the start date.'
			});
		}
		const ids = p.items.flatMap((i) => (i.id ? [i.id] : []));
		if (new Set(ids).size !== ids.length) {
			ctx.addIssue({ code: 'custom', path: ['items'], message: 'An exercise row appears twice.' });
		}
	});

export type ProgrammeSave = z.infer<typeof programmeSaveSchema>;
export type ProgrammeItemSave = ProgrammeSave['items'][number];

/** A checked programme as code may also pass it: weekdays and range guides may be left out (none). */
export type ProgrammeSaveData = Omit<ProgrammeSave, 'items'> & {
	items: (Omit<ProgrammeItemSave, 'weekdays' | 'rangeGuides'> &
		Partial<Pick<ProgrammeItemSave, 'weekdays' | 'rangeGuides'>>)[];
};

/** A zod refusal as one list of sentences, each with where it belongs ("items.2.dosage.reps"). */
export function problemsOf(error: z.ZodError): { path: string; message: string }[] {
	return error.issues.map((i) => ({ path: i.path.join('.'), message: i.message }));
}
