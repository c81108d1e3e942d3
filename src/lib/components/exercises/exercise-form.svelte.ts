/**
 * The exercise form's state: the draft as typed, its key points (keyed, so moving one keeps what
 * is typed in it), the live figures at the starting dosage, and which field each of the server's
 * problems belongs to. The form and its section components read and change it; their markup holds
 * no logic. For the browser: nothing here brings the exercise schema (see lib/exercises/form-text).
 */
import { tick } from 'svelte';
import {
	DEFAULT_SECONDS_PER_REP,
	DOSAGE_FIELD_LABELS,
	DOSAGE_FIELDS,
	dosageSchema,
	progressionSchema,
	sessionMinutes,
	weeklyVolume,
	type DosageField,
	type RepPace
} from '$lib/dosage';
import type { ExerciseDraft } from '$lib/exercises/form';
import { formatCueTime, progressionFromDraft, type CueDraft } from '$lib/exercises/form-text';
import type { SegmentChoice } from '$lib/exercises/segment-choice';
import { moveBy } from '$lib/forms/reorder';
import { progressionFieldsOf, progressionLabel } from './progression-labels';

export interface Problem {
	path: string;
	message: string;
}

/** A key point with a key of its own, so a row keeps its inputs when the list is reordered. */
export type KeyedCue = CueDraft & { key: number };

/** What the form is given by its page; read again whenever it changes. */
export interface ExerciseFormInputs {
	segments: SegmentChoice[];
	/** The server's refusal: every problem, with the path of what it is about. */
	problems: Problem[];
}

/** The id of the input (or group) a problem's path is about; a problem's link goes there. */
export function fieldIdFor(path: string): string {
	const [head, part, detail] = path.split('.');
	switch (head) {
		case 'segmentId':
			return 'segment-choices';
		case 'coachingCues':
			if (part === undefined) return 'key-points';
			return detail === 'atSeconds' ? `cue-at-${part}` : `cue-text-${part}`;
		case 'precautionTags':
			return 'other-tags';
		case 'dosage':
			return `dosage-${part}`;
		case 'bounds':
			return `${detail === 'max' ? 'max' : 'min'}-${part}`;
		case 'progression':
			return `progression-${part ?? 'kind'}`;
		default:
			return head;
	}
}

type Fields = Record<string, { id: string; label: string }>;

/**
 * Every field and group that can have a problem, in the form's order, with the label the list of
 * problems names it by (a Field may show a shorter one: "Time" in a key point's row).
 */
function formFields(cueCount: number, progressionKind: string): Fields {
	const list: [string, string][] = [
		['segment-choices', 'Demonstration'],
		['title', 'Title'],
		['description', 'Description'],
		['bodyRegion', 'Body region'],
		['side', 'Side'],
		['position', 'Position'],
		['movementType', 'Movement type'],
		['equipment', 'Equipment'],
		['phase', 'Phase'],
		['key-points', 'Key points'],
		...Array.from({ length: cueCount }, (_, i): [string, string][] => [
			[`cue-text-${i}`, `Key point ${i + 1}`],
			[`cue-at-${i}`, `Key point ${i + 1}, time`]
		]).flat(),
		['safetyNotes', 'Safety notes'],
		['other-tags', 'Other tags'],
		...DOSAGE_FIELDS.flatMap((f): [string, string][] => [
			[`dosage-${f}`, DOSAGE_FIELD_LABELS[f]],
			[`min-${f}`, `${DOSAGE_FIELD_LABELS[f]}, lowest allowed`],
			[`max-${f}`, `${DOSAGE_FIELD_LABELS[f]}, highest allowed`]
		]),
		...progressionFieldsOf(progressionKind).map((f): [string, string] => [
			`progression-${f}`,
			progressionLabel(f, progressionKind)
		]),
		['secondsPerRep', 'Seconds per rep (optional)'],
		['status', 'Status']
	];
	return Object.fromEntries(list.map(([id, label]) => [id, { id, label }]));
}

/**
 * Create while the form component initialises; call `start()` once it is mounted (the page then
 * runs scripts, and the buttons that need them appear).
 */
export class ExerciseFormState {
	draft: ExerciseDraft = $state() as ExerciseDraft;
	cues: KeyedCue[] = $state([]);
	/** True once the page runs scripts. */
	scripted = $state(false);
	/** A save is on its way. */
	saving = $state(false);
	/** The demonstration's player, for "Now" on a key point. */
	video: HTMLVideoElement | null = $state(null);
	/** The reps the demonstration shows, to work out the seconds per rep. */
	repsShown = $state('');

	readonly #inputs: () => ExerciseFormInputs;
	#nextKey = 0;

	constructor(initial: ExerciseDraft, inputs: () => ExerciseFormInputs) {
		// The form keeps its own copy; the page makes a new form when the server answers.
		this.draft = structuredClone(initial);
		this.cues = this.#keyed(initial.cues);
		this.#inputs = inputs;
	}

	get segments(): SegmentChoice[] {
		return this.#inputs().segments;
	}
	get problems(): Problem[] {
		return this.#inputs().problems;
	}

