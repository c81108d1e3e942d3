/**
 * The words an exercise is described with, shared by forms, tables and the printed sheet. The
 * values are the ones the database stores (src/lib/server/db/schema/programmes.ts); the labels
 * are what people read.
 */
// Relative imports: drizzle-kit loads this through the schema, without SvelteKit's aliases.
import { PHASES, PHASE_LABELS, type Phase } from '../clinical/phases';

export const POSITIONS = ['supine', 'prone', 'side-lying', 'seated', 'standing'] as const;
export type Position = (typeof POSITIONS)[number];
export const POSITION_LABELS: Record<Position, string> = {
	supine: 'Supine (lying on the back)',
	prone: 'Prone (lying face down)',
	'side-lying': 'Side-lying',
	seated: 'Seated',
	standing: 'Standing'
};

export const MOVEMENT_TYPES = ['passive', 'active-assisted', 'active', 'resisted'] as const;
export type MovementType = (typeof MOVEMENT_TYPES)[number];
export const MOVEMENT_LABELS: Record<MovementType, string> = {
	passive: 'Passive',
	'active-assisted': 'Active-assisted',
	active: 'Active',
	resisted: 'Resisted'
};

export const EXERCISE_SIDES = ['left', 'right', 'both', 'either', 'not applicable'] as const;
export type ExerciseSide = (typeof EXERCISE_SIDES)[number];
export const SIDE_LABELS: Record<ExerciseSide, string> = {
	left: 'Left',
	right: 'Right',
	both: 'Both',
	either: 'Either side (the affected one)',
	'not applicable': 'Not applicable'
};

export const EXERCISE_STATUSES = ['draft', 'ready', 'retired'] as const;
export type ExerciseStatus = (typeof EXERCISE_STATUSES)[number];
/** Each state in words, with a tone for its badge (never colour alone). */
export const EXERCISE_STATUS: Record<
	ExerciseStatus,
	{ label: string; tone: 'good' | 'waiting' | 'neutral'; help: string }
> = {
	draft: { label: 'Draft', tone: 'waiting', help: 'Being written; not offered for programmes.' },
	ready: { label: 'Ready', tone: 'good', help: 'Offered when building programmes.' },
	retired: {
		label: 'Retired',
		tone: 'neutral',
		help: 'No longer offered; programmes that use it keep it.'
	}
};

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
