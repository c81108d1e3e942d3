/**
 * Keeps the studio's cues safe: every edit goes at once to a draft on this device, and to the
 * server a few seconds after the edits stop (or at once on request). A save that fails keeps
 * the draft and tries again; a save refused because someone else saved meanwhile (409) waits
 * for the clinician to choose between the two versions. Nothing is ever overwritten silently.
 */
import type { Cue } from '$lib/captions/types';
import type {
	ConflictResponse,
	SavedResponse
} from '../../../routes/api/tracks/[id=id]/versions/+server';
import { dropDrafts, findDrafts, keepDraft, type Draft } from './drafts';
import { plainCues, sameCues } from '$lib/captions/editor/rows';

export type SaveState = 'saved' | 'waiting' | 'saving' | 'failed' | 'conflict';

export interface AutosaveOptions {
	trackId: string;
	/** The server version the page opened with, and its cues. */
	version: number;
	cues: readonly Cue[];
	/** Quiet time after the last edit before saving. */
	delayMs?: number;
	/** Wait before trying a failed save again. */
	retryMs?: number;
}

export type Conflict = ConflictResponse['conflict'];

const NOTE = 'Edited in the caption studio';

export class Autosave {
	state = $state<SaveState>('saved');
	/** The server version the cues on screen started from. */
	version = $state(0);
	/** Why the last save did not happen, in a sentence. */
	problem = $state<string | null>(null);
	conflict = $state.raw<Conflict | null>(null);
	/** False when this device refused to keep a copy (private browsing can). */
	deviceCopy = $state(true);
	/** When the next try of a failed save is due. */
	retryAt = $state<number | null>(null);

	readonly #trackId: string;
	readonly #delayMs: number;
	readonly #retryMs: number;
	#latest: readonly Cue[];
	/** The cues of `version` as the server holds them; null when not known (a restored draft). */
	#saved: readonly Cue[] | null;
	#timer: ReturnType<typeof setTimeout> | null = null;
	#inFlight = false;
	#again = false;
	#writes: Promise<void> = Promise.resolve();

	constructor(options: AutosaveOptions) {
		this.#trackId = options.trackId;
		this.version = options.version;
		this.#latest = options.cues;
		this.#saved = options.cues;
		this.#delayMs = options.delayMs ?? 3000;
		this.#retryMs = options.retryMs ?? 15000;
	}

	/** The state in words, for the status line. */
	get words(): string {
		const kept = this.deviceCopy ? ' — kept on this device' : '';
		switch (this.state) {
			case 'saved':
				return this.version > 0 ? `Saved as version ${this.version}` : 'Nothing saved yet';
			case 'waiting':
				return this.deviceCopy ? 'Kept on this device; saving soon' : 'Not saved yet; saving soon';
			case 'saving':
				return 'Saving…';
			case 'failed':
				return `Not saved${kept}`;
			case 'conflict':
				return `Not saved — version ${this.conflict?.current.version ?? '?'} was saved elsewhere${kept}`;
		}
	}

	get unsaved(): boolean {
		return this.state !== 'saved';
	}

