/**
 * Range-of-motion readings as a clinician reads them: each against the normal value of a chosen
 * table, against the other side, and against the previous reading of the same motion, where a
 * difference counts as a change only beyond the measurement error (lib/clinical/rom).
 */
import { judgeReading, type GuideVerdict, type RangeGuide } from '../clinical/range-guides';
import {
	ARM_POSITION_LABELS,
	INSTRUMENT_LABELS,
	MOTIONS,
	NORM_SOURCES,
	ageOn,
	needsArmPosition,
	percentOfNormal,
	percentOfOtherSide,
	romChange,
	ROM_CAUTION,
	type MotionId,
	type ArmPosition,
	type NormSourceId,
	type PercentOfNormal,
	type RomChange,
	type RomInstrument,
	type Sex
} from '../clinical/rom';
import { formatDate, formatDegrees } from './words';

/** One stored reading, as follow-up needs it. */
export interface RomReading {
	id: string;
	motion: string;
	side: 'left' | 'right';
	mode: 'active' | 'passive';
	degrees: number;
	measuredOn: string;
	note: string;
	instrument: RomInstrument;
	/** For shoulder rotations: where the arm was; null when not recorded. */
	armPosition: ArmPosition | null;
}

export interface RomRow extends RomReading {
	motionLabel: string;
	/** How it was measured, in words: "Goniometer", "Goniometer, arm at the side". */
	howMeasured: string;
	/** The reading against the clinician's range targets and limits that held on its date. */
	guides: GuideVerdict[];
	/** True for the patient's affected side; null when the patient has none recorded or both. */
	affected: boolean | null;
	normal: (PercentOfNormal & { text: string }) | null;
	/** Why there is no normal value, when there is none. */
	normalMissing: string | null;
	otherSide: {
		degrees: number;
		measuredOn: string;
		percent: number | null;
		difference: number;
		text: string;
	} | null;
	change: (RomChange & { previous: { degrees: number; measuredOn: string }; text: string }) | null;
}

export function isMotionId(motion: string): motion is MotionId {
	return Object.hasOwn(MOTIONS, motion);
}

export function motionLabel(motion: string): string {
	return isMotionId(motion) ? MOTIONS[motion].label : motion;
}

/** "active" / "passive" as a clinician writes it next to a reading. */
export const MODE_LABELS = { active: 'active', passive: 'passive' } as const;

/**
 * Readings are compared like with like: the same motion, side, mode, instrument and arm
 * position (an inclinometer after a goniometer, or a rotation at the side after one at 90°, is
 * a new series, not a change).
 */
const seriesKey = (
	r: Pick<RomReading, 'motion' | 'side' | 'mode' | 'instrument' | 'armPosition'>
) => `${r.motion}|${r.side}|${r.mode}|${r.instrument}|${r.armPosition ?? ''}`;

const byDate = (a: RomReading, b: RomReading) =>
	a.measuredOn < b.measuredOn ? -1 : a.measuredOn > b.measuredOn ? 1 : 0;

/**
 * How a value's source is worded on screen. A value recalled from memory is marked so in the
 * code, tests and DEVELOPERS.md (its `confidence`), never as a note on a clinician's screen.
 */
function confidenceNote(confidence: string): string {
	return confidence === 'secondary' ? ' (from a secondary source)' : '';
}

/** True when a source's value for a motion depends on the person's sex or age. */
function needsPerson(source: NormSourceId, motion: MotionId): boolean {
	const value = NORM_SOURCES[source].values[motion];
	return !!value && value.degrees === undefined;
}

function personKnown(options: { birthYear?: number | null; sex?: Sex | null }): boolean {
	return !!options.sex && !!options.birthYear;
}

/**
 * The normal value for a reading from the chosen table, with the patient's sex and age where the
 * table needs them. A birth year gives the age only to within a year, so at the edge of an age
 * band (where the two possible ages fall in different bands) no value is given rather than a guess.
 */
function normalFor(
	reading: RomReading,
	motion: MotionId,
	options: { source: NormSourceId; birthYear?: number | null; sex?: Sex | null }
): PercentOfNormal | null {
	const base = {
		source: options.source,
		armPosition: reading.armPosition,
		sex: options.sex ?? undefined
	};
	if (!options.birthYear) return percentOfNormal(reading.degrees, motion, base);
	const age = ageOn(options.birthYear, reading.measuredOn);
	const low = percentOfNormal(reading.degrees, motion, { ...base, age: age.low });
	const high = percentOfNormal(reading.degrees, motion, { ...base, age: age.high });
	return low && high && low.normal.degrees === high.normal.degrees ? low : null;
}

/**
 * Every reading with its comparisons, oldest first. `affectedSide` is the patient's ('left',
 * 'right', 'both' or 'not applicable'); the other side's reading is the latest of the same
 * motion and mode on or before the same day.
 */
