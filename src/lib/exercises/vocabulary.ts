/**
 * The words an exercise is described with, shared by forms, tables and the printed sheet. The
 * ids are the values the database stores (the columns in lib/exercises/columns); the labels
 * are what people read.
 */
// Relative imports: drizzle-kit loads this through the schema, without SvelteKit's aliases.
import { PHASES, PHASE_LABELS, type Phase } from '../clinical/phases';

/**
 * A vocabulary's ids, in the order its labels are written: each vocabulary is one record of
 * id → words, and its id list (for z.enum and Drizzle's enum columns) comes from it.
 */
function idsOf<K extends string>(labels: Record<K, unknown>): readonly [K, ...K[]] {
	return Object.keys(labels) as [K, ...K[]];
}

export const POSITION_LABELS = {
	supine: 'Supine (lying on the back)',
	prone: 'Prone (lying face down)',
	'side-lying': 'Side-lying',
	seated: 'Seated',
	standing: 'Standing'
} satisfies Record<string, string>;
export type Position = keyof typeof POSITION_LABELS;
export const POSITIONS = idsOf(POSITION_LABELS);

export const MOVEMENT_LABELS = {
	passive: 'Passive',
	'active-assisted': 'Active-assisted',
	active: 'Active',
	resisted: 'Resisted'
} satisfies Record<string, string>;
export type MovementType = keyof typeof MOVEMENT_LABELS;
export const MOVEMENT_TYPES = idsOf(MOVEMENT_LABELS);

export const SIDE_LABELS = {
	left: 'Left',
	right: 'Right',
	both: 'Both',
	either: 'Either side (the affected one)',
	'not applicable': 'Not applicable'
} satisfies Record<string, string>;
export type ExerciseSide = keyof typeof SIDE_LABELS;
export const EXERCISE_SIDES = idsOf(SIDE_LABELS);

/** Each state in words, with a tone for its badge (never colour alone). */
export const EXERCISE_STATUS = {
	draft: { label: 'Draft', tone: 'waiting', help: 'Being written; not offered for programmes.' },
	ready: { label: 'Ready', tone: 'good', help: 'Offered when building programmes.' },
	retired: {
		label: 'Retired',
		tone: 'neutral',
		help: 'No longer offered; programmes that use it keep it.'
	}
} satisfies Record<string, { label: string; tone: 'good' | 'waiting' | 'neutral'; help: string }>;
export type ExerciseStatus = keyof typeof EXERCISE_STATUS;
export const EXERCISE_STATUSES = idsOf(EXERCISE_STATUS);

/** Suggestions offered while typing; any other words are allowed. */
export const BODY_REGIONS = [
	'Knee',
	'Hip',
	'Ankle and foot',
	'Shoulder',
	'Elbow',
	'Wrist and hand',
	'Neck',
	'Back',
	'Balance',
	'Whole body'
] as const;

export const EQUIPMENT_SUGGESTIONS = [
	'Chair',
	'Stick',
	'Towel',
	'Rolled towel',
	'Step',
	'Resistance band',
	'Ankle weight',
	'Bed',
	'Wall',
	'Walking aid'
] as const;

/** Exercise phases are stored as numbers from 1, in the order of PHASES. */
export const PHASE_NUMBERS = PHASES.map((_, i) => i + 1);

/** The phase a stored number stands for; null for a number outside the list. */
export function phaseOf(phaseNumber: number): Phase | null {
	return PHASES[phaseNumber - 1] ?? null;
}

/** "2 · Early motion" — a stored phase number in words. */
export function phaseLabel(phaseNumber: number): string {
	const phase = phaseOf(phaseNumber);
	return phase ? `${phaseNumber} · ${PHASE_LABELS[phase]}` : `Phase ${phaseNumber}`;
}
