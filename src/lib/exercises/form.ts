/**
 * An exercise form as typed: every field kept as text, so a refused save shows exactly what the
 * clinician entered. `draftFromForm` reads a submitted form, `draftFromExercise` fills the form
 * from a stored exercise, and `parseDraft` turns a draft into checked input. For the server (it
 * brings the schema, and with it drizzle-zod); the browser's helpers are in ./form-text.
 */
import { resolveTag, EXERCISE_TAGS, type ExerciseTag } from '$lib/clinical/precautions';
import { DOSAGE_FIELDS, suggestedStartingDosage, type Dosage, type DosageField } from '$lib/dosage';
import {
	EXERCISE_COLUMNS,
	EXERCISE_FIELDS,
	type ExerciseField,
	type ExerciseFields
} from './columns';
import {
	formatCueTime,
	parseCueTime,
	progressionDraft,
	progressionFromDraft,
	splitList,
	type CueDraft,
	type ProgressionDraft
} from './form-text';
import { exerciseInputSchema, type ExerciseInput } from './schema';

/**
 * The stored fields with a draft part of their own (below), not one input holding the field's
 * text: key points (words and a time each), precaution tags (ticked ids and free text), the
 * starting dosage, its range and the progression.
 */
type OwnPart = 'coachingCues' | 'precautionTags' | DosageField | 'dosageBounds' | 'progression';
const OWN_PARTS: readonly string[] = [
	'coachingCues',
	'precautionTags',
	...DOSAGE_FIELDS,
	'dosageBounds',
	'progression'
] satisfies readonly OwnPart[];

/**
 * Every other stored field is one input, named as the field is, whose text the draft keeps: a
 * list (equipment) as its items comma-separated, a number or an empty value as typed.
 */
export type TextField = Exclude<ExerciseField, OwnPart>;
export const TEXT_FIELDS = EXERCISE_FIELDS.filter((f): f is TextField => !OWN_PARTS.includes(f));

export type ExerciseDraft = Record<TextField, string> & {
	cues: CueDraft[];
	/** Vocabulary tags ticked, by id. */
	tags: string[];
	/** Free-text tags, comma-separated. */
	otherTags: string;
	dosage: Record<DosageField, string>;
	bounds: Record<DosageField, { min: string; max: string }>;
	progression: ProgressionDraft;
};

function emptyBounds(): ExerciseDraft['bounds'] {
	return Object.fromEntries(
		DOSAGE_FIELDS.map((f) => [f, { min: '', max: '' }])
	) as ExerciseDraft['bounds'];
}

function dosageDraft(d: Dosage): ExerciseDraft['dosage'] {
	return Object.fromEntries(DOSAGE_FIELDS.map((f) => [f, String(d[f])])) as ExerciseDraft['dosage'];
}

/** A stored value as its input's text: a list comma-separated, nothing as empty. */
function asText(value: unknown): string {
	if (value === null || value === undefined) return '';
	if (Array.isArray(value)) return value.join(', ');
	return typeof value === 'string' || typeof value === 'number' ? String(value) : '';
}

/** An input's text as its column stores it (the schema then checks it and words any refusal). */
function fromText(field: TextField, text: string): unknown {
	const column = EXERCISE_COLUMNS[field];
	if (column.dataType === 'json') return splitList(text);
	if (column.dataType === 'number') {
		if (text.trim() === '') return column.notNull ? Number.NaN : null;
		return Number(text);
	}
	if (!column.notNull) return text.trim() === '' ? null : text.trim();
	return text;
}

function textFields(value: (field: TextField) => string): Record<TextField, string> {
	return Object.fromEntries(TEXT_FIELDS.map((f) => [f, value(f)])) as Record<TextField, string>;
}

/** The form for a new exercise: each column's default, common-practice starting dosage, draft state. */
export function newExerciseDraft(segmentId = ''): ExerciseDraft {
	return {
		...textFields((f) => asText(EXERCISE_COLUMNS[f].default)),
		// The affected side is the usual answer; the column's default suits rows made elsewhere.
		side: 'either',
		segmentId,
		cues: [],
		tags: [],
		otherTags: '',
		dosage: dosageDraft(suggestedStartingDosage('movement')),
		bounds: emptyBounds(),
		progression: progressionDraft({ kind: 'none' })
	};
}

