/**
 * One file going from the browser straight to storage in parts: the server hands out short-lived
 * presigned part URLs, the browser PUTs slices of the File to them, and the server completes and
 * checks the upload.
 *
 * - **One part in flight** (5 MiB parts, S3's minimum): storage keeps only whole
 *   parts, so whatever an interruption cuts off is sent again; with one part at a time that is
 *   at most one part. The next parts' URLs are signed ahead (four per request), so the link idles
 *   only for storage's answer between two parts.
 * - **Waiting for the network**: when the browser says it is offline, or a request gets no answer
 *   and a small request to the app gets none either, the upload waits — no try is counted — and
 *   carries on by itself on the `online` event or when a check every 2–15 s gets an answer
 *   (`navigator.onLine` can say "online" on a network that reaches nothing).
 * - **Retries** with the network up: back-off from 1 s doubling to at most 30 s, no cap on tries.
 * - **Resume anywhere**: the server recognises the same file — this person, name, size and a
 *   SHA-256 of its first and last MiB — and answers the unfinished upload with the parts storage
 *   holds, so choosing the file again after a reload, or in another browser, sends only the rest.
 */
import {
	fileFingerprint,
	isRetryableStatus,
	keepSamples,
	measureSpeed,
	partRange,
	planParts,
	probeDelay,
	retryDelay,
	type SpeedSample
} from '$lib/recordings/upload-plan';

export type UploadPhase =
	| 'starting'
	| 'uploading'
	| 'waiting'
	| 'paused'
	| 'checking'
	| 'done'
	| 'refused'
	| 'failed';

interface Session {
	id: string;
	filename: string;
	sizeBytes: number;
	partSize: number;
	partCount: number;
	recordingId: string;
}

interface OpenedSession extends Session {
	parts: { partNumber: number; size: number }[];
	resumed: boolean;
}

interface ApiErrorBody {
	error?: { message?: string };
}

/** Part URLs asked for at once (each lives ten minutes; one is used per try). */
const URLS_PER_REQUEST = 4;
/** A signed URL older than this is not used (they expire after 10 minutes). */
const URL_FRESH_MS = 8 * 60_000;
/** A part that moves no byte for this long is given up and tried again. */
const STALL_MS = 30_000;
/** The small request that tells whether the app can be reached at all. */
const PROBE_URL = '/api/ping';
const PROBE_TIMEOUT_MS = 8000;
/** How often speed and "time left" are looked at again. */
const TICK_MS = 1000;

const OFFLINE_MESSAGE =
	'No connection. The upload is waiting and carries on by itself when the connection is back; keep this page open.';

/** A request that failed: who answered (or did not: status 0) and a sentence of our own. */
class HttpError extends Error {
	constructor(
		readonly status: number,
		readonly from: 'server' | 'storage',
		message: string
	) {
		super(message);
	}
}

async function api<T>(path: string, init?: RequestInit): Promise<T> {
	let response: Response;
	try {
		response = await fetch(path, {
			...init,
			cache: 'no-store',
			headers: { 'Content-Type': 'application/json', Accept: 'application/json' }
		});
	} catch {
		if (init?.signal?.aborted) throw init.signal.reason;
		// The browser's own words ("Failed to fetch", "NetworkError …") are never shown.
		throw new HttpError(0, 'server', 'Kinelume’s server could not be reached.');
	}
	if (!response.ok) {
		const body = (await response.json().catch(() => ({}))) as ApiErrorBody;
		throw new HttpError(
			response.status,
			'server',
			body.error?.message ?? `The server answered ${response.status}. Please try again.`
		);
	}
	if (response.status === 204) return undefined as T;
	try {
		return (await response.json()) as T;
	} catch {
		// A login page of a hotel's network, say: not an answer from Kinelume.
		throw new HttpError(0, 'server', 'Kinelume’s server could not be reached.');
	}
}

function wait(ms: number, signal: AbortSignal): Promise<void> {
	return new Promise((resolve, reject) => {
		if (signal.aborted) return reject(signal.reason);
		const done = () => {
			clearTimeout(timer);
			signal.removeEventListener('abort', stop);
		};
		const timer = setTimeout(() => {
			done();
			resolve();
		}, ms);
		const stop = () => {
			done();
			reject(signal.reason);
		};
		signal.addEventListener('abort', stop, { once: true });
	});
}