	#keyed(cues: CueDraft[]): KeyedCue[] {
		return cues.map((c) => ({ key: this.#nextKey++, text: c.text, at: c.at }));
	}

	/**
	 * The page runs scripts: "Add a key point" now adds rows, so the server's two blank rows go,
	 * and what was typed into them before the script started becomes key points, not lost with
	 * them. `valueOf` reads an input of the page by its id.
	 */
	start(valueOf: (id: string) => string) {
		const typedInBlankRows = [0, 1]
			.map((extra) => {
				const row = this.cues.length + extra;
				return { text: valueOf(`cue-text-${row}`), at: valueOf(`cue-at-${row}`) };
			})
			.filter((cue) => cue.text.trim() !== '' || cue.at.trim() !== '');
		this.cues.push(...this.#keyed(typedInBlankRows));
		this.scripted = true;
	}

	/** The key point rows drawn: without scripts, two blank ones are the only way to add one. */
	readonly cueRows: KeyedCue[] = $derived(
		this.scripted
			? this.cues
			: [...this.cues, { key: -1, text: '', at: '' }, { key: -2, text: '', at: '' }]
	);

	// --- problems -------------------------------------------------------------------------------
	readonly fields = $derived(formFields(this.cueRows.length, this.draft.progression.kind));

	/**
	 * Each field's problems by its id, in the server's order, each said once (two pieces of
	 * equipment too long are one problem of the field); a problem of no field under `_errors`.
	 */
	readonly errors: Record<string, string[]> = $derived.by(() => {
		const byId: Record<string, string[]> = {};
		for (const { path, message } of this.problems) {
			const id = fieldIdFor(path);
			const list = (byId[id in this.fields ? id : '_errors'] ??= []);
			if (!list.includes(message)) list.push(message);
		}
		return byId;
	});

	/** Every problem of the field (or group) with this id. */
	errorsOf(id: string): string[] {
		return this.errors[id] ?? [];
	}

	/** Whether a row of the dosage table has a problem (its inputs then line up at its top). */
	dosageRowHasProblems(field: DosageField): boolean {
		return ['dosage', 'min', 'max'].some((part) => this.errorsOf(`${part}-${field}`).length > 0);
	}

	/** A Field's id, label and problems, to spread on it. */
	field(id: string): { id: string; label: string; errors: string[] } {
		return { id, label: this.fields[id]?.label ?? id, errors: this.errorsOf(id) };
	}

	// --- live figures ---------------------------------------------------------------------------
	readonly selectedSegment = $derived(
		this.segments.find((s) => s.id === this.draft.segmentId) ?? null
	);
	readonly dosage = $derived(dosageSchema.safeParse(this.draft.dosage));
	readonly progression = $derived(
		progressionSchema.safeParse(progressionFromDraft(this.draft.progression))
	);
	/** How long a rep takes for the minutes a session takes, and what that rests on, in words. */
	readonly pace: { pace: RepPace; basis: string } = $derived.by(() => {
		const secondsPerRep = Number(this.draft.secondsPerRep);
		if (this.draft.secondsPerRep.trim() && secondsPerRep > 0)
			return { pace: { secondsPerRep }, basis: `${secondsPerRep} s per rep, as set below` };
		const length = this.selectedSegment?.durationSeconds;
		if (length && this.dosage.success && this.dosage.data.reps > 0)
			return {
				pace: { segmentSeconds: length, repsShown: this.dosage.data.reps },
				basis: `the demonstration’s ${length.toFixed(0)} s over the starting ${this.dosage.data.reps} reps`
			};
		return {
			pace: { secondsPerRep: DEFAULT_SECONDS_PER_REP },
			basis: `${DEFAULT_SECONDS_PER_REP} s per rep (common practice for a slow, controlled rep)`
		};
	});
	/** The week at the starting dosage, when every dosage field reads as a number. */
	readonly weekly = $derived(
		this.dosage.success
			? {
					volume: weeklyVolume(this.dosage.data),
					minutes: sessionMinutes(this.dosage.data, this.pace.pace)
				}
			: null
	);

	// --- key points -----------------------------------------------------------------------------
	/** Moves a key point one place; focus stays with it (the same button, or its pair at an end). */
	async moveCue(index: number, delta: -1 | 1) {
		this.cues = moveBy(this.cues, index, delta);
		await tick();
		const to = index + delta;
		const [which, other] = delta < 0 ? ['up', 'down'] : ['down', 'up'];
		const same = document.getElementById(`cue-${which}-${to}`) as HTMLButtonElement | null;
		(same && !same.disabled ? same : document.getElementById(`cue-${other}-${to}`))?.focus();
	}

	/** Adds an empty key point last; focus goes to its words. */
	async addCue() {
		this.cues = [...this.cues, ...this.#keyed([{ text: '', at: '' }])];
		await tick();
		document.getElementById(`cue-text-${this.cues.length - 1}`)?.focus();
	}

	/** Removes a key point; focus goes to the next one's words, or to "Add a key point". */
	async removeCue(index: number) {
		this.cues = this.cues.filter((_, i) => i !== index);
		await tick();
		const next = Math.min(index, this.cues.length - 1);
		document.getElementById(next >= 0 ? `cue-text-${next}` : 'add-cue')?.focus();
	}

	/** The key point's time from where the demonstration is. */
	cueAtVideoTime(index: number) {
		if (this.video) this.cues[index].at = formatCueTime(this.video.currentTime);
	}

	/** Seconds per rep from the demonstration's length over the reps it shows. */
	workOutPace() {
		const reps = Number(this.repsShown);
		const length = this.selectedSegment?.durationSeconds;
		if (!length || !Number.isFinite(reps) || reps < 1) return;
		this.draft.secondsPerRep = String(Math.round((length / reps) * 10) / 10);
	}
}
