/**
 * The caption studio's working state: the cues (with undo), the selection, the playhead, and
 * the live checks. Every editing command goes through the pure operations in
 * $lib/captions/edit; this class only decides which cue they apply to and records the result.
 */
import {
	checkCues,
	profiles,
	type Finding,
	type FindingKind,
	type FixKind
} from '$lib/captions/checks';
import * as edit from '$lib/captions/edit';
import { fixAllOfKind } from '$lib/captions/fixes';
import type { Edge, Edit, Snap } from '$lib/captions/edit';
import type { Cue } from '$lib/captions/types';
import { History } from './history.svelte';
import { withKeys, type KeyedCue } from '$lib/captions/editor/rows';

export type ProfileId = keyof typeof profiles;

export interface StudioOptions {
	cues: readonly Cue[];
	duration: number;
	frameRate: number | null;
	profileId: ProfileId;
}

const LOCKED = 'Choose first whether to restore the changes kept on this device.';

export class Studio {
	readonly history = new History<KeyedCue[]>([]);
	readonly duration: number;
	/** Seconds in one frame of the recording. */
	readonly frame: number;
	readonly frameRateKnown: boolean;

	selectedKey = $state<string | null>(null);
	/** The edge that nudges move. */
	edge = $state<Edge>('start');
	/** The playhead, in seconds. */
	time = $state(0);
	profileId = $state<ProfileId>('bbc');
	/** What the last command did when it did not do exactly what was asked, for a status line. */
	note = $state('');
	/** While true, nothing may change the cues (a kept draft waits for an answer). */
	locked = $state(false);
	dragging = $state(false);

	/** Called after every change that should be kept: the autosave listens here. */
	onEdit: (cues: KeyedCue[]) => void = () => {};

	#dragBase: KeyedCue[] | null = null;

	constructor(options: StudioOptions) {
		this.history.reset(withKeys(options.cues));
		this.duration = options.duration;
		this.frame = edit.frameSeconds(options.frameRate);
		this.frameRateKnown = !!options.frameRate && options.frameRate > 0;
		this.profileId = options.profileId;
	}

	get cues(): KeyedCue[] {
		return this.history.present;
	}
	readonly profile = $derived(profiles[this.profileId]);
	readonly selectedIndex = $derived(
		this.selectedKey === null
			? -1
			: this.history.present.findIndex((c) => c.key === this.selectedKey)
	);
	readonly selected = $derived(this.selectedIndex >= 0 ? this.cues[this.selectedIndex] : null);
	/** The cue on screen at the playhead. */
	readonly activeIndex = $derived(edit.cueAt(this.history.present, this.time));
	readonly findings = $derived(checkCues(this.history.present, this.profile));
	/** The findings of each cue, by its position. */
	readonly findingsByIndex = $derived.by(() => {
		const byIndex: Finding[][] = this.history.present.map(() => []);
		for (const f of this.findings) byIndex[f.index]?.push(f);
		return byIndex;
	});

