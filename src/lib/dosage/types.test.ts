import { describe, expect, it } from 'vitest';
import { dosageOf } from './types';

describe('dosageOf', () => {
	it('keeps the six dosage numbers of a row and nothing else', () => {
		const exercise = {
			id: 'x',
			title: 'Heel slides',
			sets: 1,
			reps: 8,
			holdSeconds: 0,
			restSeconds: 30,
			sessionsPerDay: 3,
			daysPerWeek: 7
		};
		expect(dosageOf(exercise)).toEqual({
			sets: 1,
			reps: 8,
			holdSeconds: 0,
			restSeconds: 30,
			sessionsPerDay: 3,
			daysPerWeek: 7
		});
	});
});
