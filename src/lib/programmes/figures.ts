/**
 * What the builder shows while a programme is made: per exercise the weekly volume, the minutes a
 * session takes and three kinds of flag (a later phase than the weeks after the operation
 * suggest, a precaution clash, a dosage outside the exercise's range); for the programme the
 * week after the operation with its suggested phase. Pure, so the browser computes it live and
 * the server can repeat it. Each figure carries its basis; each hint its caution.
 */
import { weeksSince, type LocalDate } from '$lib/clinical/calendar';
import type { ExerciseFields } from '$lib/exercises/columns';
import {
	laterPhaseFlag,
	phaseForWeek,
	protocolById,
	type PhaseFlag,
	type PhaseHint
} from '$lib/clinical/phases';
import {
	PRECAUTION_CAUTION,
	precautionConflicts,
	precautionsOn,
	rangeClashes,
	type PrecautionConflict,
	type PrecautionDetail
} from '$lib/clinical/precautions';
import {
	DEFAULT_SECONDS_PER_REP,
	outOfBounds,
	sessionMinutes,
	weeklyVolume,
	type BoundsIssue,
	type Dosage,
	type RepPace,
	type WeeklyVolume
} from '$lib/dosage';
import { phaseOf } from '$lib/exercises/vocabulary';
import { formatDate } from '$lib/followup/words';
import type { MotionId } from '$lib/clinical/rom';

/** What the figures read of an exercise: some of its stored fields, and its demonstration's length. */
export type FigureExercise = Pick<
	ExerciseFields,
	'title' | 'phase' | 'precautionTags' | 'dosageBounds' | 'secondsPerRep'
> &
	/** With the body region, the movement type adds the tags it implies (precautions.ts). */
	Partial<Pick<ExerciseFields, 'movementType' | 'bodyRegion'>> & {
		/** The demonstration's length, when it has one. */
		segmentSeconds: number | null;
		/** The exercise's default reps (what the demonstration is taken to show). */
		defaultReps: number;
	};

export interface FigurePatient {
	operationDate: LocalDate | null;
	protocol: string;
	/** Weeks the surgeon's timing runs behind (+) or ahead of (−) the protocol table. */
	protocolShiftWeeks: number;
	precautions: string[];
	precautionDetails: Record<string, PrecautionDetail>;
}

export interface ItemFigures {
	volume: WeeklyVolume;
	minutes: number;
	paceBasis: string;
	phaseFlag: PhaseFlag | null;
	conflicts: PrecautionConflict[];
	/** Range targets or limits set past a holding precaution's degrees, as sentences. */
	rangeClashes: string[];
	bounds: BoundsIssue[];
}

export interface WeekAfterOperation {
	/** The date the weeks are counted at (the programme's start). */
	at: LocalDate;
	operationDate: LocalDate;
	weeks: number;
	days: number;
	/** "week 3 after the operation, counted from 2026-11-10 to the start on 2026-12-01". */
	basis: string;
	/** Null when the protocol has no phase table, or the start is before the operation. */
	hint: PhaseHint | null;
	/** Why there is no hint, when there is none. */
	noHintReason: string | null;
}

export interface ProgrammeFigures {
	week: WeekAfterOperation | null;
	/** Why there is no week, when there is none (no operation date). */
	noWeekReason: string | null;
	items: ItemFigures[];
	totalMinutesPerSession: number;
	totalRepsPerWeek: number;
	precautionCaution: string;
}

/** How long one rep takes: the exercise's own figure, else its demonstration's length over its reps, else common practice. */
export function paceFor(exercise: FigureExercise): { pace: RepPace; basis: string } {
	if (exercise.secondsPerRep && exercise.secondsPerRep > 0) {
		return {
			pace: { secondsPerRep: exercise.secondsPerRep },
			basis: `${exercise.secondsPerRep} s per rep, set on the exercise`
		};
	}
	if (exercise.segmentSeconds && exercise.segmentSeconds > 0 && exercise.defaultReps > 0) {
		return {
			pace: { segmentSeconds: exercise.segmentSeconds, repsShown: exercise.defaultReps },
			basis: `the demonstration’s ${Math.round(exercise.segmentSeconds)} s over its ${exercise.defaultReps} reps`
		};
	}
	return {
		pace: { secondsPerRep: DEFAULT_SECONDS_PER_REP },
		basis: `${DEFAULT_SECONDS_PER_REP} s per rep (common practice for a slow, controlled rep)`
	};
}

/** The week after the operation at the programme's start, with the protocol's suggested phase. */
export function weekAfterOperation(
	patient: FigurePatient,
	startDate: LocalDate
): WeekAfterOperation | null {
	if (!patient.operationDate) return null;
	const since = weeksSince(patient.operationDate, startDate);
	const basis =
		since.days < 0
			? `the start on ${formatDate(startDate)} is ${-since.days} days before the operation on ${formatDate(patient.operationDate)}`
			: `week ${since.weeks} after the operation (${since.days} days), counted from ${formatDate(patient.operationDate)} to the start on ${formatDate(startDate)}`;
	const table = protocolById(patient.protocol);
	const hint =
		since.days < 0 ? null : phaseForWeek(patient.protocol, since.weeks, patient.protocolShiftWeeks);
	let noHintReason: string | null = null;
	if (!hint) {
		noHintReason = !table
			? 'No phase table is chosen for this patient, so no phase is suggested; follow the surgeon’s protocol.'
			: 'The programme starts before the operation, so no phase is suggested.';
	}
	return {
		at: startDate,
		operationDate: patient.operationDate,
		weeks: since.weeks,
		days: since.days,
		basis,
		hint,
		noHintReason
	};
}

/**
 * Every figure and flag for a programme being built. Precautions are those still holding when
 * the programme starts (or today, when it started already): one that ended before raises no clash.
 */
export function programmeFigures(
	patient: FigurePatient,
	startDate: LocalDate,
	items: {
		exercise: FigureExercise;
		dosage: Dosage;
		rangeGuides?: { motion: MotionId; kind: 'target' | 'limit'; degrees: number }[];
	}[],
	today: LocalDate = startDate
): ProgrammeFigures {
	const week = weekAfterOperation(patient, startDate);
	const holding = precautionsOn(
		patient.precautions,
		patient.precautionDetails,
		patient.operationDate,
		today > startDate ? today : startDate
	);
	const figures = items.map(({ exercise, dosage, rangeGuides = [] }): ItemFigures => {
		const { pace, basis } = paceFor(exercise);
		return {
			volume: weeklyVolume(dosage),
			minutes: sessionMinutes(dosage, pace),
			paceBasis: basis,
			phaseFlag: laterPhaseFlag(phaseOf(exercise.phase), week?.hint ?? null),
			conflicts: precautionConflicts(
				holding,
				exercise.precautionTags,
				exercise.movementType
					? { movementType: exercise.movementType, bodyRegion: exercise.bodyRegion ?? '' }
					: undefined
			),
			rangeClashes: rangeClashes(holding, patient.precautionDetails, rangeGuides),
			bounds: outOfBounds(dosage, exercise.dosageBounds ?? {})
		};
	});
	return {
		week,
		noWeekReason: week
			? null
			: 'No operation or injury date is recorded for this patient (add it on their details page).',
		items: figures,
		totalMinutesPerSession: figures.reduce((sum, f) => sum + f.minutes, 0),
		totalRepsPerWeek: figures.reduce((sum, f) => sum + f.volume.repsPerWeek, 0),
		precautionCaution: PRECAUTION_CAUTION
	};
}
