/**
 * The offline queue wired to the browser: entries in IndexedDB (localStorage when the browser
 * has none), sent with fetch to POST /api/sessions, again whenever the device comes back online,
 * when a page opens, and on a back-off timer. One queue per signed-in patient on this device.
 */
import { createStore, get, set } from 'idb-keyval';
import type { SessionLogInput } from '$lib/sessions/log';
import {
	classifyStatus,
	SessionQueue,
	type AddOutcome,
	type QueueEntry,
	type QueueStore,
	type SendResult
} from '$lib/sessions/queue';

function indexedDbStore(key: string): QueueStore {
	const store = createStore('kinelume', 'session-logs');
	return {
		read: async () => (await get<QueueEntry[]>(key, store)) ?? [],
		write: (entries) => set(key, entries, store)
	};
}

function localStorageStore(key: string): QueueStore {
	return {
		read: async () => JSON.parse(localStorage.getItem(key) ?? '[]') as QueueEntry[],
		write: async (entries) => localStorage.setItem(key, JSON.stringify(entries))
	};
}

async function send(log: SessionLogInput): Promise<SendResult> {
	const response = await fetch('/api/sessions', {
		method: 'POST',
		headers: { 'Content-Type': 'application/json', Accept: 'application/json' },
		body: JSON.stringify(log)
	});
	const kind = classifyStatus(response.status);
	if (kind === 'sent') return { kind };
	const body = (await response.json().catch(() => null)) as {
		error?: { message?: string };
	} | null;
	const message = body?.error?.message;
	if (kind === 'refused') return { kind, problem: message ?? 'The server did not accept it.' };
	if (response.status === 401) return { kind, problem: 'You are signed out. Sign in to send it.' };
	return { kind, problem: 'The server could not take it just now.' };
}

export class BrowserSessionQueue {
	entries = $state<QueueEntry[]>([]);
	online = $state(true);
	/** Logs that waited on this device and were then sent (not those sent at once). */
	sentLater = $state(0);
	#queue: SessionQueue;
	#timer: ReturnType<typeof setTimeout> | undefined;
	#users = 0;
	#sentListeners: (() => void)[] = [];

	constructor(owner: string) {
		const key = `pending:${owner}`;
		const store = typeof indexedDB === 'undefined' ? localStorageStore(key) : indexedDbStore(key);
		this.#queue = new SessionQueue(store, send);
		this.#queue.subscribe((entries) => (this.entries = entries));
	}

	// Getters, not $derived: a queue outlives the component that first asked for it (Today, then
	// a replay page), and a derived made inside that component's effect dies with it, so later
	// readers would get a stale list and a derived_inert warning.
	get waiting(): QueueEntry[] {
		return this.entries.filter((e) => e.state === 'waiting');
	}
	get refused(): QueueEntry[] {
		return this.entries.filter((e) => e.state === 'refused');
	}

	#onOnline = () => {
		this.online = true;
		void this.flush(true);
	};
	#onOffline = () => {
		this.online = false;
	};

	/** Starts listening while a page uses the queue; returns the stop. Sends what waits at once. */
	start(): () => void {
		if (this.#users++ === 0) {
			this.online = navigator.onLine;
			window.addEventListener('online', this.#onOnline);
			window.addEventListener('offline', this.#onOffline);
			void this.#queue.entries().then((entries) => (this.entries = entries));
			void this.flush(true);
		}
		return () => {
			if (--this.#users > 0) return;
			window.removeEventListener('online', this.#onOnline);
			window.removeEventListener('offline', this.#onOffline);
			clearTimeout(this.#timer);
		};
	}

	/** Calls `listener` whenever a log reaches the server; returns the unsubscribe. */
	onSent(listener: () => void): () => void {
		this.#sentListeners.push(listener);
		return () => {
			this.#sentListeners = this.#sentListeners.filter((l) => l !== listener);
		};
	}

	#notifySent() {
		for (const listener of this.#sentListeners) listener();
	}

	async add(log: SessionLogInput): Promise<AddOutcome> {
		const outcome = await this.#queue.add(log, navigator.onLine);
		if (outcome === 'sent') this.#notifySent();
		await this.#schedule();
		return outcome;
	}

	async flush(force = false): Promise<void> {
		if (!navigator.onLine) {
			this.online = false;
			return;
		}
		const report = await this.#queue.flush(force);
		if (report.sent > 0) {
			this.sentLater += report.sent;
			this.#notifySent();
		}
		await this.#schedule();
	}

	/** Sends a refused log again (the patient asked to). */
	async retry(clientId: string): Promise<void> {
		await this.#queue.retry(clientId);
		await this.flush(true);
	}

	async #schedule() {
		clearTimeout(this.#timer);
		const next = await this.#queue.nextAttemptAt();
		if (next === null || this.#users === 0) return;
		this.#timer = setTimeout(() => void this.flush(), Math.max(1_000, next - Date.now()));
	}
}

const queues: Record<string, BrowserSessionQueue> = {};

/** The queue of the patient `owner` on this device (browser only). */
export function sessionQueue(owner: string): BrowserSessionQueue {
	queues[owner] ??= new BrowserSessionQueue(owner);
	return queues[owner];
}
