/**
 * The programme builder's state as typed (numbers kept as text until saved, so a refused save
 * loses nothing), and the moves it makes: add, remove, reorder. Shared by the page (live, in the
 * browser) and the form action (the same moves without JavaScript).
 */
import { DOSAGE_FIELDS, type Dosage, type DosageField, type Progression } from '$lib/dosage';
import type { BuilderField, ExerciseFields } from '$lib/exercises/columns';
import {
	progressionDraft,
	progressionFromDraft,
	type ProgressionDraft
} from '$lib/exercises/form-text';
import type { Weekday } from '$lib/clinical/calendar';
import { MAX_RANGE_GUIDES, type RangeGuide } from '$lib/clinical/range-guides';
import { untilText } from '$lib/clinical/until';
import { moveBy } from '$lib/forms/reorder';

/**
 * An exercise as the builder offers it: the stored fields BUILDER_FIELDS names
 * (lib/exercises/columns), and what the server works out for it.
 */
export type BuilderExercise = Pick<ExerciseFields, BuilderField> & {
	id: string;
	segmentSeconds: number | null;
	defaultDosage: Dosage;
	defaultProgression: Progression;
	posterUrl: string | null;
	hasSegment: boolean;
};

export interface ItemDraft {
	/** Stable within the page, for keyed lists and focus. */
	key: string;
	/** The saved item's id; empty for a row not saved yet. */
	id: string;
	exerciseId: string;
	dosage: Record<DosageField, string>;
	/** The weekdays ticked; empty for any `daysPerWeek` days of each week. */
	weekdays: Weekday[];
	/** Range targets and limits as typed; the last row is always a blank one to fill. */
	rangeGuides: RangeGuideDraft[];
	progression: ProgressionDraft;
	logCount: number;
}

/** One range target or limit as typed (degrees and end kept as text until saved). */
export interface RangeGuideDraft {
	/** Empty in the blank row; a row with no motion is not saved. */
	motion: string;
	kind: string;
	degrees: string;
	/** "6" (until week 6 after the operation), a date, or empty for no end. */
	until: string;
}

export const BLANK_GUIDE: RangeGuideDraft = { motion: '', kind: 'target', degrees: '', until: '' };

/** The guides as typed with one blank row after them (none when the item holds the most). */
export function withBlankGuide(guides: readonly RangeGuideDraft[]): RangeGuideDraft[] {
	const filled = guides.filter((g) => g.motion !== '');
	return filled.length < MAX_RANGE_GUIDES ? [...filled, { ...BLANK_GUIDE }] : filled;
}

/** A saved guide as a row of text fields. */
export function guideDraft(guide: RangeGuide): RangeGuideDraft {
	return {
		motion: guide.motion,
		kind: guide.kind,
		degrees: String(guide.degrees),
		until: untilText(guide)
	};
}

export interface ProgrammeDraft {
	title: string;
	startDate: string;
	endDate: string;
	note: string;
	items: ItemDraft[];
}

export function dosageText(d: Dosage): Record<DosageField, string> {
	return Object.fromEntries(DOSAGE_FIELDS.map((f) => [f, String(d[f])])) as Record<
		DosageField,
		string
	>;
}

let counter = 0;
/** A key for a new row, unique within the page. */
export function newKey(): string {
	counter += 1;
	return `new-${counter}`;
}

/** A row for an exercise, starting at the exercise's default dosage and progression. */
export function itemFromExercise(exercise: BuilderExercise, key = newKey()): ItemDraft {
	return {
		key,
		id: '',
		exerciseId: exercise.id,
		dosage: dosageText(exercise.defaultDosage),
		weekdays: [],
		rangeGuides: withBlankGuide([]),
		progression: progressionDraft(exercise.defaultProgression),
		logCount: 0
	};
}

/** A saved item as a row. */
export function itemFromSaved(item: {
	id: string;
	exerciseId: string;
	dosage: Dosage;
	weekdays: Weekday[] | null;
	rangeGuides: RangeGuide[];
	progression: Progression;
	logCount: number;
}): ItemDraft {
	return {
		key: item.id,
		id: item.id,
		exerciseId: item.exerciseId,
		dosage: dosageText(item.dosage),
		weekdays: item.weekdays ?? [],
		rangeGuides: withBlankGuide(item.rangeGuides.map(guideDraft)),
		progression: progressionDraft(item.progression),
		logCount: item.logCount
	};
}

