/**
 * Undo and redo over whole values (the studio keeps its cues as an immutable array, so each
 * entry is one array, and unchanged cues are shared between entries).
 *
 * Typing makes one entry per pause rather than per key: commits with the same `group` that follow
 * each other within `groupMs` replace the newest entry. A drag shows its steps with `preview` and
 * becomes one entry when it ends.
 */
export interface HistoryOptions {
	/** Entries kept behind the present; the oldest go first. */
	limit?: number;
	/** Commits of one group this close together are one entry. */
	groupMs?: number;
	now?: () => number;
}

export class History<T> {
	present: T = $state.raw() as T;
	#past: T[] = $state.raw([]);
	#future: T[] = $state.raw([]);
	#group: { name: string; at: number } | null = null;
	#previewFrom: { value: T } | null = null;
	readonly #limit: number;
	readonly #groupMs: number;
	readonly #now: () => number;

	constructor(initial: T, options: HistoryOptions = {}) {
		this.present = initial;
		this.#limit = options.limit ?? 200;
		this.#groupMs = options.groupMs ?? 1500;
		this.#now = options.now ?? (() => Date.now());
	}

	get canUndo(): boolean {
		return this.#past.length > 0;
	}
	get canRedo(): boolean {
		return this.#future.length > 0;
	}
	/** How many steps back there are (for the button's label). */
	get depth(): number {
		return this.#past.length;
	}

	/** Makes `next` the present, as a new entry or (same group, soon after) in place of the last. */
	commit(next: T, group?: string): void {
		this.#settlePreview();
		const now = this.#now();
		const joins =
			group !== undefined &&
			this.#group?.name === group &&
			now - this.#group.at <= this.#groupMs &&
			this.#past.length > 0;
		if (!joins) this.#past = [...this.#past, this.present].slice(-this.#limit);
		this.#group = group === undefined ? null : { name: group, at: now };
		this.#future = [];
		this.present = next;
	}

	/** Shows `next` without making an entry yet (a drag in progress). */
	preview(next: T): void {
		if (!this.#previewFrom) this.#previewFrom = { value: this.present };
		this.present = next;
	}

	/** Ends a preview: one entry from where it began, or none if nothing changed. */
	endPreview(): void {
		const from = this.#previewFrom;
		if (!from) return;
		this.#previewFrom = null;
		if (from.value === this.present) return;
		const next = this.present;
		this.present = from.value;
		this.commit(next);
	}

	/** Drops a preview and goes back to where it began (Escape during a drag). */
	cancelPreview(): void {
		if (!this.#previewFrom) return;
		this.present = this.#previewFrom.value;
		this.#previewFrom = null;
	}

	undo(): boolean {
		this.#settlePreview();
		if (this.#past.length === 0) return false;
		this.#future = [this.present, ...this.#future];
		this.present = this.#past[this.#past.length - 1];
		this.#past = this.#past.slice(0, -1);
		this.#group = null;
		return true;
	}

	redo(): boolean {
		this.#settlePreview();
		if (this.#future.length === 0) return false;
		this.#past = [...this.#past, this.present];
		this.present = this.#future[0];
		this.#future = this.#future.slice(1);
		this.#group = null;
		return true;
	}

	/** Starts again from `value` with nothing to undo (a track loaded afresh). */
	reset(value: T): void {
		this.#previewFrom = null;
		this.#group = null;
		this.#past = [];
		this.#future = [];
		this.present = value;
	}

	/** Ends the group, so the next commit of it makes a new entry (the field lost focus). */
	closeGroup(): void {
		this.#group = null;
	}

	#settlePreview() {
		if (this.#previewFrom) this.endPreview();
	}
}
