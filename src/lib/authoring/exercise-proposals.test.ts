import { describe, expect, it } from 'vitest';
import type { Cue } from '$lib/captions/types';
import { parseDraft } from '$lib/exercises/form';
import { draftExercise } from './exercise-draft';
import { proposalRow, rowsFromForm } from './exercise-proposals';
import { rowFieldName } from './proposed-fields';

// An invented narration, written for this test.
const cues: Cue[] = [
	{ id: '1', start: 0, end: 3, text: 'The next exercise is the supported arm raise.' },
	{ id: '2', start: 3, end: 6.5, text: 'Lie on your back and hold a stick in both hands.' },
	{ id: '3', start: 6.5, end: 10, text: 'Your good arm does the work; let the other arm relax.' },
	{ id: '4', start: 10, end: 13, text: 'Do one set of eight, a few times a day.' },
	{
		id: '5',
		start: 13,
		end: 16,
		text: 'You may feel some tightness at the end. Stop if it is painful.'
	}
];

describe('draft exercises for a recording’s segments', () => {
	const row = proposalRow({ id: 'seg-1', title: 'Segment 1' }, draftExercise(cues));

	it('fills the exercise form from the narration, naming the words each field came from', () => {
		expect(row.draft).toMatchObject({
			position: 'supine',
			movementType: 'passive',
			segmentId: 'seg-1',
			status: 'draft'
		});
		expect(row.draft.title.toLowerCase()).toContain('supported arm raise');
		expect(row.draft.equipment).toContain('Stick');
		expect(row.draft.dosage.sets).toBe('1');
		expect(row.draft.dosage.reps).toBe('8');
		expect(row.from.position).toMatch(/on your back/i);
		expect(row.draft.safetyNotes).toMatch(/tight/i);
	});

	it('leaves a vague amount blank with its words for the clinician to settle', () => {
		expect(row.draft.dosage.sessionsPerDay).toBe('');
		expect(row.settle.sessionsPerDay).toMatch(/^Said as \d–\d: choose a number\.$/);
		expect(row.from.sessionsPerDay).toMatch(/a few times a day/);
		// Not settled, the row is refused in words rather than saved with a guess.
		const parsed = parseDraft(row.draft);
		expect(parsed.ok).toBe(false);
	});

	it('keeps the segment’s own name when nothing announces a title', () => {
		const quiet = proposalRow({ id: 'seg-2', title: 'Wall press' }, draftExercise([]));
		expect(quiet.draft.title).toBe('Wall press');
		expect(quiet.from).toEqual({});
	});

	it('reads the rows back from a form, with what to make', () => {
		const form = new FormData();
		form.set('rowCount', '2');
		form.set('row-0-segmentId', 'seg-1');
		form.set('row-0-make', 'on');
		form.set(rowFieldName(0, 'title'), 'Supported arm raise');
		form.set(rowFieldName(0, 'sessionsPerDay'), '3');
		form.set('row-1-segmentId', 'seg-2');
		const rows = rowsFromForm(form, 30);
		expect(rows).toHaveLength(2);
		expect(rows[0]).toMatchObject({
			make: true,
			draft: { segmentId: 'seg-1', title: 'Supported arm raise', dosage: { sessionsPerDay: '3' } }
		});
		expect(rows[1].make).toBe(false);
		form.set('rowCount', '500');
		expect(rowsFromForm(form, 30)).toHaveLength(30);
	});
});
