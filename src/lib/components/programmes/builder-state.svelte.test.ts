import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import {
	itemFromExercise,
	type BuilderExercise,
	type ProgrammeDraft
} from '$lib/programmes/builder';
import { builderExercise } from '$lib/programmes/builder-fixtures';
import {
	ProgrammeBuilderState,
	type BuilderInputs,
	type BuilderProgramme
} from './builder-state.svelte';

// Each with a ceiling of 12 reps, so that typing more raises a flag.
const exercise = (id: string, title: string, changes: Partial<BuilderExercise> = {}) =>
	builderExercise({ id, title, dosageBounds: { reps: { max: 12 } }, ...changes });

const catalogue = [
	exercise('e1', 'Heel slides'),
	exercise('e2', 'Quad sets'),
	exercise('e3', 'Pendulum', { bodyRegion: 'Shoulder', position: 'standing', phase: 1 }),
	exercise('e4', 'Wall press', { status: 'draft' })
];

const initial = (): ProgrammeDraft => ({
	title: 'Knee',
	startDate: '2026-11-17',
	endDate: '',
	note: '',
	items: [
		{ ...itemFromExercise(catalogue[0], 'a'), id: 'item-a' },
		itemFromExercise(catalogue[1], 'b')
	]
});

function inputs(status: BuilderProgramme['status'] = 'draft'): BuilderInputs {
	return {
		programme: { id: 'prog-1', status },
		patient: {
			id: 'pat-1',
			fullName: 'Ada Example',
			hasAccount: true,
			condition: 'Knee replacement',
			today: '2026-11-17',
			operationDate: null,
			protocol: '',
			protocolShiftWeeks: 0,
			precautions: [],
			precautionDetails: {}
		},
		catalogue,
		result: null
	};
}

// Node runs Svelte's server build, where effects do not run: the auto-save timer and the
// scripted flag are left to the end-to-end tests; everything else is here.
const builderState = (status: BuilderProgramme['status'] = 'draft') =>
	new ProgrammeBuilderState(initial(), () => inputs(status));

const click = () => new Event('click');

beforeEach(() => {
	vi.stubGlobal('document', { getElementById: () => null });
});
afterEach(() => {
	vi.unstubAllGlobals();
});

