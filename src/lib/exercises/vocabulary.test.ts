import { describe, expect, it } from 'vitest';
import { PHASES } from '$lib/clinical/phases';
import {
	EXERCISE_SIDES,
	EXERCISE_STATUSES,
	MOVEMENT_TYPES,
	PHASE_NUMBERS,
	POSITIONS,
	phaseLabel,
	phaseOf
} from './vocabulary';

describe('exercise vocabulary', () => {
	it('takes each list of ids from its words, as stored and in the order written', () => {
		expect(POSITIONS).toEqual(['supine', 'prone', 'side-lying', 'seated', 'standing']);
		expect(MOVEMENT_TYPES).toEqual(['passive', 'active-assisted', 'active', 'resisted']);
		expect(EXERCISE_SIDES).toEqual(['left', 'right', 'both', 'either', 'not applicable']);
		expect(EXERCISE_STATUSES).toEqual(['draft', 'ready', 'retired']);
	});

	it('numbers phases from 1 in the order of the phase list', () => {
		expect(PHASE_NUMBERS).toEqual([1, 2, 3, 4, 5]);
		expect(phaseOf(1)).toBe(PHASES[0]);
		expect(phaseOf(4)).toBe('strengthening');
		expect(phaseOf(0)).toBeNull();
		expect(phaseOf(9)).toBeNull();
		expect(phaseLabel(2)).toBe('2 · Early motion');
		expect(phaseLabel(9)).toBe('Phase 9');
	});
});