/** Resolves after `ms`, or sooner when the browser says it is online again. */
function onlineOr(ms: number, signal: AbortSignal): Promise<void> {
	return new Promise((resolve, reject) => {
		if (signal.aborted) return reject(signal.reason);
		const finish = (error?: unknown) => {
			clearTimeout(timer);
			window.removeEventListener('online', online);
			signal.removeEventListener('abort', stop);
			if (error === undefined) resolve();
			else reject(error);
		};
		const online = () => finish();
		const stop = () => finish(signal.reason ?? new Error('stopped'));
		const timer = setTimeout(() => finish(), ms);
		window.addEventListener('online', online);
		signal.addEventListener('abort', stop, { once: true });
	});
}

/** Whether the app answers at all (any status): the network is up. */
async function reachable(signal: AbortSignal): Promise<boolean> {
	if (navigator.onLine === false) return false;
	const controller = new AbortController();
	const stop = () => controller.abort();
	const timer = setTimeout(stop, PROBE_TIMEOUT_MS);
	signal.addEventListener('abort', stop, { once: true });
	try {
		await fetch(PROBE_URL, { cache: 'no-store', signal: controller.signal });
		return true;
	} catch {
		return false;
	} finally {
		clearTimeout(timer);
		signal.removeEventListener('abort', stop);
	}
}

function putPart(url: string, body: Blob, signal: AbortSignal, onProgress: (sent: number) => void) {
	return new Promise<void>((resolve, reject) => {
		if (signal.aborted) return reject(signal.reason);
		const xhr = new XMLHttpRequest();
		let settled = false;
		let stall: ReturnType<typeof setTimeout> | undefined;
		const settle = (error?: unknown) => {
			if (settled) return;
			settled = true;
			clearTimeout(stall);
			signal.removeEventListener('abort', abort);
			if (error === undefined) resolve();
			else reject(error);
		};
		const watch = () => {
			clearTimeout(stall);
			stall = setTimeout(() => {
				settle(new HttpError(0, 'storage', 'Storage stopped answering.'));
				xhr.abort();
			}, STALL_MS);
		};
		const abort = () => {
			settle(signal.reason ?? new Error('stopped'));
			xhr.abort();
		};
		xhr.open('PUT', url);
		xhr.upload.onprogress = (e) => {
			watch();
			onProgress(e.loaded);
		};
		xhr.onload = () => {
			if (xhr.status >= 200 && xhr.status < 300) settle();
			else settle(new HttpError(xhr.status, 'storage', `Storage refused a part (${xhr.status}).`));
		};
		xhr.onerror = () => settle(new HttpError(0, 'storage', 'The connection to storage broke off.'));
		xhr.onabort = () =>
			settle(signal.reason ?? new HttpError(0, 'storage', 'The part was stopped.'));
		signal.addEventListener('abort', abort, { once: true });
		watch();
		xhr.send(body);
	});
}

/** What a retry's note says, in our words (never the browser's). */
function retryNote(error: HttpError, doing: string, seconds: number, nextTry: number): string {
	const what =
		error.from === 'storage'
			? error.status === 0
				? 'The connection to storage broke off'
				: 'Storage did not take the part'
			: error.status === 0
				? 'Kinelume’s server did not answer'
				: 'Kinelume’s server had a problem';
	return `${what} while ${doing}. Trying again in ${seconds} s (try ${nextTry}).`;
}

/** An upload a tab has started (finished ones too): that page must not offer to discard it. */
export interface RunningUpload {
	uploadId: string | null;
	filename: string;
	sizeBytes: number;
}

export interface UploadTaskEvents {
	/** The upload has its session (new or found again): the page can list uploads without it. */
	onsession?: (task: UploadTask) => void;
	/** The file became a recording, or was refused. */
	onfinished?: (task: UploadTask) => void;
}

export class UploadTask {
	readonly file: File;
	phase = $state<UploadPhase>('starting');
	/** Bytes storage holds, counting the part in flight as far as it has gone. */
	sentBytes = $state(0);
	/** Measured speed while bytes move; 0 when they do not (nothing is shown then). */
	bytesPerSecond = $state(0);
	message = $state<string | null>(null);
	recordingId = $state<string | null>(null);
	/** The server's id of this upload, once it has one. */
	uploadId = $state<string | null>(null);
	/** Parts (and their bytes) already stored before this page sent anything: a resumed upload. */
	resumedParts = $state(0);
	resumedBytes = $state(0);
	/** Parts this page sent. */
	partsSent = $state(0);