	/** Takes the cues after an edit: kept on this device at once, saved after a pause. */
	changed(cues: readonly Cue[]) {
		this.#latest = cues;
		if (this.#saved && sameCues(cues, this.#saved)) {
			this.#clearTimer();
			this.#drop();
			if (this.state !== 'conflict' && !this.#inFlight) {
				this.state = 'saved';
				this.problem = null;
			}
			return;
		}
		this.#keep(cues);
		if (this.state === 'conflict') return;
		if (!this.#inFlight) this.state = 'waiting';
		this.#schedule(this.#delayMs);
	}

	/** Saves now (Ctrl+S, the button, coming back online). */
	saveNow() {
		this.#clearTimer();
		void this.#save();
	}

	/** Keep mine: saves the cues on screen on top of the newer version. */
	keepMine() {
		const conflict = this.conflict;
		if (!conflict) return;
		this.version = conflict.current.version;
		this.#saved = conflict.current.cues;
		this.conflict = null;
		this.state = 'waiting';
		this.#moveDraft(conflict.baseVersion);
		this.saveNow();
	}

	/** Take theirs: returns the newer version's cues for the editor to show; nothing is saved. */
	takeTheirs(): Cue[] | null {
		const conflict = this.conflict;
		if (!conflict) return null;
		this.version = conflict.current.version;
		this.#saved = conflict.current.cues;
		this.conflict = null;
		this.state = 'saved';
		this.problem = null;
		this.#drop();
		return conflict.current.cues;
	}

	/**
	 * A draft of this track kept on this device that holds changes the server does not have,
	 * or null. Drafts that match the server are removed.
	 */
	async findUnsaved(): Promise<Draft | null> {
		let drafts: Draft[];
		try {
			drafts = await findDrafts(this.#trackId);
		} catch {
			this.deviceCopy = false;
			return null;
		}
		const newest = drafts[0];
		if (!newest) return null;
		// The same cues as the server's current version: saved after all (say, as the page closed).
		if (this.#saved && sameCues(newest.cues, this.#saved)) {
			this.#drop();
			return null;
		}
		return newest;
	}

	/** Starts from a kept draft: its cues are unsaved edits on top of the version it started from. */
	restore(draft: Draft) {
		this.version = draft.baseVersion;
		this.#saved = null;
		this.#latest = draft.cues;
		this.state = 'waiting';
		this.#schedule(this.#delayMs);
	}

	discardDrafts() {
		this.#drop();
	}

	/** Stops timers (the page is closing); the draft stays. */
	stop() {
		this.#clearTimer();
	}

	#schedule(ms: number) {
		this.#clearTimer();
		this.#timer = setTimeout(() => {
			this.#timer = null;
			void this.#save();
		}, ms);
	}

	#clearTimer() {
		if (this.#timer) clearTimeout(this.#timer);
		this.#timer = null;
		this.retryAt = null;
	}

	async #save(): Promise<void> {
		if (this.state === 'conflict') return;
		if (this.#inFlight) {
			this.#again = true;
			return;
		}
		const cues = this.#latest;
		if (this.#saved && sameCues(cues, this.#saved)) {
			this.state = 'saved';
			return;
		}
		const base = this.version;
		this.#inFlight = true;
		this.state = 'saving';
		try {
			const response = await fetch(`/api/tracks/${this.#trackId}/versions`, {
				method: 'POST',
				headers: { 'Content-Type': 'application/json', Accept: 'application/json' },
				body: JSON.stringify({ baseVersion: base, cues: plainCues(cues), note: NOTE })
			});
			if (response.status === 201) {
				const { version } = (await response.json()) as SavedResponse;
				this.version = version;
				this.#saved = cues;
				this.problem = null;
				if (this.#latest === cues) {
					this.state = 'saved';
					this.#drop();
				} else {
					// Edits made while saving: they now start from the new version.
					this.state = 'waiting';
					this.#moveDraft(base);
					this.#schedule(this.#delayMs);
				}
			} else if (response.status === 409) {
				const body = (await response.json()) as ConflictResponse;
				this.conflict = body.conflict;
				this.state = 'conflict';
				this.problem = body.error.message;
			} else {
				const body = (await response.json().catch(() => null)) as {
					error?: { message?: string };
				} | null;
				const message = body?.error?.message ?? `The server answered ${response.status}.`;
				this.#fail(message, response.status >= 500 || response.status === 429);
			}
		} catch {
			this.#fail('The connection to Kinelume dropped.', true);
		} finally {
			this.#inFlight = false;
			if (this.#again) {
				this.#again = false;
				if (this.state !== 'conflict' && this.state !== 'saved') this.#schedule(0);
			}
		}
	}

	#fail(message: string, retry: boolean) {
		this.state = 'failed';
		this.problem = message;
		if (retry) {
			this.#schedule(this.#retryMs);
			this.retryAt = Date.now() + this.#retryMs;
		}
	}

	#keep(cues: readonly Cue[]) {
		const draft: Draft = {
			trackId: this.#trackId,
			baseVersion: this.version,
			cues: plainCues(cues),
			updatedAt: Date.now()
		};
		this.#writes = this.#writes.then(
			() =>
				keepDraft(draft).then(
					() => void (this.deviceCopy = true),
					() => void (this.deviceCopy = false)
				),
			() => undefined
		);
	}

	/** Re-keeps the latest cues under the current version and drops the draft from `from`. */
	#moveDraft(from: number) {
		this.#keep(this.#latest);
		const trackId = this.#trackId;
		this.#writes = this.#writes.then(() => dropDrafts(trackId, from).catch(() => undefined));
	}

	#drop() {
		const trackId = this.#trackId;
		this.#writes = this.#writes.then(() => dropDrafts(trackId).catch(() => undefined));
	}

	/** Resolves once every draft write so far has finished (for tests and closing the page). */
	settled(): Promise<void> {
		return this.#writes;
	}
}
