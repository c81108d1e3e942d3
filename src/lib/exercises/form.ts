/**
 * An exercise form as typed: every field kept as text, so a refused save shows exactly what the
 * clinician entered. `draftFromForm` reads a submitted form, `draftFromExercise` fills the form
 * from a stored exercise, and `parseDraft` turns a draft into checked input.
 */
import { resolveTag, EXERCISE_TAGS, type ExerciseTag } from '$lib/clinical/precautions';
import {
	DOSAGE_FIELDS,
	suggestedStartingDosage,
	type Dosage,
	type DosageBounds,
	type DosageField,
	type Progression
} from '$lib/dosage';
import { exerciseInputSchema, type ExerciseInput } from './schema';
import type { ExerciseSide, ExerciseStatus, MovementType, Position } from './vocabulary';

export interface CueDraft {
	text: string;
	/** "m:ss", "ss" or empty. */
	at: string;
}

export interface ProgressionDraft {
	kind: string;
	addPerWeek: string;
	ceiling: string;
	addAfterWeeks: string;
	add: string;
}

export interface ExerciseDraft {
	title: string;
	description: string;
	bodyRegion: string;
	side: string;
	position: string;
	movementType: string;
	/** Comma-separated. */
	equipment: string;
	phase: string;
	cues: CueDraft[];
	safetyNotes: string;
	/** Vocabulary tags ticked, by id. */
	tags: string[];
	/** Free-text tags, comma-separated. */
	otherTags: string;
	dosage: Record<DosageField, string>;
	bounds: Record<DosageField, { min: string; max: string }>;
	progression: ProgressionDraft;
	secondsPerRep: string;
	segmentId: string;
	status: string;
}

/** The fields of a stored exercise a draft is made from. */
export interface ExerciseFields extends Dosage {
	title: string;
	description: string;
	bodyRegion: string;
	side: ExerciseSide;
	position: Position;
	movementType: MovementType;
	equipment: string[];
	phase: number;
	coachingCues: { text: string; atSeconds?: number }[];
	safetyNotes: string;
	precautionTags: string[];
	dosageBounds: DosageBounds | null;
	progression: Progression;
	secondsPerRep: number | null;
	segmentId: string | null;
	status: ExerciseStatus;
}

const str = (n: number | undefined | null) => (n === undefined || n === null ? '' : String(n));

/** Seconds as "m:ss" (with tenths when there are any), e.g. 72 → "1:12", 4.5 → "0:04.5". */
export function formatCueTime(seconds: number): string {
	const tenths = Math.round(seconds * 10);
	const minutes = Math.floor(tenths / 600);
	const rest = (tenths - minutes * 600) / 10;
	const whole = Math.floor(rest);
	const fraction = Math.round((rest - whole) * 10);
	return `${minutes}:${String(whole).padStart(2, '0')}${fraction ? `.${fraction}` : ''}`;
}

/** "1:12", "72", "0:04.5" → seconds; "" → undefined; anything else → NaN (refused with a message). */
export function parseCueTime(text: string): number | undefined {
	const t = text.trim();
	if (t === '') return undefined;
	const m = /^(?:(\d{1,3}):)?(\d{1,4}(?:\.\d+)?)$/.exec(t);
	if (!m) return Number.NaN;
	const minutes = m[1] === undefined ? 0 : Number(m[1]);
	const seconds = Number(m[2]);
	if (m[1] !== undefined && seconds >= 60) return Number.NaN;
	return minutes * 60 + seconds;
}

/** "Chair, towel,, step" → ["Chair", "towel", "step"], without repeats (ignoring case). */
export function splitList(text: string): string[] {
	const seen = new Set<string>();
	const out: string[] = [];
	for (const part of text.split(/[,\n]/)) {
		const item = part.trim().replace(/\s+/g, ' ');
		if (!item || seen.has(item.toLowerCase())) continue;
		seen.add(item.toLowerCase());
		out.push(item);
	}
	return out;
}

function emptyBounds(): ExerciseDraft['bounds'] {
	return Object.fromEntries(
		DOSAGE_FIELDS.map((f) => [f, { min: '', max: '' }])
	) as ExerciseDraft['bounds'];
}

