import { describe, expect, it } from 'vitest';
import { draftFromExercise, draftFromForm, newExerciseDraft, parseDraft } from './form';
import type { ExerciseFields } from './columns';
import { formatCueTime, parseCueTime, splitList } from './form-text';

const SEGMENT = '6f1c2d3e-4a5b-4c6d-8e7f-901234567890';

function filled(): ReturnType<typeof newExerciseDraft> {
	return {
		...newExerciseDraft(SEGMENT),
		title: 'Heel slides',
		bodyRegion: 'Knee',
		position: 'supine',
		movementType: 'active-assisted',
		equipment: 'Towel, bed',
		phase: '2',
		cues: [
			{ text: 'Slide the heel towards you', at: '0:03' },
			{ text: 'Breathe out as you bend', at: '' }
		],
		tags: ['knee-flexion-beyond-90'],
		otherTags: 'needs a firm bed'
	};
}

describe('cue times', () => {
	it('reads minutes and seconds, plain seconds and tenths', () => {
		expect(parseCueTime('1:12')).toBe(72);
		expect(parseCueTime('72')).toBe(72);
		expect(parseCueTime('0:04.5')).toBe(4.5);
		expect(parseCueTime(' ')).toBeUndefined();
		expect(parseCueTime('1:75')).toBeNaN();
		expect(parseCueTime('soon')).toBeNaN();
	});

	it('writes seconds back as m:ss', () => {
		expect(formatCueTime(72)).toBe('1:12');
		expect(formatCueTime(4.5)).toBe('0:04.5');
		expect(formatCueTime(0)).toBe('0:00');
		for (const s of [0, 3, 59.9, 60, 125.5]) expect(parseCueTime(formatCueTime(s))).toBe(s);
	});
});

describe('splitList', () => {
	it('splits on commas and lines, trims, drops empties and repeats', () => {
		expect(splitList('Chair, towel,,  step\nTowel')).toEqual(['Chair', 'towel', 'step']);
		expect(splitList('')).toEqual([]);
	});
});

describe('parseDraft', () => {
	it('accepts a complete exercise and turns text into values', () => {
		const parsed = parseDraft(filled());
		expect(parsed.ok).toBe(true);
		if (!parsed.ok) return;
		expect(parsed.input).toMatchObject({
			title: 'Heel slides',
			equipment: ['Towel', 'bed'],
			phase: 2,
			coachingCues: [
				{ text: 'Slide the heel towards you', atSeconds: 3 },
				{ text: 'Breathe out as you bend' }
			],
			precautionTags: ['knee-flexion-beyond-90', 'needs a firm bed'],
			// The common-practice starting dosage of a new exercise (one set of 8, three times a day).
			dosage: {
				sets: 1,
				reps: 8,
				holdSeconds: 0,
				restSeconds: 30,
				sessionsPerDay: 3,
				daysPerWeek: 7
			},
			bounds: {},
			progression: { kind: 'none' },
			secondsPerRep: null,
			segmentId: SEGMENT,
			status: 'draft'
		});
	});

	it('names each problem and the field it belongs to', () => {
		const draft = {
			...filled(),
			title: ' ',
			position: 'upside down',
			cues: [{ text: 'Bend', at: 'later' }],
			dosage: { ...filled().dosage, reps: '' }
		};
		const parsed = parseDraft(draft);
		expect(parsed.ok).toBe(false);
		if (parsed.ok) return;
		const byPath = Object.fromEntries(parsed.problems.map((p) => [p.path, p.message]));
		expect(byPath.title).toBe('Give the exercise a title.');
		expect(byPath.position).toBe('Choose the starting position.');
		expect(byPath['coachingCues.0.atSeconds']).toMatch(/minutes and seconds/);
		expect(byPath['dosage.reps']).toMatch(/Reps is missing/);
	});

	it('lists problems in the form’s order, the demonstration first', () => {
		const parsed = parseDraft({
			...filled(),
			segmentId: 'not a segment',
			title: '',
			phase: '',
			dosage: { ...filled().dosage, reps: '' },
			secondsPerRep: 'soon'
		});
		expect(parsed.ok).toBe(false);
		if (parsed.ok) return;
		expect(parsed.problems).toEqual([
			{ path: 'segmentId', message: 'Choose a demonstration segment.' },
			{ path: 'title', message: 'Give the exercise a title.' },
			{ path: 'phase', message: 'Choose the phase.' },
			{ path: 'dosage.reps', message: expect.stringMatching(/^Reps is missing/) },
			{ path: 'secondsPerRep', message: 'Seconds per rep must be a number, for example 4.' }
		]);
	});

	it('says every problem at once: the checks across fields too, when other fields are wrong', () => {
		const draft = {
			...filled(),
			segmentId: '',
			status: 'ready',
			title: '',
			secondsPerRep: 'soon',
			cues: [{ text: ' ', at: 'later' }]
		};
		draft.bounds.reps = { min: '10', max: '15' };
		draft.progression = { kind: 'reps', addPerWeek: '2', ceiling: '6', addAfterWeeks: '', add: '' };
		const parsed = parseDraft(draft);
		expect(parsed.ok).toBe(false);
		if (parsed.ok) return;
		expect(parsed.problems.map((p) => p.path)).toEqual([
			'title',
			'coachingCues.0.text',
			'coachingCues.0.atSeconds',
			'secondsPerRep',
			'progression.ceiling',
			'dosage.reps',
			'segmentId'
		]);
	});

	it('leaves a check across fields out while a field it reads is wrong itself', () => {
		const draft = { ...filled(), segmentId: 'not a segment', status: 'ready' };
		draft.dosage.reps = 'many';
		draft.bounds.reps = { min: '10', max: '' };
		draft.progression = { kind: 'reps', addPerWeek: '2', ceiling: '6', addAfterWeeks: '', add: '' };
		const parsed = parseDraft(draft);
		expect(parsed.ok).toBe(false);
		if (parsed.ok) return;
		// Only each field's own problem: no range or ceiling compared with reps that are no number,
		// and no "choose the segment" on top of the segment's own refusal.
		expect(parsed.problems.map((p) => p.path)).toEqual(['segmentId', 'dosage.reps']);
	});

	it('refuses a default dosage outside the exercise’s own range', () => {
		const draft = filled();
		draft.bounds.reps = { min: '10', max: '15' };
		const parsed = parseDraft(draft);
		expect(parsed.ok).toBe(false);
		if (parsed.ok) return;
		expect(parsed.problems[0]).toEqual({
			path: 'dosage.reps',
			message: expect.stringContaining("below this exercise's lowest of 10")
		});
	});

	it('refuses a progression whose ceiling is below the start', () => {
		const draft = filled();
		draft.progression = { kind: 'reps', addPerWeek: '2', ceiling: '6', addAfterWeeks: '', add: '' };
		const parsed = parseDraft(draft);
		expect(parsed.ok).toBe(false);
		if (parsed.ok) return;
		expect(parsed.problems.map((p) => p.path)).toContain('progression.ceiling');
	});

	it('keeps only the chosen progression kind’s numbers', () => {
		const draft = filled();
		draft.progression = {
			kind: 'sets',
			addPerWeek: '9',
			ceiling: '3',
			addAfterWeeks: '2',
			add: '1'
		};
		const parsed = parseDraft(draft);
		expect(parsed.ok && parsed.input.progression).toEqual({
			kind: 'sets',
			addAfterWeeks: 2,
			add: 1,
			ceiling: 3
		});
	});

	it('will not mark an exercise ready without its demonstration', () => {
		const parsed = parseDraft({ ...filled(), segmentId: '', status: 'ready' });
		expect(parsed.ok).toBe(false);
		if (parsed.ok) return;
		expect(parsed.problems.map((p) => p.path)).toEqual(['segmentId']);
	});
});

