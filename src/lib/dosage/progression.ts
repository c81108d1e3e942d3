/** The dosage for a week of a programme under its progression rule (week 1 = the first week). */
import type { Dosage, Progression } from './types';

function rise(start: number, step: number, steps: number, ceiling: number): number {
	// A start already at or over the ceiling stays where the clinician put it.
	if (start >= ceiling) return start;
	return Math.min(ceiling, start + step * steps);
}

/**
 * The dosage in programme week `week`: week 1 (and any earlier week) is `start`; reps and hold
 * rise by their amount each week after that, sets by `add` every `addAfterWeeks` weeks; none
 * passes its ceiling.
 */
export function dosageForWeek(start: Dosage, progression: Progression, week: number): Dosage {
	if (!Number.isInteger(week))
		throw new RangeError(`A programme week is a whole number, not ${week}.`);
	const weeksIn = Math.max(0, week - 1);
	switch (progression.kind) {
		case 'none':
			return { ...start };
		case 'reps':
			return {
				...start,
				reps: rise(start.reps, progression.addPerWeek, weeksIn, progression.ceiling)
			};
		case 'hold':
			return {
				...start,
				holdSeconds: rise(start.holdSeconds, progression.addPerWeek, weeksIn, progression.ceiling)
			};
		case 'sets': {
			const steps = Math.floor(weeksIn / progression.addAfterWeeks);
			return { ...start, sets: rise(start.sets, progression.add, steps, progression.ceiling) };
		}
	}
}

/** The first programme week whose dosage reaches the ceiling; null when nothing rises. */
export function weekReachingCeiling(start: Dosage, progression: Progression): number | null {
	switch (progression.kind) {
		case 'none':
			return null;
		case 'reps':
		case 'hold': {
			const from = progression.kind === 'reps' ? start.reps : start.holdSeconds;
			if (from >= progression.ceiling) return 1;
			return 1 + Math.ceil((progression.ceiling - from) / progression.addPerWeek);
		}
		case 'sets': {
			if (start.sets >= progression.ceiling) return 1;
			const steps = Math.ceil((progression.ceiling - start.sets) / progression.add);
			return 1 + steps * progression.addAfterWeeks;
		}
	}
}

/** The rule in plain words, e.g. "Add 2 reps each week, up to 15." */
export function describeProgression(progression: Progression): string {
	const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;
	switch (progression.kind) {
		case 'none':
			return 'Stays the same each week.';
		case 'reps':
			return `Add ${plural(progression.addPerWeek, 'rep', 'reps')} each week, up to ${progression.ceiling}.`;
		case 'hold':
			return `Hold ${plural(progression.addPerWeek, 'second', 'seconds')} longer each week, up to ${progression.ceiling} seconds.`;
		case 'sets':
			return `Add ${plural(progression.add, 'set', 'sets')} every ${progression.addAfterWeeks === 1 ? 'week' : `${progression.addAfterWeeks} weeks`}, up to ${progression.ceiling}.`;
	}
}
