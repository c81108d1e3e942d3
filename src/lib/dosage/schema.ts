/**
 * zod schemas for dosage, bounds and progression, with messages a clinician can act on. Each
 * field takes a number or the text of one (a form field), so the same schema serves form actions
 * and JSON endpoints.
 */
import { z } from 'zod';
import { DOSAGE_FIELDS, DOSAGE_FIELD_LABELS, DOSAGE_LIMITS, type DosageField } from './types';
import type { Dosage, DosageBounds, Progression } from './types';

/** Form text becomes a number; an empty field becomes "missing" rather than 0. */
function fromText(value: unknown): unknown {
	if (typeof value !== 'string') return value;
	const trimmed = value.trim();
	return trimmed === '' ? undefined : Number(trimmed);
}

/** A whole number from `min` to `max`, with `what` naming it in every message. */
export function wholeNumber(what: string, min: number, max: number) {
	const range = `${what} must be a whole number from ${min} to ${max}.`;
	return z.preprocess(
		fromText,
		z
			.number({
				error: (issue) =>
					issue.input === undefined
						? `${what} is missing: enter a whole number from ${min} to ${max}.`
						: range
			})
			.int(range)
			.min(min, range)
			.max(max, range)
	);
}

function fieldNumber(field: DosageField) {
	const { min, max } = DOSAGE_LIMITS[field];
	return wholeNumber(DOSAGE_FIELD_LABELS[field], min, max);
}

/** A full dosage; every field within DOSAGE_LIMITS. */
export const dosageSchema = z.object({
	sets: fieldNumber('sets'),
	reps: fieldNumber('reps'),
	holdSeconds: fieldNumber('holdSeconds'),
	restSeconds: fieldNumber('restSeconds'),
	sessionsPerDay: fieldNumber('sessionsPerDay'),
	daysPerWeek: fieldNumber('daysPerWeek')
}) satisfies z.ZodType<Dosage, unknown>;

function optionalFieldNumber(field: DosageField) {
	return fieldNumber(field).optional();
}

function fieldBoundsSchema(field: DosageField) {
	const label = DOSAGE_FIELD_LABELS[field];
	return z
		.object({ min: optionalFieldNumber(field), max: optionalFieldNumber(field) })
		.refine((b) => b.min === undefined || b.max === undefined || b.min <= b.max, {
			error: `${label}: the lowest allowed is above the highest allowed.`,
			path: ['max']
		});
}

/** An exercise's allowed range per field; each end optional, lowest ≤ highest. */
export const dosageBoundsSchema = z.object(
	Object.fromEntries(DOSAGE_FIELDS.map((f) => [f, fieldBoundsSchema(f).optional()])) as Record<
		DosageField,
		z.ZodOptional<ReturnType<typeof fieldBoundsSchema>>
	>
) satisfies z.ZodType<DosageBounds, unknown>;

/** A progression rule; the kind picks which numbers are needed. */
export const progressionSchema = z.discriminatedUnion(
	'kind',
	[
		z.object({ kind: z.literal('none') }),
		z.object({
			kind: z.literal('reps'),
			addPerWeek: wholeNumber('Reps added each week', 1, 20),
			ceiling: wholeNumber('The most reps', 1, DOSAGE_LIMITS.reps.max)
		}),
		z.object({
			kind: z.literal('sets'),
			addAfterWeeks: wholeNumber('Weeks between adding sets', 1, 12),
			add: wholeNumber('Sets added each time', 1, 5),
			ceiling: wholeNumber('The most sets', 1, DOSAGE_LIMITS.sets.max)
		}),
		z.object({
			kind: z.literal('hold'),
			addPerWeek: wholeNumber('Seconds of hold added each week', 1, 60),
			ceiling: wholeNumber('The longest hold (seconds)', 1, DOSAGE_LIMITS.holdSeconds.max)
		})
	],
	{ error: 'Choose how the dosage rises: not at all, by reps, by sets or by hold.' }
) satisfies z.ZodType<Progression, unknown>;

/** Which dosage field a progression kind raises, if any. */
export const PROGRESSED_FIELD: Record<Progression['kind'], DosageField | null> = {
	none: null,
	reps: 'reps',
	sets: 'sets',
	hold: 'holdSeconds'
};

/** A dosage with its progression; the ceiling may not be below the starting value. */
export const dosagePlanSchema = z
	.object({ dosage: dosageSchema, progression: progressionSchema })
	.superRefine(({ dosage, progression }, ctx) => {
		const field = PROGRESSED_FIELD[progression.kind];
		if (field === null || progression.kind === 'none') return;
		if (progression.ceiling < dosage[field]) {
			ctx.addIssue({
				code: 'custom',
				path: ['progression', 'ceiling'],
				message: `The most it rises to (${progression.ceiling}) is below where it starts (${dosage[field]}). Raise the most, or lower the starting ${DOSAGE_FIELD_LABELS[field].toLowerCase()}.`
			});
		}
	});

/** What `dosagePlanSchema` gives back. */
export type DosagePlan = z.infer<typeof dosagePlanSchema>;
