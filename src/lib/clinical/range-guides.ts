/**
 * Range targets and limits in degrees that a clinician sets on a programme item, e.g. shoulder
 * flexion "to about 90°" lying down, or external rotation "no further than 20° until week 6".
 * The patient reads them in plain words; the clinician sees range readings judged against the
 * ones that hold on the reading's date. They are the clinician's own figures: Kinelume never
 * proposes degrees.
 */
import { z } from 'zod';
import { MOTIONS, measurementError, type MotionId, type RomInstrument } from './rom';
import { holdsOn, lastDay, untilSchema, type Until } from './until';
import type { LocalDate } from './calendar';
import type { MovementType } from '../exercises/vocabulary';

export const RANGE_GUIDE_KINDS = ['target', 'limit'] as const;
export type RangeGuideKind = (typeof RANGE_GUIDE_KINDS)[number];
export const RANGE_GUIDE_KIND_LABELS: Record<RangeGuideKind, string> = {
	target: 'Aim for about',
	limit: 'No further than'
};

const MOTION_IDS = Object.keys(MOTIONS) as [MotionId, ...MotionId[]];

/** The most range guides one programme item holds. */
export const MAX_RANGE_GUIDES = 4;

export const rangeGuideSchema = z
	.object({
		motion: z.enum(MOTION_IDS, { error: 'Choose the motion the degrees are for.' }),
		kind: z.enum(RANGE_GUIDE_KINDS, { error: 'Choose a target or a limit.' }),
		degrees: z
			.number({ error: 'Give the degrees, e.g. 90.' })
			.int('Give whole degrees, e.g. 90.')
			.min(0, 'Degrees cannot be below 0.')
			.max(180, 'Degrees cannot be above 180.')
	})
	.and(untilSchema);

export type RangeGuide = z.output<typeof rangeGuideSchema>;

/** The guides that hold on a date (those whose end has not passed). */
export function guidesOn(
	guides: readonly RangeGuide[],
	operationDate: LocalDate | null,
	date: LocalDate
): RangeGuide[] {
	return guides.filter((g) => holdsOn(g, operationDate, date));
}

/**
 * The end of a guide in words for a date formatter: " up to and including Sunday 13 December"
 * (the last day it holds, said so that nobody stops a day early), or "".
 */
function endWords(
	until: Until,
	operationDate: LocalDate | null,
	formatDay: (date: LocalDate) => string
): string {
	const last = lastDay(until, operationDate);
	if (last !== null) return ` up to and including ${formatDay(last)}`;
	if (until.untilWeek !== null) return ` until week ${until.untilWeek} after the operation`;
	return '';
}

/**
 * A guide as the patient reads it: "Raising the arm forward and up: to about 90°, as your
 * clinician set." / "…: no further than 20° until Sunday 13 December". Never an instruction of
 * Kinelume's own: the figure is the clinician's.
 */
export function describeGuideForPatient(
	guide: RangeGuide,
	operationDate: LocalDate | null,
	formatDay: (date: LocalDate) => string,
	movementType?: MovementType
): string {
	const what = MOTIONS[guide.motion].plain;
	const motion = what.charAt(0).toUpperCase() + what.slice(1);
	const amount =
		guide.kind === 'target' ? `to about ${guide.degrees}°` : `no further than ${guide.degrees}°`;
	// A target under a passive exercise is not leave to lift the limb with its own muscles.
	const how = movementType === 'passive' ? ', moved for you, not by its own muscles' : '';
	return `${motion}: ${amount}${endWords(guide, operationDate, formatDay)}${how}.`;
}

/** A guide as the clinician reads it: "Shoulder flexion: target about 90°" / "…: limit 20° until …". */
export function describeGuideForClinician(
	guide: RangeGuide,
	operationDate: LocalDate | null,
	formatDay: (date: LocalDate) => string
): string {
	const amount =
		guide.kind === 'target' ? `target about ${guide.degrees}°` : `limit ${guide.degrees}°`;
	return `${MOTIONS[guide.motion].label}: ${amount}${endWords(guide, operationDate, formatDay)}`;
}

export interface GuideVerdict {
	guide: RangeGuide;
	verdict: 'beyond-limit' | 'within-limit' | 'reached-target' | 'short-of-target';
	/** A sentence for the clinician. */
	text: string;
}

/**
 * A reading judged against the guides of its motion that held on its date. A limit is passed
 * when the reading is over it; a target is reached at or above it. Short of a target, the gap is
 * always given, with the instrument's measurement error beside it when one is known (a gap within
 * the error is not called reached: the error is for telling a change, not for moving the target).
 */
export function judgeReading(
	reading: { motion: string; degrees: number; measuredOn: LocalDate; instrument: RomInstrument },
	guides: readonly RangeGuide[],
	operationDate: LocalDate | null
): GuideVerdict[] {
	return guidesOn(guides, operationDate, reading.measuredOn)
		.filter((g) => g.motion === reading.motion)
		.map((guide) => {
			const gap = reading.degrees - guide.degrees;
			if (guide.kind === 'limit') {
				return gap > 0
					? {
							guide,
							verdict: 'beyond-limit' as const,
							text: `${gap}° beyond the limit of ${guide.degrees}° set for now.`
						}
					: {
							guide,
							verdict: 'within-limit' as const,
							text: `Within the limit of ${guide.degrees}° set for now.`
						};
			}
			if (gap >= 0) {
				return {
					guide,
					verdict: 'reached-target' as const,
					text: `At or past the target of about ${guide.degrees}°.`
				};
			}
			const error = measurementError(guide.motion, reading.instrument)?.degrees;
			const within =
				error !== undefined && -gap <= error
					? ` (within the ±${error}° measurement error of this instrument)`
					: '';
			return {
				guide,
				verdict: 'short-of-target' as const,
				text: `${-gap}° short of the target of about ${guide.degrees}°${within}.`
			};
		});
}