	get totalBytes(): number {
		return this.file.size;
	}
	percent = $derived(
		this.totalBytes > 0 ? Math.min(100, (this.sentBytes / this.totalBytes) * 100) : 0
	);
	/** Bytes are moving now: only then are speed and time left shown. */
	moving = $derived(this.phase === 'uploading' && this.bytesPerSecond > 0);
	secondsLeft = $derived(
		this.moving ? (this.totalBytes - this.sentBytes) / this.bytesPerSecond : null
	);

	#session: Session | null = null;
	// Plain maps on purpose: #recount folds them into sentBytes, the one value the page reads.
	// eslint-disable-next-line svelte/prefer-svelte-reactivity
	#done = new Map<number, number>();
	// eslint-disable-next-line svelte/prefer-svelte-reactivity
	#inFlight = new Map<number, number>();
	// eslint-disable-next-line svelte/prefer-svelte-reactivity
	#urls = new Map<number, { url: string; at: number }>();
	#controller: AbortController | null = null;
	/** The try under way; going offline aborts it (the task's controller stays). */
	#attempt: AbortController | null = null;
	#samples: SpeedSample[] = [];
	#events: UploadTaskEvents;

	constructor(file: File, events: UploadTaskEvents = {}) {
		this.file = file;
		this.#events = events;
	}

	/** Running: starting, sending, waiting for the network or being checked. */
	get active(): boolean {
		return (
			this.phase === 'starting' ||
			this.phase === 'uploading' ||
			this.phase === 'waiting' ||
			this.phase === 'checking'
		);
	}