describe('the programme builder’s state', () => {
	it('moves, removes and adds exercises, saying each in words', async () => {
		const builder = builderState();
		await builder.move(0, 1, click());
		expect(builder.draft.items.map((i) => i.key)).toEqual(['b', 'a']);
		expect(builder.announcement).toBe('Heel slides moved to place 2 of 2.');

		await builder.add(catalogue[2], click());
		expect(builder.draft.items.map((i) => i.exerciseId)).toEqual(['e2', 'e1', 'e3']);
		expect(builder.announcement).toBe('Pendulum added as number 3.');

		await builder.remove(0, click());
		expect(builder.draft.items.map((i) => i.exerciseId)).toEqual(['e1', 'e3']);
		expect(builder.announcement).toBe('Quad sets removed.');
	});

	it('offers ready exercises not in the programme yet, through the filters', () => {
		const builder = builderState();
		expect(builder.offered.map((e) => e.id)).toEqual(['e3']);
		expect(builder.regions).toEqual(['Knee', 'Shoulder']);
		builder.region = 'Knee';
		expect(builder.offered).toEqual([]);
		builder.region = '';
		builder.search = 'pend';
		expect(builder.offered.map((e) => e.id)).toEqual(['e3']);
	});

	it('counts flags from the dosage typed, and puts the starting dosage back', () => {
		const builder = builderState();
		expect(builder.flagCount).toBe(0);
		builder.draft.items[0].dosage.reps = '20';
		expect(builder.flagCount).toBe(1);
		builder.draft.items[1].dosage.sets = 'x';
		expect(builder.figures.perItem[1]).toBeNull();
		builder.resetDosage(builder.draft.items[0]);
		expect(builder.draft.items[0].dosage.reps).toBe('8');
		expect(builder.flagCount).toBe(0);
	});

	it('says which exercise a problem is about', () => {
		const builder = builderState();
		expect(builder.where('items.1.dosage.reps')).toBe('Exercise 2 (Quad sets): ');
		expect(builder.where('title')).toBe('');
	});

	it('puts each problem beside its own field, and under the exercise only what is no field’s', () => {
		const problems = [
			{ path: 'items.0.dosage.reps', message: 'Reps is above the highest allowed, 12.' },
			{ path: 'items.0.dosage.reps', message: 'Reps is a whole number.' },
			{ path: 'items.0.weekdays', message: '2 weekdays are ticked but days a week is 3.' },
			{
				path: 'items.0.weekdays.1',
				message: 'A weekday is a number from 1 (Monday) to 7 (Sunday).'
			},
			{
				path: 'items.0.progression.ceiling',
				message: 'The most it rises to is below where it starts.'
			},
			{ path: 'items.0.rangeGuides.1.until', message: 'Write a week or a date.' },
			{ path: 'items.0.rangeGuides', message: 'Keep to 4 range targets and limits an exercise.' },
			{ path: 'items.0', message: 'This exercise is no longer in your clinic.' },
			{ path: 'title', message: 'Give the programme a title.' }
		];
		const builder = new ProgrammeBuilderState(initial(), () => ({
			...inputs('draft'),
			result: { problems }
		}));
		expect(builder.problemsAt('items.0.dosage.reps')).toEqual([
			'Reps is above the highest allowed, 12.',
			'Reps is a whole number.'
		]);
		expect(builder.problemsAt('items.0.weekdays')).toEqual([
			'2 weekdays are ticked but days a week is 3.',
			'A weekday is a number from 1 (Monday) to 7 (Sunday).'
		]);
		expect(builder.problemsAt('items.0.rangeGuides.1.until')).toEqual(['Write a week or a date.']);
		expect(builder.problemsAt('items.1.dosage.reps')).toEqual([]);
		expect(builder.itemProblems(0).map((p) => p.message)).toEqual([
			'Keep to 4 range targets and limits an exercise.',
			'This exercise is no longer in your clinic.'
		]);
		expect(builder.itemProblems(1)).toEqual([]);
	});

	it('saves the draft, gives new rows their ids, and says why a save failed', async () => {
		const fetch = vi.fn(async () =>
			Response.json({ draft: { items: [{ id: 'item-a' }, { id: 'item-b' }] } })
		);
		vi.stubGlobal('fetch', fetch);
		const builder = builderState();
		builder.draft.title = 'Knee, weeks 1–4';
		await builder.saveNow();
		expect(fetch).toHaveBeenCalledOnce();
		const [url, init] = fetch.mock.calls[0] as unknown as [string, RequestInit];
		expect(url).toBe('/api/programmes/prog-1');
		expect(init.method).toBe('PUT');
		expect(JSON.parse(String(init.body)).title).toBe('Knee, weeks 1–4');
		expect(builder.saveState.kind).toBe('saved');
		expect(builder.draft.items.map((i) => i.id)).toEqual(['item-a', 'item-b']);

		fetch.mockImplementation(async () =>
			Response.json(
				{
					error: { status: 400, message: 'Give a title.' },
					problems: [{ path: 'title', message: 'Give a title.' }]
				},
				{ status: 400 }
			)
		);
		await builder.saveNow();
		expect(builder.saveState).toEqual({
			kind: 'failed',
			message: 'Give a title.',
			problems: [{ path: 'title', message: 'Give a title.' }]
		});
		expect(builder.problemsAt('title')).toEqual(['Give a title.']);

		fetch.mockImplementation(async () => {
			throw new TypeError('offline');
		});
		await builder.saveNow();
		expect(builder.saveState).toMatchObject({ kind: 'failed', problems: [] });
	});

	it('leaves an ended programme uneditable; only a published one changes on publishing', () => {
		const ended = builderState('ended');
		expect(ended.editable).toBe(false);
		expect(ended.published).toBe(false);
		expect(builderState('published').published).toBe(true);
	});
});