	#options() {
		return { duration: this.duration };
	}

	/** Records an edit: a new undo step (or part of `group`'s), the cue it acted on selected. */
	apply(result: Edit, group?: string): boolean {
		if (this.locked) {
			this.note = LOCKED;
			return false;
		}
		this.note = result.note ?? '';
		if (!result.changed) {
			if (result.index >= 0 && this.cues[result.index]) {
				this.selectedKey = this.cues[result.index].key;
			}
			return false;
		}
		const cues = withKeys(result.cues);
		this.history.commit(cues, group);
		if (result.index >= 0 && cues[result.index]) this.selectedKey = cues[result.index].key;
		this.onEdit(cues);
		return true;
	}

	indexOf(key: string): number {
		return this.cues.findIndex((c) => c.key === key);
	}

	select(key: string | null) {
		this.selectedKey = key;
	}

	/** Selects the cue before or after the selected one (or the one at the playhead); returns it. */
	step(direction: -1 | 1): KeyedCue | null {
		const cues = this.cues;
		if (cues.length === 0) return null;
		let from = this.selectedIndex;
		if (from < 0) {
			const at = edit.insertionIndex(cues, this.time);
			from = direction === 1 ? at - 1 : at;
		}
		const to = Math.min(Math.max(from + direction, 0), cues.length - 1);
		this.selectedKey = cues[to].key;
		return cues[to];
	}

	markStart() {
		this.edge = 'start';
		return this.apply(
			edit.markStart(this.cues, this.time, { ...this.#options(), selected: this.selectedIndex })
		);
	}

	markEnd() {
		this.edge = 'end';
		return this.apply(
			edit.markEnd(this.cues, this.time, { ...this.#options(), selected: this.selectedIndex })
		);
	}

	/** A new cue at the playhead; returns its key, so the page can put the focus in its words. */
	newCue(): string | null {
		return this.apply(edit.newCueAt(this.cues, this.time, this.#options()))
			? this.selectedKey
			: null;
	}

	/** Splits the cue at the playhead (the selected one when the playhead is inside it). */
	split() {
		const sel = this.selectedIndex;
		const inside = sel >= 0 && this.cues[sel].start < this.time && this.time < this.cues[sel].end;
		const index = inside ? sel : this.activeIndex;
		return this.apply(edit.splitAt(this.cues, index, this.time));
	}

	merge() {
		return this.apply(edit.mergeWithNext(this.cues, this.selectedIndex));
	}

	nudge(delta: number) {
		return this.apply(
			edit.nudgeEdge(this.cues, this.selectedIndex, this.edge, delta, this.#options())
		);
	}

	switchEdge() {
		this.edge = this.edge === 'start' ? 'end' : 'start';
	}

	remove(key = this.selectedKey) {
		if (key === null) return this.apply(edit.removeCue(this.cues, -1));
		return this.apply(edit.removeCue(this.cues, this.indexOf(key)));
	}

	setText(key: string, text: string) {
		return this.apply(edit.setText(this.cues, this.indexOf(key), text), `text:${key}`);
	}

	setTimes(key: string, start: number, end: number) {
		return this.apply(edit.setTimes(this.cues, this.indexOf(key), start, end, this.#options()));
	}

	fix(index: number, kind: FixKind) {
		return this.apply(edit.applyFix(this.cues, index, kind, this.profile, this.#options()));
	}

	/**
	 * Fixes every finding of `kind` as one undo step. Returns how many were fixed and, by row key,
	 * why each of the rest could not be; null when the cues may not change now.
	 */
	fixAll(kind: FindingKind): { fixed: number; unfixed: Record<string, string> } | null {
		if (this.locked) {
			this.note = LOCKED;
			return null;
		}
		const result = fixAllOfKind(this.cues, kind, this.profile, this.#options());
		this.apply({ cues: result.cues, index: -1, changed: result.fixed > 0 });
		const cues = this.cues;
		return {
			fixed: result.fixed,
			unfixed: Object.fromEntries(result.unfixed.map((u) => [cues[u.index].key, u.why]))
		};
	}

	/** Replaces every cue at once (a restored draft, or the other version of a conflict). */
	replaceAll(cues: readonly Cue[]) {
		const wasLocked = this.locked;
		this.locked = false;
		const done = this.apply({ cues: [...cues], index: -1, changed: true });
		this.locked = wasLocked;
		if (this.selectedKey !== null && this.selectedIndex < 0) this.selectedKey = null;
		return done;
	}

	undo() {
		if (this.locked) return void (this.note = LOCKED);
		if (this.history.undo()) this.#afterTimeTravel('Undone.');
	}

	redo() {
		if (this.locked) return void (this.note = LOCKED);
		if (this.history.redo()) this.#afterTimeTravel('Redone.');
	}

	#afterTimeTravel(note: string) {
		this.note = note;
		if (this.selectedKey !== null && this.selectedIndex < 0) this.selectedKey = null;
		this.onEdit(this.cues);
	}

	/** Snapping for dragging cue `index`: other cues' edges and the playhead, within `tolerance` seconds. */
	snapFor(index: number, tolerance: number): Snap {
		return {
			targets: edit.snapTargets(this.#dragBase ?? this.cues, index, [this.time]),
			tolerance
		};
	}

	beginDrag(key: string): boolean {
		if (this.locked) {
			this.note = LOCKED;
			return false;
		}
		this.#dragBase = this.cues;
		this.selectedKey = key;
		this.dragging = true;
		return true;
	}

	/** Shows a drag's step: the cue moved to start at `start`, or one edge at `time`. */
	dragTo(key: string, what: 'move' | Edge, time: number, tolerancePx: number, pxPerSecond: number) {
		const base = this.#dragBase;
		if (!base) return;
		const index = base.findIndex((c) => c.key === key);
		if (index < 0) return;
		const snap = this.snapFor(index, tolerancePx / pxPerSecond);
		const options = { ...this.#options(), snap };
		const result =
			what === 'move'
				? edit.moveCue(base, index, time, options)
				: edit.resizeCue(base, index, what, time, options);
		if (what !== 'move') this.edge = what;
		this.history.preview(result.changed ? withKeys(result.cues) : base);
	}

	endDrag() {
		if (!this.#dragBase) return;
		const changed = this.cues !== this.#dragBase;
		this.#dragBase = null;
		this.dragging = false;
		this.history.endPreview();
		if (changed) this.onEdit(this.cues);
	}

	cancelDrag() {
		this.#dragBase = null;
		this.dragging = false;
		this.history.cancelPreview();
	}
}
