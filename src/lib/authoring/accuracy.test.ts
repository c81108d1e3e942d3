import { describe, expect, it } from 'vitest';
import { compareDraft, scoreDrafts, type ExpectedExercise } from './accuracy';
import type { DraftSource, ExerciseDraft, Proposal } from './exercise-draft';

const source: DraftSource = { cueIndex: 0, cueId: '1', start: 0, end: 2, words: 'said' };
const said = <T>(value: T): Proposal<T> => ({ value, from: [source] });

/** A draft with nothing proposed, then the given fields. */
const draftWith = (fields: Partial<ExerciseDraft>): ExerciseDraft => ({
	title: null,
	bodyRegion: null,
	position: null,
	equipment: [],
	movementType: null,
	side: null,
	dosage: {},
	needsChoice: [],
	safetyNotes: null,
	...fields
});

describe('compareDraft and scoreDrafts: a worked example', () => {
	// Two drafts scored by hand.
	// Draft A: position right (TP), side wrong (FP), title missing where expected (FN), movement
	// type absent and not expected (TN); equipment Stick right, Towel not expected; reps 10 right;
	// sessions a day proposed as 3–4 while 3–4 was expected (TP); one note quoting the expected
	// caution and one that quotes nothing expected.
	const draftA = draftWith({
		position: said('supine'),
		side: said('left'),
		equipment: [said('Stick'), said('Towel')],
		dosage: {
			reps: said({ kind: 'exact', value: 10 }),
			sessionsPerDay: said({ kind: 'range', min: 3, max: 4, needsChoice: true })
		},
		safetyNotes: {
			markdown: '',
			notes: [said('It should be pain free.'), said('Keep your back straight.')]
		}
	});
	const expectedA: ExpectedExercise = {
		title: 'Heel slides',
		position: 'supine',
		side: 'either',
		equipment: ['Stick'],
		dosage: { reps: 10, sessionsPerDay: { min: 3, max: 4 } },
		safetyNotes: ['pain free']
	};
	// Draft B: position wrong (FP), title right (TP, case and punctuation aside), reps 8 where a
	// range of 8–10 was expected (FP), Chair expected but not proposed (FN).
	const draftB = draftWith({
		title: said('Heel slides'),
		position: said('seated'),
		dosage: { reps: said({ kind: 'exact', value: 8 }) }
	});
	const expectedB: ExpectedExercise = {
		title: 'heel slides.',
		position: 'standing',
		equipment: ['Chair'],
		dosage: { reps: { min: 8, max: 10 } }
	};

	it('counts each field of one draft', () => {
		const a = compareDraft(draftA, expectedA);
		expect(a.position).toEqual({
			truePositives: 1,
			falsePositives: 0,
			falseNegatives: 0,
			trueNegatives: 0
		});
		expect(a.side).toEqual({
			truePositives: 0,
			falsePositives: 1,
			falseNegatives: 0,
			trueNegatives: 0
		});
		expect(a.title).toEqual({
			truePositives: 0,
			falsePositives: 0,
			falseNegatives: 1,
			trueNegatives: 0
		});
		expect(a.movementType).toEqual({
			truePositives: 0,
			falsePositives: 0,
			falseNegatives: 0,
			trueNegatives: 1
		});
		expect(a.equipment).toEqual({
			truePositives: 1,
			falsePositives: 1,
			falseNegatives: 0,
			trueNegatives: 0
		});
		expect(a.sessionsPerDay.truePositives).toBe(1);
		expect(a.safetyNotes).toEqual({
			truePositives: 1,
			falsePositives: 1,
			falseNegatives: 0,
			trueNegatives: 0
		});
	});

	it('sums the counts and gives precision and recall per field', () => {
		const scores = scoreDrafts([
			{ draft: draftA, expected: expectedA },
			{ draft: draftB, expected: expectedB }
		]);
		// Position: TP 1 (A), FP 1 (B) → precision 1/2; recall 1/(1 + 0) = 1.
		expect(scores.position).toMatchObject({
			truePositives: 1,
			falsePositives: 1,
			precision: 0.5,
			recall: 1
		});
		// Title: FN 1 (A), TP 1 (B) → precision 1; recall 1/2.
		expect(scores.title).toMatchObject({ precision: 1, recall: 0.5 });
		// Equipment: TP 1, FP 1 (Towel), FN 1 (Chair) → 1/2 and 1/2.
		expect(scores.equipment).toMatchObject({ precision: 0.5, recall: 0.5 });
		// Reps: TP 1 (A), FP 1 (B: 8 is not the 8–10 range) → precision 1/2, recall 1.
		expect(scores.reps).toMatchObject({ precision: 0.5, recall: 1 });
		// Hold: nothing proposed or expected in either → no precision or recall, two true negatives.
		expect(scores.holdSeconds).toMatchObject({ trueNegatives: 2, precision: null, recall: null });
	});
});