	/** Starts, or continues after a pause or an error. */
	async start(): Promise<void> {
		if (this.#controller) return;
		const controller = new AbortController();
		this.#controller = controller;
		const signal = controller.signal;
		this.message = null;
		this.#resetSpeed();
		const offline = () => this.#attempt?.abort(new Error('offline'));
		window.addEventListener('offline', offline);
		const ticker = setInterval(() => this.#tick(), TICK_MS);
		try {
			if (!this.#session) {
				this.phase = 'starting';
				await this.#openSession(signal);
			}
			this.phase = 'uploading';
			await this.#sendMissingParts(signal);
			await this.#complete(signal);
		} catch (error) {
			if (signal.aborted) return;
			this.#fail(error);
		} finally {
			clearInterval(ticker);
			window.removeEventListener('offline', offline);
			if (this.#controller === controller) this.#controller = null;
			// Unless "Continue" already started the next run, nothing is in flight any more.
			if (this.#controller === null) {
				this.#inFlight.clear();
				this.#recount();
				this.#resetSpeed();
			}
		}
	}

	pause(): void {
		if (this.phase !== 'uploading' && this.phase !== 'starting' && this.phase !== 'waiting') return;
		this.#controller?.abort(new Error('paused'));
		this.#controller = null;
		this.#inFlight.clear();
		this.#recount();
		this.phase = 'paused';
		this.message = null;
		this.#resetSpeed();
	}

	/** Gives the upload up: storage drops its parts. */
	async cancel(): Promise<void> {
		this.#controller?.abort(new Error('cancelled'));
		this.#controller = null;
		const session = this.#session;
		this.#session = null;
		if (session) await api(`/api/uploads/${session.id}`, { method: 'DELETE' }).catch(() => {});
	}

	/**
	 * Runs one step (a request) until it succeeds: waiting for the network whenever it is down
	 * (no try counted), trying again after a back-off when the network is up and the failure is
	 * one that may pass; any other failure is thrown.
	 */
	async #retrying<T>(
		signal: AbortSignal,
		doing: string,
		step: (signal: AbortSignal) => Promise<T>
	): Promise<T> {
		let attempt = 1;
		for (;;) {
			signal.throwIfAborted();
			if (navigator.onLine === false) {
				await this.#waitForNetwork(signal);
				attempt = 1;
			}
			const tryController = new AbortController();
			const stop = () => tryController.abort(signal.reason);
			signal.addEventListener('abort', stop, { once: true });
			this.#attempt = tryController;
			try {
				return await step(tryController.signal);
			} catch (error) {
				if (signal.aborted) throw signal.reason;
				const wentOffline = tryController.signal.aborted;
				const noAnswer = wentOffline || (error instanceof HttpError && error.status === 0);
				if (noAnswer && (wentOffline || !(await reachable(signal)))) {
					await this.#waitForNetwork(signal);
					attempt = 1;
					continue;
				}
				if (!(error instanceof HttpError) || !isRetryableStatus(error.status, error.from))
					throw error;
				const delay = retryDelay(attempt);
				this.message = retryNote(error, doing, Math.max(1, Math.round(delay / 1000)), attempt + 1);
				this.#resetSpeed();
				await wait(delay, signal);
				this.message = null;
				attempt++;
			} finally {
				signal.removeEventListener('abort', stop);
				if (this.#attempt === tryController) this.#attempt = null;
			}
		}
	}

	/** Waits until the browser is online and the app answers; says so meanwhile. */
	async #waitForNetwork(signal: AbortSignal): Promise<void> {
		const before = this.phase === 'waiting' ? 'uploading' : this.phase;
		this.phase = 'waiting';
		this.message = OFFLINE_MESSAGE;
		this.#inFlight.clear();
		this.#recount();
		this.#resetSpeed();
		for (let check = 0; ; check++) {
			await onlineOr(probeDelay(check), signal);
			if (await reachable(signal)) break;
		}
		this.phase = before;
		this.message = null;
		this.#resetSpeed();
	}

	async #openSession(signal: AbortSignal): Promise<void> {
		// Two small reads of the file; a file that cannot be read fails later, in its own words.
		const fingerprint = await fileFingerprint(this.file).catch(() => null);
		const opened = await this.#retrying(signal, 'starting the upload', (s) =>
			api<OpenedSession>('/api/uploads', {
				method: 'POST',
				signal: s,
				body: JSON.stringify({
					filename: this.file.name,
					contentType: this.file.type,
					sizeBytes: this.file.size,
					fingerprint
				})
			})
		);
		const { kept } = planParts(opened, opened.parts);
		this.#done = kept;
		this.#urls.clear();
		this.resumedParts = kept.size;
		this.resumedBytes = [...kept.values()].reduce((sum, n) => sum + n, 0);
		this.#session = {
			id: opened.id,
			filename: opened.filename,
			sizeBytes: opened.sizeBytes,
			partSize: opened.partSize,
			partCount: opened.partCount,
			recordingId: opened.recordingId
		};
		this.uploadId = opened.id;
		this.#recount();
		this.#resetSpeed();
		this.#events.onsession?.(this);
	}

	#missing(): number[] {
		const stored = [...this.#done].map(([partNumber, size]) => ({ partNumber, size }));
		return planParts(this.#session!, stored).missing;
	}

	async #sendMissingParts(signal: AbortSignal): Promise<void> {
		for (const partNumber of this.#missing()) await this.#sendPart(partNumber, signal);
	}

	/** A fresh signed URL for a part, asking for the next few parts' URLs at once. */
	async #partUrl(partNumber: number, signal: AbortSignal): Promise<string> {
		const now = performance.now();
		const cached = this.#urls.get(partNumber);
		if (cached && now - cached.at < URL_FRESH_MS) return cached.url;
		const wanted = this.#missing()
			.filter((n) => n >= partNumber)
			.filter((n) => n === partNumber || !this.#urls.has(n))
			.slice(0, URLS_PER_REQUEST);
		const { parts } = await api<{ parts: { partNumber: number; url: string }[] }>(
			`/api/uploads/${this.#session!.id}/parts`,
			{ method: 'POST', body: JSON.stringify({ partNumbers: wanted }), signal }
		);
		for (const p of parts) this.#urls.set(p.partNumber, { url: p.url, at: now });
		const url = this.#urls.get(partNumber)?.url;
		if (!url) throw new HttpError(500, 'server', 'The server signed no address for a part.');
		return url;
	}

	async #sendPart(partNumber: number, signal: AbortSignal): Promise<void> {
		const session = this.#session!;
		const { start, end } = partRange(session.sizeBytes, session.partSize, partNumber);
		const slice = this.file.slice(start, end);
		await this.#retrying(signal, `sending part ${partNumber}`, async (attemptSignal) => {
			const url = await this.#partUrl(partNumber, attemptSignal);
			// Each URL is used for one try: a retry may come after it expired.
			this.#urls.delete(partNumber);
			try {
				await putPart(url, slice, attemptSignal, (sent) => {
					this.#inFlight.set(partNumber, sent);
					this.#recount();
				});
			} catch (error) {
				this.#inFlight.delete(partNumber);
				this.#recount();
				throw error;
			}
			this.#inFlight.delete(partNumber);
			this.#done.set(partNumber, slice.size);
			this.partsSent++;
			this.#recount();
		});
	}

	async #complete(signal: AbortSignal): Promise<void> {
		const session = this.#session!;
		for (let round = 1; ; round++) {
			this.phase = 'checking';
			this.#resetSpeed();
			try {
				const result = await this.#retrying(signal, 'checking the video', (s) =>
					api<{ recordingId: string }>(`/api/uploads/${session.id}/complete`, {
						method: 'POST',
						signal: s
					})
				);
				this.#finished(result.recordingId);
				return;
			} catch (error) {
				if (!(error instanceof HttpError) || error.from !== 'server') throw error;
				if (error.status === 422) return this.#refused(error.message);
				if (error.status !== 404 && error.status !== 409) throw error;
			}
			// 404 or 409: an earlier request may have finished (or still be checking) with its
			// answer lost on the way, or parts may be missing. Look before doing anything.
			const where = await this.#whereItStands(signal);
			if (where === 'done') return this.#finished(session.recordingId);
			if (where === 'gone')
				return this.#refused('This upload no longer exists. Please choose the file again.');
			if (where === 'missing') {
				this.phase = 'uploading';
				await this.#sendMissingParts(signal);
				continue;
			}
			this.message = 'The video is still being checked; looking again shortly.';
			await wait(retryDelay(round), signal);
			this.message = null;
		}
	}

	async #whereItStands(signal: AbortSignal): Promise<'done' | 'gone' | 'checking' | 'missing'> {
		const session = this.#session!;
		const recordingExists = () =>
			this.#retrying(signal, 'checking the video', (s) =>
				api(`/api/recordings/${session.recordingId}`, { signal: s }).then(
					() => true,
					(error: unknown) => {
						if (error instanceof HttpError && error.status === 404) return false;
						throw error;
					}
				)
			);
		if (await recordingExists()) return 'done';
		try {
			const state = await this.#retrying(signal, 'checking the video', (s) =>
				api<OpenedSession>(`/api/uploads/${session.id}`, { signal: s })
			);
			const { kept, missing } = planParts(session, state.parts);
			this.#done = kept;
			this.#recount();
			return missing.length > 0 ? 'missing' : 'checking';
		} catch (error) {
			if (error instanceof HttpError && error.status === 409) return 'checking';
			if (error instanceof HttpError && error.status === 404)
				return (await recordingExists()) ? 'done' : 'gone';
			throw error;
		}
	}

	#finished(recordingId: string) {
		this.recordingId = recordingId;
		this.phase = 'done';
		this.message = null;
		this.sentBytes = this.totalBytes;
		this.#events.onfinished?.(this);
	}

	#refused(message: string) {
		this.#session = null;
		this.uploadId = null;
		this.phase = 'refused';
		this.message = message;
		this.#events.onfinished?.(this);
	}

	#fail(error: unknown) {
		this.phase = 'failed';
		this.#resetSpeed();
		if (error instanceof HttpError && error.from === 'server' && error.status === 404) {
			// Discarded from elsewhere, or expired: Continue starts it again (or finds another).
			this.#session = null;
			this.uploadId = null;
			this.#done.clear();
			this.#recount();
			this.message =
				'This upload was discarded or has expired, so storage no longer holds its parts. Choose “Continue” to send the file again.';
			return;
		}
		this.message =
			error instanceof HttpError
				? `${error.message} Your progress is kept: choose “Continue” to carry on.`
				: 'The upload stopped. Your progress is kept: choose “Continue” to carry on.';
	}

	#resetSpeed() {
		this.#samples = [];
		this.bytesPerSecond = 0;
	}

	#tick() {
		this.bytesPerSecond =
			this.phase === 'uploading' ? (measureSpeed(this.#samples, performance.now()) ?? 0) : 0;
	}

	#recount() {
		let bytes = 0;
		for (const size of this.#done.values()) bytes += size;
		for (const sent of this.#inFlight.values()) bytes += sent;
		if (bytes === this.sentBytes) return;
		this.sentBytes = bytes;
		const now = performance.now();
		this.#samples.push({ at: now, bytes });
		this.#samples = keepSamples(this.#samples, now);
		this.#tick();
	}
}
