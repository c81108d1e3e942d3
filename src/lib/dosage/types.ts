/**
 * The dosage vocabulary shared by exercises (a default dosage), programmes (a patient's dosage)
 * and the patient's replay screen. All counts are whole numbers; times are in seconds.
 */

/** How much of one exercise a patient does. */
export interface Dosage {
	/** Sets in one session. */
	sets: number;
	/** Repetitions in one set. */
	reps: number;
	/** Seconds each repetition is held at the end of its range (0 = no hold). */
	holdSeconds: number;
	/** Seconds of rest between sets. */
	restSeconds: number;
	/** Sessions on each exercise day. */
	sessionsPerDay: number;
	/** Exercise days in a week, 1–7. */
	daysPerWeek: number;
}

/** One of the six dosage fields. */
export type DosageField = keyof Dosage;

/** The dosage fields in the order forms and tables show them. */
export const DOSAGE_FIELDS: readonly DosageField[] = [
	'sets',
	'reps',
	'holdSeconds',
	'restSeconds',
	'sessionsPerDay',
	'daysPerWeek'
];

/** The six dosage numbers of a row that has more (an exercise's default, a programme item's own). */
export function dosageOf(row: Dosage): Dosage {
	return Object.fromEntries(DOSAGE_FIELDS.map((f) => [f, row[f]])) as unknown as Dosage;
}

/** Plain names of the fields, for messages and table headings. */
export const DOSAGE_FIELD_LABELS: Record<DosageField, string> = {
	sets: 'Sets',
	reps: 'Reps',
	holdSeconds: 'Hold (seconds)',
	restSeconds: 'Rest between sets (seconds)',
	sessionsPerDay: 'Sessions a day',
	daysPerWeek: 'Days a week'
};

/** A range one field may take; either end may be left open. */
export interface FieldBounds {
	min?: number;
	max?: number;
}

/** The range an exercise allows for each field (e.g. a stretch held 10–30 s); unset means any. */
export type DosageBounds = Partial<Record<DosageField, FieldBounds>>;

/**
 * How a dosage rises week by week from the programme's start (week 1 is the starting dosage).
 * `ceiling` is the most the rule ever reaches.
 */
export type Progression =
	| { kind: 'none' }
	/** Add `addPerWeek` reps each week, up to `ceiling` reps. */
	| { kind: 'reps'; addPerWeek: number; ceiling: number }
	/** Add `add` sets every `addAfterWeeks` weeks, up to `ceiling` sets. */
	| { kind: 'sets'; addAfterWeeks: number; add: number; ceiling: number }
	/** Add `addPerWeek` seconds of hold each week, up to `ceiling` seconds. */
	| { kind: 'hold'; addPerWeek: number; ceiling: number };

/** The kinds of progression, in the order a form offers them. */
export const PROGRESSION_KINDS: readonly Progression['kind'][] = ['none', 'reps', 'sets', 'hold'];

/** Hard limits every dosage must keep, whatever the exercise (a typing-error guard, not advice). */
export const DOSAGE_LIMITS: Record<DosageField, Required<FieldBounds>> = {
	sets: { min: 1, max: 10 },
	reps: { min: 1, max: 100 },
	holdSeconds: { min: 0, max: 300 },
	restSeconds: { min: 0, max: 600 },
	sessionsPerDay: { min: 1, max: 12 },
	daysPerWeek: { min: 1, max: 7 }
};
