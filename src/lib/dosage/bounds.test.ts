import { describe, expect, it } from 'vitest';
import { outOfBounds } from './bounds';
import { stretchBounds, suggestedStartingDosage } from './defaults';

describe('dosage bounds', () => {
	it('finds nothing when every field is inside', () => {
		expect(outOfBounds(suggestedStartingDosage(), { reps: { min: 5, max: 15 } })).toEqual([]);
		expect(outOfBounds(suggestedStartingDosage(), {})).toEqual([]);
	});

	it('names each field outside, below or above, with a sentence', () => {
		const d = { ...suggestedStartingDosage('stretch'), holdSeconds: 45, daysPerWeek: 1 };
		// ACSM flexibility guidance (REFERENCES.md): holds 10–30 s; at least 2–3 days a week.
		expect(outOfBounds(d, stretchBounds())).toEqual([
			{
				field: 'holdSeconds',
				value: 45,
				limit: 30,
				side: 'above',
				message: "Hold (seconds) is 45, above this exercise's highest of 30."
			},
			{
				field: 'daysPerWeek',
				value: 1,
				limit: 2,
				side: 'below',
				message: "Days a week is 1, below this exercise's lowest of 2."
			}
		]);
	});

	it('accepts 45 s holds for older adults (ACSM: 30–60 s for older adults)', () => {
		const d = { ...suggestedStartingDosage('stretch', { olderAdult: true }), holdSeconds: 45 };
		expect(outOfBounds(d, stretchBounds({ olderAdult: true }))).toEqual([]);
		expect(
			outOfBounds({ ...d, holdSeconds: 20 }, stretchBounds({ olderAdult: true }))
		).toHaveLength(1);
	});

	it('treats the ends as allowed', () => {
		const d = { ...suggestedStartingDosage('stretch'), holdSeconds: 30 };
		expect(outOfBounds(d, { holdSeconds: { min: 10, max: 30 } })).toEqual([]);
		expect(outOfBounds({ ...d, holdSeconds: 10 }, { holdSeconds: { min: 10, max: 30 } })).toEqual(
			[]
		);
	});
});
