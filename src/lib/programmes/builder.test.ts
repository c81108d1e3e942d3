import { describe, expect, it } from 'vitest';
import {
	applyIntent,
	draftFromForm,
	draftToInput,
	itemFromExercise,
	parseIntent,
	type ProgrammeDraft
} from './builder';
import { builderExercise } from './builder-fixtures';
import { programmeSaveSchema } from './schema';

const exercise = builderExercise();

const draft = (): ProgrammeDraft => ({
	title: 'Knee',
	startDate: '2026-11-17',
	endDate: '',
	note: '',
	items: [
		{ ...itemFromExercise(exercise, 'a'), id: '22222222-2222-4222-8222-222222222222' },
		itemFromExercise(exercise, 'b')
	]
});

describe('builder moves', () => {
	it('reads the intent of each button', () => {
		expect(parseIntent('up:2')).toEqual({ kind: 'move', index: 2, delta: -1 });
		expect(parseIntent('down:0')).toEqual({ kind: 'move', index: 0, delta: 1 });
		expect(parseIntent('remove:1')).toEqual({ kind: 'remove', index: 1 });
		expect(parseIntent(`add:${exercise.id}`)).toEqual({ kind: 'add', exerciseId: exercise.id });
		expect(parseIntent('publish')).toEqual({ kind: 'publish' });
		expect(parseIntent('')).toEqual({ kind: 'save' });
		expect(parseIntent('up:x')).toEqual({ kind: 'save' });
	});

	it('moves, removes and adds rows; an exercise not offered adds nothing', () => {
		expect(applyIntent(draft(), parseIntent('down:0'), []).items.map((i) => i.key)).toEqual([
			'b',
			'a'
		]);
		expect(applyIntent(draft(), parseIntent('remove:0'), []).items.map((i) => i.key)).toEqual([
			'b'
		]);
		const added = applyIntent(draft(), parseIntent(`add:${exercise.id}`), [exercise]);
		expect(added.items).toHaveLength(3);
		expect(added.items[2]).toMatchObject({
			id: '',
			exerciseId: exercise.id,
			dosage: { reps: '8' }
		});
		expect(applyIntent(draft(), parseIntent('add:nope'), [exercise]).items).toHaveLength(2);
	});

	it('reads back the rows a form posted, and the schema accepts them', () => {
		const form = new FormData();
		form.set('title', 'Knee');
		form.set('startDate', '2026-11-17');
		form.set('itemCount', '1');
		form.set('item-0-id', '');
		form.set('item-0-exerciseId', exercise.id);
		for (const [k, v] of Object.entries(exercise.defaultDosage)) form.set(`item-0-${k}`, String(v));
		form.set('item-0-reps', '10');
		form.set('item-0-progressionKind', 'reps');
		form.set('item-0-progressionAddPerWeek', '2');
		form.set('item-0-progressionCeiling', '15');
		form.set('intent', 'up:0');
		const { draft: posted, intent } = draftFromForm(form);
		expect(intent).toEqual({ kind: 'move', index: 0, delta: -1 });
		const parsed = programmeSaveSchema.parse(draftToInput(posted));
		expect(parsed).toEqual({
			title: 'Knee',
			startDate: '2026-11-17',
			endDate: null,
			note: '',
			items: [
				{
					exerciseId: exercise.id,
					dosage: {
						sets: 1,
						reps: 10,
						holdSeconds: 0,
						restSeconds: 30,
						sessionsPerDay: 3,
						daysPerWeek: 7
					},
					weekdays: null,
					rangeGuides: [],
					progression: { kind: 'reps', addPerWeek: 2, ceiling: 15 }
				}
			]
		});
	});

	it('reads ticked weekdays and range guides from a form, and refuses what does not add up', () => {
		const form = new FormData();
		form.set('title', 'Shoulder');
		form.set('startDate', '2026-11-17');
		form.set('itemCount', '1');
		form.set('item-0-exerciseId', exercise.id);
		for (const [k, v] of Object.entries(exercise.defaultDosage)) form.set(`item-0-${k}`, String(v));
		form.set('item-0-daysPerWeek', '2');
		form.append('item-0-weekday', '5');
		form.append('item-0-weekday', '2');
		form.set('item-0-guideCount', '2');
		form.set('item-0-guide-0-motion', 'shoulder-external-rotation');
		form.set('item-0-guide-0-kind', 'limit');
		form.set('item-0-guide-0-degrees', '20');
		form.set('item-0-guide-0-until', '6');
		form.set('item-0-guide-1-motion', '');
		const { draft: posted } = draftFromForm(form);
		// A blank row stays at the end for the next guide.
		expect(posted.items[0].rangeGuides).toHaveLength(2);
		const parsed = programmeSaveSchema.parse(draftToInput(posted));
		expect(parsed.items[0]).toMatchObject({
			weekdays: [2, 5],
			rangeGuides: [
				{
					motion: 'shoulder-external-rotation',
					kind: 'limit',
					degrees: 20,
					untilWeek: 6,
					untilDate: null
				}
			]
		});

		posted.items[0].weekdays = [1, 3, 5];
		expect(programmeSaveSchema.safeParse(draftToInput(posted)).error?.issues[0]).toMatchObject({
			path: ['items', 0, 'weekdays'],
			message:
				'3 weekdays are ticked but days a week is 2. Tick 2 weekdays, change days a week, or untick all for any 2 days.'
		});
		posted.items[0].weekdays = [];
		posted.items[0].rangeGuides[0].degrees = '';
		expect(programmeSaveSchema.safeParse(draftToInput(posted)).error?.issues[0]).toMatchObject({
			path: ['items', 0, 'rangeGuides', 0, 'degrees'],
			message: 'Give the degrees, e.g. 90.'
		});
		posted.items[0].rangeGuides[0].degrees = '0x14';
		expect(programmeSaveSchema.safeParse(draftToInput(posted)).error?.issues[0].path).toEqual([
			'items',
			0,
			'rangeGuides',
			0,
			'degrees'
		]);
		posted.items[0].rangeGuides[0].degrees = '20';
		posted.items[0].rangeGuides[0].until = 'later';
		expect(programmeSaveSchema.safeParse(draftToInput(posted)).error?.issues[0].path).toEqual([
			'items',
			0,
			'rangeGuides',
			0,
			'until'
		]);
	});

	it('keeps the id of a saved row and refuses the same row twice', () => {
		const twice = draft();
		twice.items[1].id = twice.items[0].id;
		const result = programmeSaveSchema.safeParse(draftToInput(twice));
		expect(result.success).toBe(false);
		expect(result.error?.issues[0].message).toBe('An exercise row appears twice.');
		expect(draftToInput(draft()).items[0]).toHaveProperty(
			'id',
			'22222222-2222-4222-8222-222222222222'
		);
		expect(draftToInput(draft()).items[1]).not.toHaveProperty('id');
	});
});
