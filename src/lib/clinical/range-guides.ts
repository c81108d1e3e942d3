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

/** The end of a guide in words for a date formatter: " until Sunday 13 December", or "". */
function endWords(
	until: Until,
	operationDate: LocalDate | null,
	formatDay: (date: LocalDate) => string
): string {
	const last = lastDay(until, operationDate);
	if (last !== null) return ` until ${formatDay(last)}`;
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
	formatDay: (date: LocalDate) => string
): string {
	const what = MOTIONS[guide.motion].plain;
	const motion = what.charAt(0).toUpperCase() + what.slice(1);
	const amount =
		guide.kind === 'target' ? `to about ${guide.degrees}°` : `no further than ${guide.degrees}°`;
	return `${motion}: ${amount}${endWords(guide, operationDate, formatDay)}.`;
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
 * when the reading is over it; a target ("about") counts as reached within the instrument's
 * measurement error when one is known, otherwise only at or above it.
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
			const error = measurementError(guide.motion, reading.instrument)?.degrees ?? 0;
			return gap >= -error
				? {
						guide,
						verdict: 'reached-target' as const,
						text:
							gap >= 0
								? `At or past the target of about ${guide.degrees}°.`
								: `Within the measurement error (±${error}°) of the target of about ${guide.degrees}°.`
					}
				: {
						guide,
						verdict: 'short-of-target' as const,
						text: `${-gap}° short of the target of about ${guide.degrees}°.`
					};
		});
}
