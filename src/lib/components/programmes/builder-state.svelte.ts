/**
 * The programme builder's state: the draft being edited, its live figures, the moves that reorder,
 * add and remove exercises, the exercise picker's filters, and saving. A draft saves by itself a
 * moment after each change; a published programme changes only when the patient is told (the
 * form's publish button), so it does not.
 */
import { tick } from 'svelte';
import { viewerInstant } from '$lib/components/viewer-time';
import { isLocalDate } from '$lib/clinical/calendar';
import { dosageSchema, type Dosage } from '$lib/dosage';
import { progressionDraft } from '$lib/exercises/form-text';
import { moveBy } from '$lib/forms/reorder';
import {
	dosageText,
	draftToInput,
	itemFromExercise,
	type BuilderExercise,
	type ItemDraft,
	type ProgrammeDraft
} from '$lib/programmes/builder';
import { programmeFigures, type FigurePatient, type ItemFigures } from '$lib/programmes/figures';
import { rangeGuideInput } from '$lib/programmes/schema';

export interface BuilderPatient extends FigurePatient {
	id: string;
	fullName: string;
	hasAccount: boolean;
	condition: string;
	today: string;
}

export interface BuilderProgramme {
	id: string;
	status: 'draft' | 'published' | 'ended';
}

export interface Problem {
	path: string;
	message: string;
}

/** The form action's answer. */
export interface BuilderResult {
	message?: string;
	problems?: Problem[];
	saved?: boolean;
	published?: boolean;
	changed?: boolean;
	ended?: number;
	moved?: boolean;
	endedNow?: boolean;
}

/** What the builder is given by its page; read again whenever it changes. */
export interface BuilderInputs {
	programme: BuilderProgramme;
	patient: BuilderPatient;
	catalogue: BuilderExercise[];
	result: BuilderResult | null;
}

export type SaveState =
	| { kind: 'idle' }
	| { kind: 'saving' }
	| { kind: 'saved'; at: number }
	| { kind: 'failed'; message: string; problems: Problem[] };

/** Quiet time after the last change before a draft saves. */
const SAVE_DELAY_MS = 1200;

/**
 * Create while the builder component initialises (or inside `$effect.root`): its effects mark the
 * page as scripted once it has rendered and run the auto-save for as long as the component lives.
 */
/** The paths of an exercise's own fields, whose problems are shown beside them. */
const ITEM_FIELD =
	/^items\.\d+\.(dosage\.\w+|progression\.\w+|weekdays(\.\d+)?|rangeGuides\.\d+\.(motion|degrees|until))$/;

export class ProgrammeBuilderState {
	draft: ProgrammeDraft = $state() as ProgrammeDraft;
	/** True once the page runs scripts (the buttons then act here instead of posting). */
	scripted = $state(false);
	/** A form post is on its way. */
	busy = $state(false);
	saveState: SaveState = $state({ kind: 'idle' });
	/** The last move, add or removal in words, for screen readers. */
	announcement = $state('');

	// The picker's filters.
	search = $state('');
	region = $state('');
	position = $state('');
	phase = $state('');

	readonly #inputs: () => BuilderInputs;
	#lastSaved: string;
	#timer: ReturnType<typeof setTimeout> | undefined;