/** The form filled from a stored exercise. */
export function draftFromExercise(e: ExerciseFields): ExerciseDraft {
	const tags: string[] = [];
	const free: string[] = [];
	for (const tag of e.precautionTags) {
		const resolved = resolveTag(tag);
		if (resolved.kind === 'known') tags.push(resolved.id);
		else free.push(resolved.text);
	}
	const bounds = emptyBounds();
	for (const field of DOSAGE_FIELDS) {
		const range = e.dosageBounds?.[field];
		bounds[field] = { min: asText(range?.min), max: asText(range?.max) };
	}
	return {
		...textFields((f) => asText(e[f])),
		cues: e.coachingCues.map((c) => ({
			text: c.text,
			at: c.atSeconds === undefined ? '' : formatCueTime(c.atSeconds)
		})),
		tags,
		otherTags: free.join(', '),
		dosage: dosageDraft(e),
		bounds,
		progression: progressionDraft(e.progression)
	};
}

const field = (form: FormData, name: string) => {
	const value = form.get(name);
	return typeof value === 'string' ? value : '';
};

/** A submitted exercise form as a draft (field names as the exercise form writes them). */
export function draftFromForm(form: FormData): ExerciseDraft {
	const cueTexts = form.getAll('cueText').map(String);
	const cueTimes = form.getAll('cueAt').map(String);
	const bounds = emptyBounds();
	const dosage = {} as ExerciseDraft['dosage'];
	for (const f of DOSAGE_FIELDS) {
		dosage[f] = field(form, `dosage.${f}`);
		bounds[f] = { min: field(form, `min.${f}`), max: field(form, `max.${f}`) };
	}
	const known = new Set(Object.keys(EXERCISE_TAGS));
	return {
		...textFields((f) => field(form, f)),
		cues: cueTexts
			.map((text, i) => ({ text, at: cueTimes[i] ?? '' }))
			.filter((c) => c.text.trim() !== '' || c.at.trim() !== ''),
		tags: form
			.getAll('tag')
			.map(String)
			.filter((t) => known.has(t)),
		otherTags: field(form, 'otherTags'),
		dosage,
		bounds,
		progression: {
			kind: field(form, 'progression.kind') || 'none',
			addPerWeek: field(form, 'progression.addPerWeek'),
			ceiling: field(form, 'progression.ceiling'),
			addAfterWeeks: field(form, 'progression.addAfterWeeks'),
			add: field(form, 'progression.add')
		}
	};
}

export type ParsedDraft =
	| { ok: true; input: ExerciseInput }
	| { ok: false; problems: { path: string; message: string }[] };

/** Checks a draft; on refusal, every problem with the field it belongs to. */
export function parseDraft(draft: ExerciseDraft): ParsedDraft {
	const bounds: Record<string, { min?: string; max?: string }> = {};
	for (const f of DOSAGE_FIELDS) {
		const { min, max } = draft.bounds[f];
		if (min.trim() === '' && max.trim() === '') continue;
		bounds[f] = {
			...(min.trim() ? { min } : {}),
			...(max.trim() ? { max } : {})
		};
	}
	const tags = [...draft.tags.map((id) => id as ExerciseTag), ...splitList(draft.otherTags)];
	const result = exerciseInputSchema.safeParse({
		...Object.fromEntries(TEXT_FIELDS.map((f) => [f, fromText(f, draft[f])])),
		coachingCues: draft.cues.map((c) => {
			const at = parseCueTime(c.at);
			return at === undefined ? { text: c.text } : { text: c.text, atSeconds: at };
		}),
		precautionTags: [...new Set(tags)],
		dosage: draft.dosage,
		bounds,
		progression: progressionFromDraft(draft.progression)
	});
	if (result.success) return { ok: true, input: result.data };
	return {
		ok: false,
		problems: result.error.issues.map((issue) => ({
			path: issue.path.join('.'),
			message: issue.message
		}))
	};
}