export function romRows(
	readings: readonly RomReading[],
	options: {
		source: NormSourceId;
		affectedSide: string;
		birthYear?: number | null;
		sex?: Sex | null;
		operationDate?: string | null;
		/**
		 * The range targets and limits of the patient's programmes with the days each programme
		 * ran: a reading is judged against those that held on its date, on the affected side.
		 */
		rangeGuides?: readonly { guide: RangeGuide; from: string; to: string | null }[];
	}
): RomRow[] {
	const sorted = [...readings].sort(byDate);
	const sideKnown = options.affectedSide === 'left' || options.affectedSide === 'right';
	const previousOf = new Map<string, RomReading>();
	return sorted.map((reading) => {
		const label = motionLabel(reading.motion);
		const motion = isMotionId(reading.motion) ? reading.motion : null;
		const source = NORM_SOURCES[options.source];

		let normal: RomRow['normal'] = null;
		let normalMissing: string | null = null;
		const found = motion ? normalFor(reading, motion, options) : null;
		if (found) {
			const note = confidenceNote(found.normal.confidence);
			const kind = found.normal.minimum ? 'lower limit of normal' : 'normal';
			const what =
				found.percent !== null
					? `${Math.round(found.percent)}% of the ${found.normal.sourceName} ${kind} ${formatDegrees(found.normal.degrees)}`
					: found.shortBy === 0
						? `at the ${found.normal.sourceName} ${kind} ${formatDegrees(found.normal.degrees)}`
						: `${formatDegrees(Math.abs(found.shortBy))} ${found.shortBy > 0 ? 'short of' : 'beyond'} the ${found.normal.sourceName} ${kind} ${formatDegrees(found.normal.degrees)}`;
			normal = { ...found, text: `${label} ${formatDegrees(reading.degrees)} = ${what}${note}` };
		} else if (motion && needsArmPosition(motion) && reading.armPosition !== 'abducted-90') {
			normalMissing = `Normal values for rotation are measured with the arm raised to 90° out to the side; this reading (${reading.armPosition ? ARM_POSITION_LABELS[reading.armPosition].toLowerCase() : 'arm position not recorded'}) is compared with the other side and earlier readings only.`;
		} else if (motion && needsPerson(options.source, motion) && !personKnown(options)) {
			normalMissing = `The ${source.name} table gives values by sex and age: record the patient's birth year and sex to use it.`;
		} else {
			normalMissing = `The ${source.name} table has no value for ${label.toLowerCase()} for this patient.`;
		}

		let otherSide: RomRow['otherSide'] = null;
		const otherName = reading.side === 'left' ? 'right' : 'left';
		const other = sorted
			.filter(
				(r) =>
					r.motion === reading.motion &&
					r.mode === reading.mode &&
					r.instrument === reading.instrument &&
					r.armPosition === reading.armPosition &&
					r.side === otherName &&
					r.measuredOn <= reading.measuredOn
			)
			.at(-1);
		const showOther = !sideKnown || reading.side === options.affectedSide;
		if (other && showOther) {
			// A motion off our list is compared in degrees only.
			const percent = isMotionId(reading.motion)
				? percentOfOtherSide(reading.motion, reading.degrees, other.degrees)
				: null;
			const difference = reading.degrees - other.degrees;
			const when =
				other.measuredOn === reading.measuredOn ? '' : `, measured ${formatDate(other.measuredOn)}`;
			const gap =
				difference === 0
					? 'the same as'
					: `${formatDegrees(Math.abs(difference))} ${difference < 0 ? 'less than' : 'more than'}`;
			otherSide = {
				degrees: other.degrees,
				measuredOn: other.measuredOn,
				percent,
				difference,
				text:
					percent !== null
						? `${Math.round(percent)}% of the ${otherName} side (${formatDegrees(other.degrees)}${when})`
						: `${gap} the ${otherName} side (${formatDegrees(other.degrees)}${when})`
			};
		}

		let change: RomRow['change'] = null;
		const previous = previousOf.get(seriesKey(reading));
		if (previous && motion) {
			const result = romChange(previous.degrees, reading.degrees, motion, reading.instrument);
			const since = `since ${formatDate(previous.measuredOn)} (${formatDegrees(previous.degrees)})`;
			const size = formatDegrees(Math.abs(result.change));
			let text: string;
			if (result.change === 0) text = `No change ${since}.`;
			else if (result.beyondError === null)
				text = `Change of ${size} ${since}; no measurement error is on our list for this motion with a ${INSTRUMENT_LABELS[reading.instrument].toLowerCase()}, so judge it with care.`;
			else if (result.beyondError)
				text = `${result.direction === 'gain' ? 'Gain' : 'Loss'} of ${size} ${since}: more than the measurement error (±${result.error!.degrees}°).`;
			else
				text = `Change of ${size} ${since} is within the measurement error (±${result.error!.degrees}°) — not counted as a change.`;
			change = {
				...result,
				previous: { degrees: previous.degrees, measuredOn: previous.measuredOn },
				text
			};
		}
		previousOf.set(seriesKey(reading), reading);

		const position = reading.armPosition
			? `, ${ARM_POSITION_LABELS[reading.armPosition].toLowerCase()}`
			: '';
		return {
			...reading,
			motionLabel: label,
			howMeasured: `${INSTRUMENT_LABELS[reading.instrument]}${position}`,
			guides:
				sideKnown && reading.side !== options.affectedSide
					? []
					: judgeReading(
							reading,
							(options.rangeGuides ?? [])
								.filter(
									(g) =>
										g.from <= reading.measuredOn && (g.to === null || reading.measuredOn <= g.to)
								)
								.map((g) => g.guide),
							options.operationDate ?? null
						),
			affected: sideKnown ? reading.side === options.affectedSide : null,
			normal,
			normalMissing,
			otherSide,
			change
		};
	});
}

/** The newest reading of each motion, side and mode whose change from the one before is a loss beyond the error. */
export function romLosses(rows: readonly RomRow[]): RomRow[] {
	const latest = new Map<string, RomRow>();
	for (const row of rows) latest.set(seriesKey(row), row);
	return [...latest.values()].filter(
		(r) => r.change?.beyondError === true && r.change.direction === 'loss'
	);
}

export { ROM_CAUTION };
