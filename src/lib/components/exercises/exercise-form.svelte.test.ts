import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { newExerciseDraft } from '$lib/exercises/form';
import type { SegmentChoice } from '$lib/exercises/segment-choice';
import { ExerciseFormState, fieldIdFor, type Problem } from './exercise-form.svelte';

const segment: SegmentChoice = {
	id: 'seg-1',
	title: 'Heel slides',
	recordingTitle: 'Knee, week one',
	durationSeconds: 40,
	posterUrl: null,
	clipUrl: '/clip',
	captionsUrl: '/captions'
};

function formWith(problems: Problem[] = [], cues = [{ text: 'Slide the heel', at: '0:03' }]) {
	const draft = { ...newExerciseDraft(), cues };
	return new ExerciseFormState(draft, () => ({ segments: [segment], problems }));
}

// Node runs Svelte's server build: focus after a move is left to the end-to-end tests.
beforeEach(() => {
	vi.stubGlobal('document', { getElementById: () => null });
});
afterEach(() => {
	vi.unstubAllGlobals();
});

describe('which field a problem is about', () => {
	it('finds the input (or group) by its id', () => {
		expect(fieldIdFor('title')).toBe('title');
		expect(fieldIdFor('segmentId')).toBe('segment-choices');
		expect(fieldIdFor('coachingCues')).toBe('key-points');
		expect(fieldIdFor('coachingCues.2.text')).toBe('cue-text-2');
		expect(fieldIdFor('coachingCues.2.atSeconds')).toBe('cue-at-2');
		expect(fieldIdFor('equipment.1')).toBe('equipment');
		expect(fieldIdFor('precautionTags.0')).toBe('other-tags');
		expect(fieldIdFor('dosage.reps')).toBe('dosage-reps');
		expect(fieldIdFor('bounds.reps.min')).toBe('min-reps');
		expect(fieldIdFor('bounds.reps.max')).toBe('max-reps');
		expect(fieldIdFor('progression')).toBe('progression-kind');
		expect(fieldIdFor('progression.ceiling')).toBe('progression-ceiling');
	});

	it('keeps every problem of a field, and lists the fields in the form’s order', () => {
		const form = formWith([
			{ path: 'dosage.reps', message: 'Reps is missing.' },
			{ path: 'coachingCues.0.text', message: 'A key point needs its words.' },
			{ path: 'coachingCues.0', message: 'Not a key point.' },
			{ path: 'equipment.0', message: 'Keep each piece of equipment under 40 characters.' },
			{ path: 'equipment.2', message: 'Keep each piece of equipment under 40 characters.' },
			{ path: 'segmentId', message: 'Choose a segment.' },
			{ path: 'somewhere.else', message: 'Something went wrong.' }
		]);
		expect(form.errorsOf('cue-text-0')).toEqual([
			'A key point needs its words.',
			'Not a key point.'
		]);
		expect(form.field('dosage-reps')).toEqual({
			id: 'dosage-reps',
			label: 'Reps',
			errors: ['Reps is missing.']
		});
		expect(form.errorsOf('equipment')).toEqual([
			'Keep each piece of equipment under 40 characters.'
		]);
		expect(form.errors._errors).toEqual(['Something went wrong.']);
		expect(form.dosageRowHasProblems('reps')).toBe(true);
		expect(form.dosageRowHasProblems('sets')).toBe(false);
		const order = Object.keys(form.fields);
		expect(order.indexOf('segment-choices')).toBeLessThan(order.indexOf('title'));
		expect(order.indexOf('cue-text-0')).toBeLessThan(order.indexOf('dosage-reps'));
		expect(order.indexOf('dosage-reps')).toBeLessThan(order.indexOf('progression-kind'));
	});

	it('names the progression’s numbers after its kind', () => {
		const form = formWith();
		expect(form.fields['progression-ceiling']).toBeUndefined();
		form.draft.progression.kind = 'hold';
		expect(form.fields['progression-ceiling'].label).toBe('Longest hold (seconds)');
		expect(form.fields['progression-addPerWeek'].label).toBe('Seconds added each week');
	});
});

describe('key points', () => {
	it('offers two blank rows until the script starts, then keeps what was typed in them', () => {
		const form = formWith();
		expect(form.cueRows.map((c) => c.text)).toEqual(['Slide the heel', '', '']);
		expect(Object.keys(form.fields)).toContain('cue-text-2');
		const typed: Record<string, string> = { 'cue-text-1': 'Breathe out', 'cue-at-2': '0:09' };
		form.start((id) => typed[id] ?? '');
		expect(form.scripted).toBe(true);
		expect(form.cueRows.map((c) => [c.text, c.at])).toEqual([
			['Slide the heel', '0:03'],
			['Breathe out', ''],
			['', '0:09']
		]);
	});

	it('adds, moves and removes key points, each keeping its key', async () => {
		const form = formWith();
		form.start(() => '');
		await form.addCue();
		form.cues[1].text = 'Second';
		const keys = form.cues.map((c) => c.key);
		await form.moveCue(1, -1);
		expect(form.cues.map((c) => c.text)).toEqual(['Second', 'Slide the heel']);
		expect(form.cues.map((c) => c.key)).toEqual([keys[1], keys[0]]);
		await form.removeCue(0);
		expect(form.cues.map((c) => c.text)).toEqual(['Slide the heel']);
	});
});

describe('the figures at the starting dosage', () => {
	it('estimates minutes from the pace set, else the demonstration, else common practice', () => {
		const form = formWith();
		expect(form.pace.basis).toMatch(/^4 s per rep \(common practice/);
		form.draft.segmentId = 'seg-1';
		expect(form.pace.basis).toBe('the demonstration’s 40 s over the starting 8 reps');
		form.draft.secondsPerRep = '5';
		expect(form.pace.basis).toBe('5 s per rep, as set below');
		expect(form.weekly?.volume.repsPerWeek).toBe(8 * 3 * 7);
		form.draft.dosage.reps = '';
		expect(form.weekly).toBeNull();
	});

	it('works out the seconds per rep from the reps the demonstration shows', () => {
		const form = formWith();
		form.draft.segmentId = 'seg-1';
		form.repsShown = '6';
		form.workOutPace();
		expect(form.draft.secondsPerRep).toBe('6.7');
	});
});