	constructor(initial: ProgrammeDraft, inputs: () => BuilderInputs) {
		this.draft = structuredClone(initial);
		this.#lastSaved = JSON.stringify(draftToInput(initial));
		this.#inputs = inputs;

		// Runs once, after the first render: from then on the page has its scripts.
		$effect(() => {
			this.scripted = true;
		});

		$effect(() => {
			const body = this.serialised;
			if (!this.scripted || this.published || !this.editable || body === this.#lastSaved) return;
			clearTimeout(this.#timer);
			this.#timer = setTimeout(() => void this.saveNow(), SAVE_DELAY_MS);
			return () => clearTimeout(this.#timer);
		});
	}

	get programme(): BuilderProgramme {
		return this.#inputs().programme;
	}
	get patient(): BuilderPatient {
		return this.#inputs().patient;
	}
	get catalogue(): BuilderExercise[] {
		return this.#inputs().catalogue;
	}
	get result(): BuilderResult | null {
		return this.#inputs().result;
	}

	readonly editable = $derived(this.programme.status !== 'ended');
	readonly published = $derived(this.programme.status === 'published');
	// Maps and sets built afresh by $derived and never changed, so plain ones are enough.
	// eslint-disable-next-line svelte/prefer-svelte-reactivity
	readonly byId = $derived(new Map(this.catalogue.map((e) => [e.id, e])));
	readonly problems = $derived(
		this.saveState.kind === 'failed' ? this.saveState.problems : (this.result?.problems ?? [])
	);

	// --- live figures -------------------------------------------------------------------------
	readonly parsedDosages = $derived(
		this.draft.items.map((item) => {
			const d = dosageSchema.safeParse(item.dosage);
			return d.success ? d.data : null;
		})
	);
	readonly figures = $derived.by(() => {
		const patient = this.patient;
		const startDate = isLocalDate(this.draft.startDate) ? this.draft.startDate : patient.today;
		const valid: { index: number; exercise: BuilderExercise; dosage: Dosage }[] = [];
		this.draft.items.forEach((item, index) => {
			const exercise = this.byId.get(item.exerciseId);
			const dosage = this.parsedDosages[index];
			if (exercise && dosage) valid.push({ index, exercise, dosage });
		});
		const all = programmeFigures(
			patient,
			startDate,
			valid.map((v) => ({
				exercise: { ...v.exercise, defaultReps: v.exercise.defaultDosage.reps },
				dosage: v.dosage,
				// The guides typed so far that read as guides; the others show their own problems.
				rangeGuides: this.draft.items[v.index].rangeGuides
					.filter((g) => g.motion !== '')
					.flatMap((g) => {
						const parsed = rangeGuideInput.safeParse(g);
						return parsed.success ? [parsed.data] : [];
					})
			})),
			patient.today
		);
		const perItem: (ItemFigures | null)[] = this.draft.items.map(() => null);
		valid.forEach((v, i) => (perItem[v.index] = all.items[i]));
		return { ...all, perItem, startDate };
	});
	readonly flagCount = $derived(
		this.figures.perItem.reduce(
			(n, f) =>
				n +
				(f
					? (f.phaseFlag ? 1 : 0) + f.conflicts.length + f.rangeClashes.length + f.bounds.length
					: 0),
			0
		)
	);

	// --- live saving (drafts only; a published programme changes when the patient is told) ----
	readonly serialised = $derived(JSON.stringify(draftToInput(this.draft)));

	async saveNow() {
		const body = this.serialised;
		const sentKeys = this.draft.items.map((i) => i.key);
		this.saveState = { kind: 'saving' };
		try {
			const response = await fetch(`/api/programmes/${this.programme.id}`, {
				method: 'PUT',
				headers: { 'content-type': 'application/json' },
				body
			});
			const answer = await response.json().catch(() => null);
			if (!response.ok) {
				this.saveState = {
					kind: 'failed',
					message: answer?.error?.message ?? `The server answered ${response.status}.`,
					problems: answer?.problems ?? []
				};
				return;
			}
			// New rows now have ids: give each to the row that was sent in that place.
			const savedItems: { id: string }[] = answer.draft.items;
			sentKeys.forEach((key, i) => {
				const row = this.draft.items.find((r) => r.key === key);
				if (row && !row.id && savedItems[i]) row.id = savedItems[i].id;
			});
			this.#lastSaved = JSON.stringify(draftToInput({ ...this.draft, items: this.draft.items }));
			if (this.#lastSaved !== this.serialised) this.#lastSaved = body;
			this.saveState = { kind: 'saved', at: Date.now() };
		} catch {
			this.saveState = {
				kind: 'failed',
				message: 'The connection dropped. Your changes are kept here; they save when it is back.',
				problems: []
			};
		}
	}

	/** The save state in a line under the notices; empty when the failure notice says it. */
	readonly saveLine = $derived(
		this.saveState.kind === 'saving'
			? 'Saving…'
			: this.saveState.kind === 'saved'
				? `All changes saved at ${viewerInstant(this.saveState.at, 'time')}.`
				: this.saveState.kind === 'idle'
					? 'Changes save by themselves as you work.'
					: ''
	);

	// --- moves ---------------------------------------------------------------------------------
	/** Moves an exercise one place; focus stays on the button pressed (or its pair at an end). */
	async move(index: number, delta: -1 | 1, event: Event) {
		event.preventDefault();
		const key = this.draft.items[index].key;
		this.draft.items = moveBy(this.draft.items, index, delta);
		await tick();
		const wanted = document.getElementById(`${delta < 0 ? 'up' : 'down'}-${key}`);
		const other = document.getElementById(`${delta < 0 ? 'down' : 'up'}-${key}`);
		(wanted && !(wanted as HTMLButtonElement).disabled ? wanted : other)?.focus();
		this.announce(
			`${this.titleOf(this.draft.items[index + delta])} moved to place ${index + delta + 1} of ${this.draft.items.length}.`
		);
	}

	/** Removes an exercise; focus goes to the next one's title, or to the picker's search. */
	async remove(index: number, event: Event) {
		event.preventDefault();
		const title = this.titleOf(this.draft.items[index]);
		this.draft.items = this.draft.items.filter((_, i) => i !== index);
		await tick();
		const next = this.draft.items[Math.min(index, this.draft.items.length - 1)];
		document.getElementById(next ? `title-${next.key}` : 'picker-search')?.focus();
		this.announce(`${title} removed.`);
	}

	/** Adds an exercise at its starting dosage, last; focus goes to its title. */
	async add(exercise: BuilderExercise, event: Event) {
		event.preventDefault();
		const item = itemFromExercise(exercise);
		this.draft.items = [...this.draft.items, item];
		await tick();
		document.getElementById(`title-${item.key}`)?.focus();
		this.announce(`${exercise.title} added as number ${this.draft.items.length}.`);
	}

	/** Puts an item's dosage and progression back to its exercise's starting ones. */
	resetDosage(item: ItemDraft) {
		const exercise = this.byId.get(item.exerciseId);
		if (!exercise) return;
		item.dosage = dosageText(exercise.defaultDosage);
		item.progression = progressionDraft(exercise.defaultProgression);
	}

	announce(text: string) {
		this.announcement = text;
	}

	titleOf(item: ItemDraft | undefined): string {
		return (item && this.byId.get(item.exerciseId)?.title) ?? 'Exercise';
	}

	/** "Exercise 2 (Heel slides): " for a problem of an item, so the list says which. */
	where(path: string): string {
		const m = /^items\.(\d+)\./.exec(path);
		if (!m) return '';
		const index = Number(m[1]);
		return `Exercise ${index + 1} (${this.titleOf(this.draft.items[index])}): `;
	}

	problemsUnder(prefix: string): Problem[] {
		return this.problems.filter((p) => p.path === prefix || p.path.startsWith(`${prefix}.`));
	}

	/** Every problem said of one field, for beside it (a weekday's own problems count for the days). */
	problemsAt(path: string): string[] {
		return this.problems
			.filter(
				(p) => p.path === path || (path.endsWith('.weekdays') && p.path.startsWith(`${path}.`))
			)
			.map((p) => p.message);
	}

	/** An exercise's problems that belong to none of its fields, said under the exercise. */
	itemProblems(index: number): Problem[] {
		return this.problemsUnder(`items.${index}`).filter((p) => !ITEM_FIELD.test(p.path));
	}

	// --- picker --------------------------------------------------------------------------------
	// eslint-disable-next-line svelte/prefer-svelte-reactivity
	readonly regions = $derived([...new Set(this.catalogue.map((e) => e.bodyRegion))].sort());
	// Exercises already in the programme are not offered again.
	// eslint-disable-next-line svelte/prefer-svelte-reactivity
	readonly added = $derived(new Set(this.draft.items.map((i) => i.exerciseId)));
	readonly offered = $derived(
		this.catalogue.filter((e) => {
			if (e.status !== 'ready' || this.added.has(e.id)) return false;
			const q = this.search.trim().toLowerCase();
			if (q && !`${e.title} ${e.bodyRegion} ${e.equipment.join(' ')}`.toLowerCase().includes(q))
				return false;
			if (this.region && e.bodyRegion !== this.region) return false;
			if (this.position && e.position !== this.position) return false;
			if (this.phase && String(e.phase) !== this.phase) return false;
			return true;
		})
	);
}