/** The draft in the shape programmeSaveSchema checks. */
export function draftToInput(draft: ProgrammeDraft) {
	return {
		title: draft.title,
		startDate: draft.startDate,
		endDate: draft.endDate,
		note: draft.note,
		items: draft.items.map((item) => ({
			...(item.id ? { id: item.id } : {}),
			exerciseId: item.exerciseId,
			dosage: item.dosage,
			weekdays: item.weekdays,
			rangeGuides: item.rangeGuides.filter((g) => g.motion !== ''),
			progression: progressionFromDraft(item.progression)
		}))
	};
}

/** What a button of the form asks for, without JavaScript. */
export type Intent =
	| { kind: 'save' }
	| { kind: 'publish' }
	| { kind: 'add'; exerciseId: string }
	| { kind: 'remove'; index: number }
	| { kind: 'move'; index: number; delta: -1 | 1 };

export function parseIntent(value: string): Intent {
	const [kind, arg] = value.split(':');
	const index = Number(arg);
	if (kind === 'publish') return { kind: 'publish' };
	if (kind === 'add' && arg) return { kind: 'add', exerciseId: arg };
	if (kind === 'remove' && Number.isInteger(index)) return { kind: 'remove', index };
	if ((kind === 'up' || kind === 'down') && Number.isInteger(index))
		return { kind: 'move', index, delta: kind === 'up' ? -1 : 1 };
	return { kind: 'save' };
}

/** The draft after a move; adding an exercise that is not offered changes nothing. */
export function applyIntent(
	draft: ProgrammeDraft,
	intent: Intent,
	catalogue: BuilderExercise[]
): ProgrammeDraft {
	switch (intent.kind) {
		case 'add': {
			const exercise = catalogue.find((e) => e.id === intent.exerciseId);
			return exercise ? { ...draft, items: [...draft.items, itemFromExercise(exercise)] } : draft;
		}
		case 'remove':
			return { ...draft, items: draft.items.filter((_, i) => i !== intent.index) };
		case 'move':
			return { ...draft, items: moveBy(draft.items, intent.index, intent.delta) };
		default:
			return draft;
	}
}

/** The form name of each progression field within a row (`item-<index>-<name>`). */
export const PROGRESSION_FORM_NAMES: Record<keyof ProgressionDraft, string> = {
	kind: 'progressionKind',
	addPerWeek: 'progressionAddPerWeek',
	ceiling: 'progressionCeiling',
	addAfterWeeks: 'progressionAddAfterWeeks',
	add: 'progressionAdd'
};

/** Form fields of one row are named `item-<index>-<field>`; this reads them all back. */
export function draftFromForm(form: FormData): { draft: ProgrammeDraft; intent: Intent } {
	const get = (name: string) => {
		const v = form.get(name);
		return typeof v === 'string' ? v : '';
	};
	const count = Math.min(Math.max(0, Number(get('itemCount')) || 0), 100);
	const items: ItemDraft[] = [];
	for (let i = 0; i < count; i++) {
		const p = (field: string) => get(`item-${i}-${field}`);
		const id = p('id');
		items.push({
			key: id || `row-${i}`,
			id,
			exerciseId: p('exerciseId'),
			dosage: Object.fromEntries(DOSAGE_FIELDS.map((f) => [f, p(f)])) as Record<
				DosageField,
				string
			>,
			weekdays: form
				.getAll(`item-${i}-weekday`)
				.map(Number)
				.filter((d): d is Weekday => Number.isInteger(d) && d >= 1 && d <= 7),
			rangeGuides: withBlankGuide(
				Array.from(
					{ length: Math.min(MAX_RANGE_GUIDES + 1, Number(p('guideCount')) || 0) },
					(_, j) => ({
						motion: p(`guide-${j}-motion`),
						kind: p(`guide-${j}-kind`) || 'target',
						degrees: p(`guide-${j}-degrees`),
						until: p(`guide-${j}-until`)
					})
				)
			),
			progression: {
				kind: p(PROGRESSION_FORM_NAMES.kind) || 'none',
				addPerWeek: p(PROGRESSION_FORM_NAMES.addPerWeek),
				ceiling: p(PROGRESSION_FORM_NAMES.ceiling),
				addAfterWeeks: p(PROGRESSION_FORM_NAMES.addAfterWeeks),
				add: p(PROGRESSION_FORM_NAMES.add)
			},
			logCount: 0
		});
	}
	return {
		draft: {
			title: get('title'),
			startDate: get('startDate'),
			endDate: get('endDate'),
			note: get('note'),
			items
		},
		intent: parseIntent(get('intent'))
	};
}