describe('drafts from forms and exercises', () => {
	it('starts a new exercise at each column’s default, on the affected side', () => {
		const draft = newExerciseDraft(SEGMENT);
		expect(draft).toMatchObject({
			title: '',
			description: '',
			side: 'either',
			equipment: '',
			phase: '1',
			secondsPerRep: '',
			segmentId: SEGMENT,
			status: 'draft',
			progression: { kind: 'none' }
		});
	});

	it('round-trips a stored exercise through its draft', () => {
		const stored: ExerciseFields = {
			title: 'Sit to stand',
			description: 'From a firm chair.',
			bodyRegion: 'Knee',
			side: 'both',
			position: 'seated',
			movementType: 'active',
			equipment: ['Chair'],
			phase: 4,
			coachingCues: [{ text: 'Lean forward', atSeconds: 2.5 }, { text: 'Stand tall' }],
			safetyNotes: 'Stop if **sharp** pain.',
			precautionTags: ['standing-balance', 'needs a spotter'],
			sets: 2,
			reps: 10,
			holdSeconds: 0,
			restSeconds: 60,
			sessionsPerDay: 1,
			daysPerWeek: 5,
			dosageBounds: { reps: { min: 5, max: 15 } },
			progression: { kind: 'reps', addPerWeek: 1, ceiling: 15 },
			secondsPerRep: 5,
			segmentId: SEGMENT,
			status: 'ready'
		};
		const draft = draftFromExercise(stored);
		expect(draft.tags).toEqual(['standing-balance']);
		expect(draft.otherTags).toBe('needs a spotter');
		expect(draft.cues[0]).toEqual({ text: 'Lean forward', at: '0:02.5' });
		const parsed = parseDraft(draft);
		expect(parsed.ok).toBe(true);
		if (!parsed.ok) return;
		const { dosage, bounds, ...rest } = parsed.input;
		expect(dosage).toEqual({
			sets: 2,
			reps: 10,
			holdSeconds: 0,
			restSeconds: 60,
			sessionsPerDay: 1,
			daysPerWeek: 5
		});
		expect(bounds).toEqual({ reps: { min: 5, max: 15 } });
		expect(rest).toMatchObject({
			title: stored.title,
			coachingCues: stored.coachingCues,
			precautionTags: stored.precautionTags,
			progression: stored.progression,
			secondsPerRep: 5,
			status: 'ready'
		});
	});

	it('reads a submitted form, dropping empty cue rows and unknown tag ids', () => {
		const form = new FormData();
		form.set('title', 'Quad sets');
		form.append('cueText', 'Press the knee down');
		form.append('cueAt', '0:05');
		form.append('cueText', '');
		form.append('cueAt', '');
		form.append('tag', 'kneeling');
		form.append('tag', '<script>');
		form.set('dosage.reps', '10');
		form.set('min.reps', '5');
		form.set('progression.kind', 'reps');
		form.set('progression.addPerWeek', '1');
		const draft = draftFromForm(form);
		expect(draft.title).toBe('Quad sets');
		expect(draft.cues).toEqual([{ text: 'Press the knee down', at: '0:05' }]);
		expect(draft.tags).toEqual(['kneeling']);
		expect(draft.dosage.reps).toBe('10');
		expect(draft.dosage.sets).toBe('');
		expect(draft.bounds.reps).toEqual({ min: '5', max: '' });
		expect(draft.progression).toMatchObject({ kind: 'reps', addPerWeek: '1', ceiling: '' });
	});
});
