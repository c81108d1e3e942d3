/**
 * The range-of-motion entry form's rules, shared by the page (hints) and the server (the check).
 * The degree limits only catch typing errors; they say nothing about what is normal.
 */
import { z } from 'zod';
import { isLocalDate } from '../clinical/calendar';
import { MOTIONS, NORM_SOURCES, type MotionId, type NormSourceId } from '../clinical/rom';

export const MOTION_IDS = Object.keys(MOTIONS) as MotionId[];
export const NORM_SOURCE_IDS = Object.keys(NORM_SOURCES) as NormSourceId[];

/** A typing-error guard (common practice: no joint we record moves past these). */
export const DEGREE_LIMITS = { min: -60, max: 200 } as const;

export const MAX_ROM_NOTE = 500;

export const romEntrySchema = z.object({
	motion: z.enum(MOTION_IDS as [MotionId, ...MotionId[]], { error: 'Choose the motion measured.' }),
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
		.transform((n) => n.trim())
});

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
			return 'Degrees of turn from the forearm pointing straight ahead (0); say in the note whether the arm was at the side or raised.';
		default:
			return 'Whole or half degrees, as read on the instrument.';
	}
}
