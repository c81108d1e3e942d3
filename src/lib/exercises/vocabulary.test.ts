import { describe, expect, it } from 'vitest';
import * as schema from '$lib/server/db/schema/programmes';
import { PHASES } from '$lib/clinical/phases';
import {
	EXERCISE_SIDES,
	EXERCISE_STATUSES,
	MOVEMENT_TYPES,
	PHASE_NUMBERS,
	phaseLabel,
	phaseOf,
	POSITIONS
} from './vocabulary';

describe('exercise vocabulary', () => {
	it('lists exactly the values the database stores', () => {
		expect(POSITIONS).toEqual(schema.POSITIONS);
		expect(MOVEMENT_TYPES).toEqual(schema.MOVEMENT_TYPES);
		expect(EXERCISE_SIDES).toEqual(schema.EXERCISE_SIDES);
		expect(EXERCISE_STATUSES).toEqual(schema.EXERCISE_STATUSES);
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