function dosageDraft(d: Dosage): ExerciseDraft['dosage'] {
	return Object.fromEntries(DOSAGE_FIELDS.map((f) => [f, String(d[f])])) as ExerciseDraft['dosage'];
}

/** A progression as form text. */
export function progressionDraft(p: Progression): ProgressionDraft {
	return {
		kind: p.kind,
		addPerWeek: p.kind === 'reps' ? str(p.addPerWeek) : p.kind === 'hold' ? str(p.addPerWeek) : '',
		ceiling: p.kind === 'none' ? '' : str(p.ceiling),
		addAfterWeeks: p.kind === 'sets' ? str(p.addAfterWeeks) : '',
		add: p.kind === 'sets' ? str(p.add) : ''
	};
}

/** Form text of a progression as the shape progressionSchema checks (only the kind's own numbers). */
export function progressionFromDraft(p: ProgressionDraft): Record<string, string> {
	switch (p.kind) {
		case 'reps':
		case 'hold':
			return { kind: p.kind, addPerWeek: p.addPerWeek, ceiling: p.ceiling };
		case 'sets':
			return { kind: p.kind, addAfterWeeks: p.addAfterWeeks, add: p.add, ceiling: p.ceiling };
		default:
			return { kind: p.kind };
	}
}

/** The form for a new exercise: common-practice starting dosage, draft state. */
export function newExerciseDraft(segmentId = ''): ExerciseDraft {
	return {
		title: '',
		description: '',
		bodyRegion: '',
		side: 'either',
		position: '',
		movementType: '',
		equipment: '',
		phase: '1',
		cues: [],
		safetyNotes: '',
		tags: [],
		otherTags: '',
		dosage: dosageDraft(suggestedStartingDosage('movement')),
		bounds: emptyBounds(),
		progression: progressionDraft({ kind: 'none' }),
		secondsPerRep: '',
		segmentId,
		status: 'draft'
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
		bounds[field] = { min: str(range?.min), max: str(range?.max) };
	}
	return {
		title: e.title,
		description: e.description,
		bodyRegion: e.bodyRegion,
		side: e.side,
		position: e.position,
		movementType: e.movementType,
		equipment: e.equipment.join(', '),
		phase: String(e.phase),
		cues: e.coachingCues.map((c) => ({
			text: c.text,
			at: c.atSeconds === undefined ? '' : formatCueTime(c.atSeconds)
		})),
		safetyNotes: e.safetyNotes,
		tags,
		otherTags: free.join(', '),
		dosage: dosageDraft(e),
		bounds,
		progression: progressionDraft(e.progression),
		secondsPerRep: str(e.secondsPerRep),
		segmentId: e.segmentId ?? '',
		status: e.status
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
		title: field(form, 'title'),
		description: field(form, 'description'),
		bodyRegion: field(form, 'bodyRegion'),
		side: field(form, 'side'),
		position: field(form, 'position'),
		movementType: field(form, 'movementType'),
		equipment: field(form, 'equipment'),
		phase: field(form, 'phase'),
		cues: cueTexts
			.map((text, i) => ({ text, at: cueTimes[i] ?? '' }))
			.filter((c) => c.text.trim() !== '' || c.at.trim() !== ''),
		safetyNotes: field(form, 'safetyNotes'),
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
		},
		secondsPerRep: field(form, 'secondsPerRep'),
		segmentId: field(form, 'segmentId'),
		status: field(form, 'status')
	};
}

function optionalNumber(text: string): number | null {
	const t = text.trim();
	return t === '' ? null : Number(t);
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
		title: draft.title,
		description: draft.description,
		bodyRegion: draft.bodyRegion,
		side: draft.side,
		position: draft.position,
		movementType: draft.movementType,
		equipment: splitList(draft.equipment),
		phase: Number(draft.phase),
		coachingCues: draft.cues.map((c) => {
			const at = parseCueTime(c.at);
			return at === undefined ? { text: c.text } : { text: c.text, atSeconds: at };
		}),
		safetyNotes: draft.safetyNotes,
		precautionTags: [...new Set(tags)],
		dosage: draft.dosage,
		bounds,
		progression: progressionFromDraft(draft.progression),
		secondsPerRep: optionalNumber(draft.secondsPerRep),
		segmentId: draft.segmentId.trim() === '' ? null : draft.segmentId.trim(),
		status: draft.status
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
