/**
 * What an exercise is made of, checked at the edge (form actions, JSON) with messages a clinician
 * can act on. The fields and their types come from the columns (lib/exercises/columns, through
 * drizzle-zod); the words and limits are here. The dosage parts come from $lib/dosage, so an
 * exercise and a programme item are checked alike.
 */
import { createInsertSchema } from 'drizzle-zod';
import { z } from 'zod';
import {
	DOSAGE_FIELD_LABELS,
	DOSAGE_FIELDS,
	dosageBoundsSchema,
	dosageSchema,
	outOfBounds,
	PROGRESSED_FIELD,
	progressionSchema,
	type DosageField
} from '$lib/dosage';
import { exerciseFields } from './columns';
import {
	EXERCISE_SIDES,
	EXERCISE_STATUSES,
	MOVEMENT_TYPES,
	PHASE_NUMBERS,
	POSITIONS
} from './vocabulary';

export const LIMITS = {
	title: 120,
	description: 2000,
	bodyRegion: 60,
	equipment: 10,
	equipmentItem: 40,
	cues: 20,
	cueText: 200,
	safetyNotes: 5000,
	tags: 20,
	tag: 120,
	/** Longest a cue may point into a segment, in seconds (a demonstration is minutes, not hours). */
	cueAt: 3600
} as const;

const text = (what: string, max: number) =>
	z.string().trim().max(max, `Keep ${what} under ${max} characters.`);

export const coachingCueSchema = z.object({
	text: z
		.string()
		.trim()
		.min(1, 'A key point needs its words.')
		.max(LIMITS.cueText, `Keep each key point under ${LIMITS.cueText} characters.`),
	atSeconds: z
		.number('A cue’s time must be minutes and seconds, for example 0:12.')
		.min(0, 'A cue’s time cannot be before the start.')
		.max(LIMITS.cueAt, 'A cue’s time must lie within the demonstration.')
		.optional()
});

/**
 * The stored fields as zod checks them: drizzle-zod's schema of the columns (lib/exercises/columns),
 * each field refined with our words and limits. A field given no refinement here is still checked,
 * by its column's type, with zod's own wording. The fields here are whole schemas, so each is
 * required as before; a field added later with a column default is better refined as a function
 * of its column's schema ending in `.optional()` (`(s) => s.trim().max(…).optional()`), so code
 * that makes exercises itself need not name it: drizzle-zod 0.8.3 makes such a field optional
 * when it runs but not in its types, and the `.optional()` makes the two agree.
 */
export const exerciseFieldsSchema = createInsertSchema(exerciseFields, {
	segmentId: z.uuid('Choose a demonstration segment.').nullable(),
	title: text('the title', LIMITS.title).min(1, 'Give the exercise a title.'),
	description: text('the description', LIMITS.description),
	bodyRegion: text('the body region', LIMITS.bodyRegion).min(
		1,
		'Say which body region the exercise is for, for example Knee.'
	),
	side: z.enum(EXERCISE_SIDES, 'Choose which side the exercise works.'),
	position: z.enum(POSITIONS, 'Choose the starting position.'),
	movementType: z.enum(MOVEMENT_TYPES, 'Choose the movement type.'),
	equipment: z
		.array(text('each piece of equipment', LIMITS.equipmentItem).min(1))
		.max(LIMITS.equipment, `List at most ${LIMITS.equipment} pieces of equipment.`),
	phase: z
		.number('Choose the phase.')
		.int('Choose the phase.')
		.min(1, 'Choose the phase.')
		.max(PHASE_NUMBERS.length, 'Choose the phase.'),
	coachingCues: z
		.array(coachingCueSchema)
		.max(LIMITS.cues, `Keep to ${LIMITS.cues} key points or fewer.`),
	safetyNotes: text('the safety notes', LIMITS.safetyNotes),
	precautionTags: z
		.array(text('each precaution tag', LIMITS.tag).min(1))
		.max(LIMITS.tags, `Keep to ${LIMITS.tags} precaution tags or fewer.`),
	progression: progressionSchema,
	secondsPerRep: z
		.number('Seconds per rep must be a number, for example 4.')
		.min(0.5, 'Seconds per rep must be from 0.5 to 120.')
		.max(120, 'Seconds per rep must be from 0.5 to 120.')
		.nullable(),
	status: z.enum(EXERCISE_STATUSES, 'Choose draft, ready or retired.')
});

type StoredShape = typeof exerciseFieldsSchema.shape;
type InputShape = Omit<StoredShape, DosageField | 'dosageBounds'> & {
	dosage: typeof dosageSchema;
	bounds: typeof dosageBoundsSchema;
};

/**
 * The form sends the starting dosage as one `dosage` and its range as `bounds`: they take the
 * place of the six dosage columns and `dosageBounds`, so problems are listed in the form's order.
 */
function inputShape(stored: StoredShape): InputShape {
	const entries = Object.entries(stored).flatMap(([key, schema]): [string, z.ZodType][] => {
		if (key === 'dosageBounds') {
			return [
				['dosage', dosageSchema],
				['bounds', dosageBoundsSchema]
			];
		}
		return (DOSAGE_FIELDS as readonly string[]).includes(key) ? [] : [[key, schema]];
	});
	return Object.fromEntries(entries) as InputShape;
}

const inputShapeOf = inputShape(exerciseFieldsSchema.shape);

/**
 * A check across fields runs whenever the fields it reads are right, even if another field is
 * wrong (zod skips it otherwise), so one try shows every problem.
 */
const whenRight = (parts: z.ZodType) => ({
	when: (payload: { value: unknown }) => parts.safeParse(payload.value).success
});
const plan = z.object({ dosage: dosageSchema, progression: progressionSchema });
const ranged = z.object({ dosage: dosageSchema, bounds: dosageBoundsSchema });
const readiness = z.object({ status: inputShapeOf.status, segmentId: inputShapeOf.segmentId });

/** An exercise as a form or an endpoint sends it, checked whole. */
export const exerciseInputSchema = z
	.object(inputShapeOf)
	.superRefine((e, ctx) => {
		const field = PROGRESSED_FIELD[e.progression.kind];
		if (field && e.progression.kind !== 'none' && e.progression.ceiling < e.dosage[field]) {
			ctx.addIssue({
				code: 'custom',
				path: ['progression', 'ceiling'],
				message: `The most it rises to (${e.progression.ceiling}) is below where it starts (${e.dosage[field]}). Raise the most, or lower the starting ${DOSAGE_FIELD_LABELS[field].toLowerCase()}.`
			});
		}
	}, whenRight(plan))
	.superRefine((e, ctx) => {
		for (const issue of outOfBounds(e.dosage, e.bounds)) {
			ctx.addIssue({
				code: 'custom',
				path: ['dosage', issue.field],
				message: `The starting dosage is outside the exercise's own range: ${issue.message}`
			});
		}
	}, whenRight(ranged))
	.superRefine((e, ctx) => {
		if (e.status === 'ready' && !e.segmentId) {
			ctx.addIssue({
				code: 'custom',
				path: ['segmentId'],
				message:
					'Choose the demonstration segment before marking the exercise ready: patients replay it.'
			});
		}
	}, whenRight(readiness));

export type ExerciseInput = z.infer<typeof exerciseInputSchema>;
