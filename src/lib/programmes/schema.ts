/**
 * A programme as the builder saves it, checked the same way in the browser (before a save) and on
 * the server (at the edge of the form action and the JSON endpoint).
 */
import { z } from 'zod';
import { isLocalDate } from '$lib/clinical/calendar';
import {
	DOSAGE_FIELD_LABELS,
	dosageSchema,
	PROGRESSED_FIELD,
	progressionSchema
} from '$lib/dosage';

export const MAX_ITEMS = 30;

const localDate = (what: string) =>
	z.string().trim().refine(isLocalDate, `Write the ${what} as a real date, e.g. 2026-11-17.`);

export const programmeItemSchema = z
	.object({
		/** Present for an item already saved: its id is kept, so logs and printed codes stay valid. */
		id: z.uuid().optional(),
		exerciseId: z.uuid('Choose an exercise.'),
		dosage: dosageSchema,
		progression: progressionSchema
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

/** A zod refusal as one list of sentences, each with where it belongs ("items.2.dosage.reps"). */
export function problemsOf(error: z.ZodError): { path: string; message: string }[] {
	return error.issues.map((i) => ({ path: i.path.join('.'), message: i.message }));
}
