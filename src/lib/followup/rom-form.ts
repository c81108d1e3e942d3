/**
 * The range-of-motion entry form's rules, shared by the page (hints) and the server (the check).
 * The degree limits only catch typing errors; they say nothing about what is normal.
 */
import { z } from 'zod';
import { isLocalDate } from '../clinical/calendar';
import {
	ARM_POSITIONS,
	MOTIONS,
	NORM_SOURCES,
	ROM_INSTRUMENTS,
	needsArmPosition,
	type MotionId,
	type NormSourceId
} from '../clinical/rom';

export const MOTION_IDS = Object.keys(MOTIONS) as MotionId[];
export const NORM_SOURCE_IDS = Object.keys(NORM_SOURCES) as NormSourceId[];

/** A typing-error guard (common practice: no joint we record moves past these). */
export const DEGREE_LIMITS = { min: -60, max: 200 } as const;

export const MAX_ROM_NOTE = 500;

/** The entry's fields, each with its own checks; the check across fields is romEntrySchema's. */
const romEntryFields = z.object({
	motion: z.enum(MOTION_IDS as [MotionId, ...MotionId[]], {
		error: 'Choose the motion measured.'
	}),
	side: z.enum(['left', 'right'], { error: 'Choose the side measured.' }),
	mode: z.enum(['active', 'passive'], { error: 'Choose active or passive.' }),
	degrees: z.preprocess(
		// A typed minus sign or a decimal comma is still the number meant; blank is no number.
		(v) => (typeof v === 'string' ? v.trim().replace('−', '-').replace(',', '.') || undefined : v),
		z.coerce
			.number({ error: 'Give the degrees measured, e.g. 95 or -5.' })
			.refine(Number.isFinite, 'Degrees must be a number, e.g. 95 or -5.')
			.min(DEGREE_LIMITS.min, `Degrees cannot be below ${DEGREE_LIMITS.min}.`)
			.max(DEGREE_LIMITS.max, `Degrees cannot be above ${DEGREE_LIMITS.max}.`)
			.refine((d) => Number.isInteger(d * 2), 'Degrees are recorded to the half degree.')
	),
	measuredOn: z
		.string({ error: 'Give the date of the measurement.' })
		.refine(isLocalDate, 'Give the date of the measurement as a calendar date.'),
	note: z
		.string()
		.max(MAX_ROM_NOTE, `A note can be at most ${MAX_ROM_NOTE} characters.`)
		.default('')
		.transform((n) => n.trim()),
	instrument: z.enum(ROM_INSTRUMENTS, { error: 'Choose what the reading was taken with.' }),
	armPosition: z.enum(['', ...ARM_POSITIONS], { error: 'Choose where the arm was.' }).default('')
});

/** The fields the arm position check reads. */
const motionAndArm = romEntryFields.pick({ motion: true, armPosition: true });

export const romEntrySchema = romEntryFields
	// Rotation normals and comparisons depend on where the arm was, so a rotation reading says it;
	// other motions keep none. Checked even when another field is wrong, so one try shows all.
	.superRefine(
		(entry, ctx) => {
			if (needsArmPosition(entry.motion) && entry.armPosition === '') {
				ctx.addIssue({
					code: 'custom',
					path: ['armPosition'],
					message: 'Say where the arm was: rotation is read differently at the side and raised.'
				});
			}
		},
		{ when: (payload) => motionAndArm.safeParse(payload.value).success }
	)
	.transform((entry) => ({
		...entry,
		armPosition:
			needsArmPosition(entry.motion) && entry.armPosition !== '' ? entry.armPosition : null
	}));

export type RomEntry = z.output<typeof romEntrySchema>;

/** How to write the degrees of a motion, under the entry field; it follows the motion chosen. */
export function degreesHint(motion: string): string {
	switch (motion) {
		case 'knee-extension':
			return 'Knee extension: 0 is straight; write a lag as a negative number (−5 is 5° short of straight).';
		case 'knee-flexion':
			return 'Knee flexion: degrees of bend from straight (0).';
		case 'shoulder-flexion':
		case 'shoulder-abduction':
			return 'Degrees the arm is raised from the side (0).';
		case 'shoulder-extension':
			return 'Degrees the arm moves back behind the body from the side (0).';
		case 'shoulder-internal-rotation':
		case 'shoulder-external-rotation':
			return 'Degrees of turn from the forearm pointing straight ahead (0), elbow bent; choose where the arm was below.';
		case 'hip-flexion':
			return 'Hip flexion: degrees the thigh comes up from lying flat (0).';
		case 'hip-extension':
			return 'Hip extension: degrees the thigh goes back past lying flat (0); write a shortfall as a negative number.';
		case 'hip-abduction':
		case 'hip-adduction':
			return 'Degrees the leg moves out (abduction) or in (adduction) from the middle (0).';
		case 'hip-internal-rotation':
		case 'hip-external-rotation':
			return 'Degrees the lower leg turns from pointing straight (0).';
		default:
			return 'Whole or half degrees, as read on the instrument.';
	}
}

type RomField = keyof typeof romEntryFields.shape;

/**
 * The entry form as it is posted (superforms' schema): each of the entry's fields as typed, then
 * romEntrySchema's checks, every problem on its own field. The fields and their checks are
 * written once, in romEntrySchema; the action reads the entry from the form's data with it.
 */
export const romEntryForm = z
	.object(
		Object.fromEntries(
			Object.keys(romEntryFields.shape).map((name) => [name, z.string()])
		) as Record<RomField, z.ZodString>
	)
	.superRefine((draft, ctx) => {
		const checked = romEntrySchema.safeParse(draft);
		for (const issue of checked.error?.issues ?? []) {
			ctx.addIssue({ code: 'custom', message: issue.message, path: issue.path });
		}
	});

/** The entry form's fields as typed, before the check. */
export type RomEntryDraft = z.infer<typeof romEntryForm>;

/**
 * The page's last answer, as the range-of-motion section reads it: which form (`rom` to add,
 * `deleteRom` to remove) and a reading saved or removed, or why not. The entry form's own
 * answer (`form`, what was typed and its problems) is superforms'.
 */
export interface RomFormAnswer {
	action?: string;
	message?: string;
	saved?: string;
	form?: unknown;
}

/**
 * What the entry form starts with: the last reading's motion, instrument and arm position (or knee
 * flexion for a knee patient), the affected side, and today.
 */
export function romEntryDefaults(
	lastReading:
		| (Pick<RomEntryDraft, 'motion' | 'instrument'> & { armPosition: string | null })
		| undefined,
	patient: { condition: string; affectedSide: string },
	today: string
): RomEntryDraft {
	return {
		motion:
			lastReading?.motion ??
			(patient.condition.toLowerCase().includes('knee') ? 'knee-flexion' : ''),
		side: patient.affectedSide === 'right' ? 'right' : 'left',
		mode: 'active',
		degrees: '',
		measuredOn: today,
		note: '',
		instrument: lastReading?.instrument ?? 'goniometer',
		armPosition: lastReading?.armPosition ?? ''
	};
}
