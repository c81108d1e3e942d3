/**
 * The patient's offline queue of session logs, as plain logic: where entries are kept and how a
 * log is sent are handed in, so the rules are testable without a browser. A log is written to
 * the store before it is sent and removed only once the server has it, so closing the page,
 * losing the connection or a server error never loses one. Sending again is safe because the
 * server stores a log once per device-made clientId.
 */
import type { SessionLogInput } from './log';

export type EntryState = 'waiting' | 'refused';

export interface QueueEntry {
	log: SessionLogInput;
	/** 'waiting' is sent again later; 'refused' needs the patient (the server said no). */
	state: EntryState;
	attempts: number;
	/** Epoch ms of the next automatic attempt (0 = as soon as possible). */
	nextAttemptAt: number;
	/** Why the last attempt did not go through, in words for the patient. */
	problem?: string;
}

/** Where entries live (IndexedDB in the browser, a Map in tests). */
export interface QueueStore {
	read(): Promise<QueueEntry[]>;
	write(entries: QueueEntry[]): Promise<void>;
}

/** One attempt's outcome. */
export type SendResult =
	| { kind: 'sent' }
	/** Try again later: no connection, signed out, the server busy or failing. */
	| { kind: 'retry'; problem: string }
	/** The server will not take this log as it is (e.g. the exercise left the programme). */
	| { kind: 'refused'; problem: string };

export type Sender = (log: SessionLogInput) => Promise<SendResult>;

/** What one HTTP status means for a queued log. */
export function classifyStatus(status: number): SendResult['kind'] {
	if (status >= 200 && status < 300) return 'sent';
	// Signed out (401), a time-out (408), too many requests (429) or any server error: later.
	if (status === 401 || status === 403 || status === 408 || status === 429 || status >= 500) {
		return 'retry';
	}
	return 'refused';
}

const FIRST_DELAY_MS = 5_000;
const MAX_DELAY_MS = 5 * 60_000;

/** Milliseconds before attempt `attempts + 1`: 5 s, 10 s, 20 s … at most 5 minutes. */
export function retryDelay(attempts: number): number {
	return Math.min(MAX_DELAY_MS, FIRST_DELAY_MS * 2 ** Math.max(0, attempts - 1));
}

export interface FlushReport {
	sent: number;
	waiting: number;
	refused: number;
}

export type AddOutcome = 'sent' | 'saved' | 'refused';

/**
 * The queue. One flush runs at a time (a second call while one runs gets the same promise), and
 * every change goes through the store, so two tabs at worst send a log twice — which the server
 * stores once.
 */
export class SessionQueue {
	#store: QueueStore;
	#send: Sender;
	#now: () => number;
	#flushing: Promise<FlushReport> | null = null;
	#listeners = new Set<(entries: QueueEntry[]) => void>();

	constructor(store: QueueStore, send: Sender, now: () => number = Date.now) {
		this.#store = store;
		this.#send = send;
		this.#now = now;
	}

	/** Calls `listener` with the entries after every change; returns the unsubscribe. */
	subscribe(listener: (entries: QueueEntry[]) => void): () => void {
		this.#listeners.add(listener);
		return () => this.#listeners.delete(listener);
	}

	entries(): Promise<QueueEntry[]> {
		return this.#store.read();
	}

	async #write(entries: QueueEntry[]): Promise<void> {
		await this.#store.write(entries);
		for (const listener of this.#listeners) listener(entries);
	}

	async #update(clientId: string, change: (entry: QueueEntry) => QueueEntry | null) {
		const entries = await this.#store.read();
		const next: QueueEntry[] = [];
		for (const entry of entries) {
			if (entry.log.clientId !== clientId) next.push(entry);
			else {
				const changed = change(entry);
				if (changed) next.push(changed);
			}
		}
		await this.#write(next);
	}

	/**
	 * Keeps the log, then tries to send it once (when `online`): 'sent' when the server has it,
	 * 'saved' when it waits on this device, 'refused' when the server said no.
	 */
	async add(log: SessionLogInput, online = true): Promise<AddOutcome> {
		const entries = await this.#store.read();
		if (!entries.some((e) => e.log.clientId === log.clientId)) {
			await this.#write([...entries, { log, state: 'waiting', attempts: 0, nextAttemptAt: 0 }]);
		}
		if (!online) return 'saved';
		const result = await this.#attempt(log);
		return result.kind === 'sent' ? 'sent' : result.kind === 'retry' ? 'saved' : 'refused';
	}

	async #attempt(log: SessionLogInput): Promise<SendResult> {
		let result: SendResult;
		try {
			result = await this.#send(log);
		} catch {
			result = { kind: 'retry', problem: 'No connection.' };
		}
		await this.#update(log.clientId, (entry) => {
			if (result.kind === 'sent') return null;
			const attempts = entry.attempts + 1;
			return {
				...entry,
				attempts,
				state: result.kind === 'refused' ? 'refused' : 'waiting',
				problem: result.problem,
				nextAttemptAt: this.#now() + retryDelay(attempts)
			};
		});
		return result;
	}

	/**
	 * Sends every waiting entry that is due (all of them when `force`, e.g. the device just came
	 * back online), oldest first. Stops at the first 'retry': the rest would fail the same way.
	 */
	flush(force = false): Promise<FlushReport> {
		this.#flushing ??= this.#flushOnce(force).finally(() => {
			this.#flushing = null;
		});
		return this.#flushing;
	}

	async #flushOnce(force: boolean): Promise<FlushReport> {
		let sent = 0;
		const due = (await this.#store.read()).filter(
			(e) => e.state === 'waiting' && (force || e.nextAttemptAt <= this.#now())
		);
		for (const entry of due) {
			const result = await this.#attempt(entry.log);
			if (result.kind === 'sent') sent++;
			if (result.kind === 'retry') break;
		}
		const left = await this.#store.read();
		return {
			sent,
			waiting: left.filter((e) => e.state === 'waiting').length,
			refused: left.filter((e) => e.state === 'refused').length
		};
	}

	/** Puts a refused entry back in line (the patient pressed "Try again"). */
	async retry(clientId: string): Promise<void> {
		await this.#update(clientId, (entry) => ({ ...entry, state: 'waiting', nextAttemptAt: 0 }));
	}

	/** When the next automatic attempt is due, or null when nothing waits. */
	async nextAttemptAt(): Promise<number | null> {
		const waiting = (await this.#store.read()).filter((e) => e.state === 'waiting');
		return waiting.length ? Math.min(...waiting.map((e) => e.nextAttemptAt)) : null;
	}
}

/** A store in memory (tests, and the fallback when the browser offers no IndexedDB). */
export function memoryStore(initial: QueueEntry[] = []): QueueStore {
	let entries = structuredClone(initial);
	return {
		read: async () => structuredClone(entries),
		write: async (next) => {
			entries = structuredClone(next);
		}
	};
}
