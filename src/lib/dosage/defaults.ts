/**
 * Where a new exercise's dosage starts before the clinician changes it. These are starting
 * points, not advice: the treating clinician sets each patient's dosage.
 */
import type { Dosage, DosageBounds } from './types';

/** What a starting dosage is for: a movement done for repetitions, or a stretch held. */
export type StartingKind = 'movement' | 'stretch';

export interface StartingOptions {
	/** Older adults hold stretches longer (ACSM). */
	olderAdult?: boolean;
}

/** Why each starting dosage is what it is, to show beside it. */
export const STARTING_DOSAGE_BASIS: Record<StartingKind, string> = {
	movement:
		'Common practice: start low — one set of about 8 repetitions, a few sessions a day — and build up over weeks.',
	stretch:
		'ACSM Guidelines (11th ed., flexibility): hold 10–30 s (30–60 s for older adults), about 60 s per stretch in all, at least 2–3 days a week and daily is most effective.'
};

/** A starting dosage: one set of 8, three sessions a day for movements; 60 s of holds a day for stretches. */
export function suggestedStartingDosage(
	kind: StartingKind = 'movement',
	options: StartingOptions = {}
): Dosage {
	if (kind === 'stretch') {
		// 3 × 20 s or 2 × 30 s: about 60 s of holding per stretch either way.
		return options.olderAdult
			? { sets: 1, reps: 2, holdSeconds: 30, restSeconds: 0, sessionsPerDay: 1, daysPerWeek: 7 }
			: { sets: 1, reps: 3, holdSeconds: 20, restSeconds: 0, sessionsPerDay: 1, daysPerWeek: 7 };
	}
	return { sets: 1, reps: 8, holdSeconds: 0, restSeconds: 30, sessionsPerDay: 3, daysPerWeek: 7 };
}

/** Bounds for a stretch, from the ACSM flexibility guidance (holds 10–30 s, or 30–60 s older). */
export function stretchBounds(options: StartingOptions = {}): DosageBounds {
	return {
		holdSeconds: options.olderAdult ? { min: 30, max: 60 } : { min: 10, max: 30 },
		daysPerWeek: { min: 2 }
	};
}
