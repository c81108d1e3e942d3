import { describe, expect, it } from 'vitest';
import { suggestedStartingDosage } from './defaults';
import { dosageBoundsSchema, dosagePlanSchema, dosageSchema, progressionSchema } from './schema';

const messages = (r: {
	success: boolean;
	error?: { issues: { path: PropertyKey[]; message: string }[] };
}) => r.error?.issues.map((i) => [i.path.join('.'), i.message]) ?? [];

describe('dosage schema', () => {
	it('takes numbers or the text of a form', () => {
		const form = {
			sets: '1',
			reps: ' 8 ',
			holdSeconds: '0',
			restSeconds: '30',
			sessionsPerDay: '3',
			daysPerWeek: '7'
		};
		expect(dosageSchema.parse(form)).toEqual(suggestedStartingDosage());
		expect(dosageSchema.parse(suggestedStartingDosage())).toEqual(suggestedStartingDosage());
	});

	it('says in plain words what is wrong with each field', () => {
		const r = dosageSchema.safeParse({
			sets: '0',
			reps: '',
			holdSeconds: '2.5',
			restSeconds: 'soon',
			sessionsPerDay: 13
		});
		expect(messages(r)).toEqual([
			['sets', 'Sets must be a whole number from 1 to 10.'],
			['reps', 'Reps is missing: enter a whole number from 1 to 100.'],
			['holdSeconds', 'Hold (seconds) must be a whole number from 0 to 300.'],
			['restSeconds', 'Rest between sets (seconds) must be a whole number from 0 to 600.'],
			['sessionsPerDay', 'Sessions a day must be a whole number from 1 to 12.'],
			['daysPerWeek', 'Days a week is missing: enter a whole number from 1 to 7.']
		]);
	});
});

describe('bounds schema', () => {
	it('takes open or closed ranges and refuses a lowest above the highest', () => {
		expect(
			dosageBoundsSchema.parse({ holdSeconds: { min: '10', max: '30' }, reps: { max: 15 } })
		).toEqual({
			holdSeconds: { min: 10, max: 30 },
			reps: { max: 15 }
		});
		expect(messages(dosageBoundsSchema.safeParse({ reps: { min: 10, max: 5 } }))).toEqual([
			['reps.max', 'Reps: the lowest allowed is above the highest allowed.']
		]);
	});
});

describe('progression schema', () => {
	it('needs the numbers its kind uses', () => {
		expect(progressionSchema.parse({ kind: 'none' })).toEqual({ kind: 'none' });
		expect(progressionSchema.parse({ kind: 'reps', addPerWeek: '2', ceiling: '15' })).toEqual({
			kind: 'reps',
			addPerWeek: 2,
			ceiling: 15
		});
		expect(messages(progressionSchema.safeParse({ kind: 'sets', add: 1, ceiling: 3 }))).toEqual([
			['addAfterWeeks', 'Weeks between adding sets is missing: enter a whole number from 1 to 12.']
		]);
		expect(messages(progressionSchema.safeParse({ kind: 'faster' }))).toEqual([
			['kind', 'Choose how the dosage rises: not at all, by reps, by sets or by hold.']
		]);
	});

	it('refuses a ceiling below the starting value', () => {
		const dosage = { ...suggestedStartingDosage(), reps: 20 };
		const r = dosagePlanSchema.safeParse({
			dosage,
			progression: { kind: 'reps', addPerWeek: 2, ceiling: 15 }
		});
		expect(messages(r)).toEqual([
			[
				'progression.ceiling',
				'The most it rises to (15) is below where it starts (20). Raise the most, or lower the starting reps.'
			]
		]);
		const ok = dosagePlanSchema.safeParse({
			dosage: suggestedStartingDosage(),
			progression: { kind: 'hold', addPerWeek: 5, ceiling: 30 }
		});
		expect(ok.success).toBe(true);
	});
});
