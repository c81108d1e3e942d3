/**
 * One file going from the browser straight to storage in parts: the server hands out short-lived
 * presigned part URLs, the browser PUTs slices of the File to them (three at a time), and the
 * server completes and checks the upload. Resumable: the upload id is remembered against the
 * file's name, size and date, so choosing the same file after a reload asks storage which parts
 * it already holds and sends only the rest.
 */

export type UploadPhase =
	| 'starting'
	| 'uploading'
	| 'paused'
	| 'checking'
	| 'done'
	| 'refused'
	| 'failed';

interface Session {
	id: string;
	sizeBytes: number;
	partSize: number;
	partCount: number;
}

interface ApiErrorBody {
	error?: { message?: string };
}

const STORE_KEY = 'kinelume.resumable-uploads';
const PARALLEL_PARTS = 3;
const MAX_TRIES = 6;
const SPEED_WINDOW_MS = 8000;

/** Identifies a file across reloads without reading it: name, size and last change. */
export function fingerprint(file: File): string {
	return `${file.name}|${file.size}|${file.lastModified}`;
}

function remembered(): Record<string, string> {
	try {
		const raw = localStorage.getItem(STORE_KEY);
		const parsed: unknown = raw ? JSON.parse(raw) : {};
		return parsed && typeof parsed === 'object' ? (parsed as Record<string, string>) : {};
	} catch {
		return {};
	}
}

function remember(file: File, uploadId: string | null) {
	const all = remembered();
	if (uploadId) all[fingerprint(file)] = uploadId;
	else delete all[fingerprint(file)];
	try {
		localStorage.setItem(STORE_KEY, JSON.stringify(all));
	} catch {
		// Private browsing can refuse storage: the upload still works, it just cannot resume.
	}
}

/** Forgets a remembered upload by its id (after it was discarded from another place). */
export function forgetUpload(uploadId: string) {
	const all = remembered();
	for (const [key, id] of Object.entries(all)) if (id === uploadId) delete all[key];
	try {
		localStorage.setItem(STORE_KEY, JSON.stringify(all));
	} catch {
		// Nothing to forget where nothing could be stored.
	}
}

class HttpError extends Error {
	constructor(
		readonly status: number,
		message: string
	) {
		super(message);
	}
}

async function api<T>(path: string, init?: RequestInit): Promise<T> {
	const response = await fetch(path, {
		...init,
		headers: { 'Content-Type': 'application/json', Accept: 'application/json' }
	});
	if (!response.ok) {
		const body = (await response.json().catch(() => ({}))) as ApiErrorBody;
		throw new HttpError(
			response.status,
			body.error?.message ?? `The server answered ${response.status}. Please try again.`
		);
	}
	return response.status === 204 ? (undefined as T) : ((await response.json()) as T);
}

function wait(ms: number, signal: AbortSignal): Promise<void> {
	return new Promise((resolve, reject) => {
		const timer = setTimeout(resolve, ms);
		signal.addEventListener(
			'abort',
			() => {
				clearTimeout(timer);
				reject(signal.reason);
			},
			{ once: true }
		);
	});
}

function putPart(url: string, body: Blob, signal: AbortSignal, onProgress: (sent: number) => void) {
	return new Promise<void>((resolve, reject) => {
		const xhr = new XMLHttpRequest();
		xhr.open('PUT', url);
		xhr.upload.onprogress = (e) => onProgress(e.loaded);
		xhr.onload = () => {
			if (xhr.status >= 200 && xhr.status < 300) resolve();
			else reject(new HttpError(xhr.status, `Storage refused a part (${xhr.status}).`));
		};
		xhr.onerror = () => reject(new HttpError(0, 'The connection dropped.'));
		xhr.ontimeout = () => reject(new HttpError(0, 'Storage did not answer in time.'));
		const abort = () => xhr.abort();
		signal.addEventListener('abort', abort, { once: true });
		xhr.onloadend = () => signal.removeEventListener('abort', abort);
		xhr.send(body);
	});
}

export class UploadTask {
	readonly file: File;
	phase = $state<UploadPhase>('starting');
	/** Bytes storage holds, counting parts in flight as far as they have gone. */
	sentBytes = $state(0);
	bytesPerSecond = $state(0);
	message = $state<string | null>(null);
	recordingId = $state<string | null>(null);
	/** Parts already stored before this page sent anything (a resumed upload). */
	resumedParts = $state(0);
	/** Parts this page sent. */
	partsSent = $state(0);

	get totalBytes(): number {
		return this.file.size;
	}
	percent = $derived(
		this.totalBytes > 0 ? Math.min(100, (this.sentBytes / this.totalBytes) * 100) : 0
	);
	secondsLeft = $derived(
		this.bytesPerSecond > 0 && this.phase === 'uploading'
			? (this.totalBytes - this.sentBytes) / this.bytesPerSecond
			: null
	);

	#session: Session | null = null;
	// Plain maps on purpose: #recount folds them into sentBytes, the one value the page reads.
	// eslint-disable-next-line svelte/prefer-svelte-reactivity
	#done = new Map<number, number>();
	// eslint-disable-next-line svelte/prefer-svelte-reactivity
	#inFlight = new Map<number, number>();
	#controller: AbortController | null = null;
	#samples: { at: number; bytes: number }[] = [];
	#onFinished: ((task: UploadTask) => void) | undefined;

	constructor(file: File, onFinished?: (task: UploadTask) => void) {
		this.file = file;
		this.#onFinished = onFinished;
	}

	get active(): boolean {
		return this.phase === 'starting' || this.phase === 'uploading' || this.phase === 'checking';
	}

	/** Starts, or continues after a pause or an error. */
	async start(): Promise<void> {
		if (this.active && this.#controller) return;
		const controller = new AbortController();
		this.#controller = controller;
		this.message = null;
		try {
			if (!this.#session) {
				this.phase = 'starting';
				this.#session = await this.#openSession();
			}
			this.phase = 'uploading';
			await this.#sendMissingParts(controller.signal);
			await this.#complete(controller.signal);
		} catch (error) {
			if (controller.signal.aborted) return;
			this.#fail(error);
		} finally {
			if (this.#controller === controller) this.#controller = null;
		}
	}

	pause(): void {
		if (this.phase !== 'uploading' && this.phase !== 'starting') return;
		this.#controller?.abort(new Error('paused'));
		this.#controller = null;
		this.#inFlight.clear();
		this.#recount();
		this.phase = 'paused';
		this.bytesPerSecond = 0;
	}

	/** Gives the upload up: storage drops its parts. */
	async cancel(): Promise<void> {
		this.#controller?.abort(new Error('cancelled'));
		this.#controller = null;
		const session = this.#session;
		remember(this.file, null);
		this.#session = null;
		if (session) await api(`/api/uploads/${session.id}`, { method: 'DELETE' }).catch(() => {});
	}

	async #openSession(): Promise<Session> {
		const known = remembered()[fingerprint(this.file)];
		if (known) {
			try {
				const state = await api<Session & { parts: { partNumber: number; size: number }[] }>(
					`/api/uploads/${known}`
				);
				if (state.sizeBytes === this.file.size) {
					for (const p of state.parts) {
						if (p.size === this.#partLength(state, p.partNumber))
							this.#done.set(p.partNumber, p.size);
					}
					this.resumedParts = this.#done.size;
					this.#recount();
					return state;
				}
			} catch (error) {
				if (!(error instanceof HttpError && error.status === 404)) throw error;
			}
			remember(this.file, null);
		}
		const session = await api<Session>('/api/uploads', {
			method: 'POST',
			body: JSON.stringify({
				filename: this.file.name,
				contentType: this.file.type,
				sizeBytes: this.file.size
			})
		});
		remember(this.file, session.id);
		return session;
	}

	#partLength(session: Session, partNumber: number): number {
		const start = (partNumber - 1) * session.partSize;
		return Math.max(0, Math.min(session.partSize, session.sizeBytes - start));
	}

	async #sendMissingParts(signal: AbortSignal): Promise<void> {
		const session = this.#session!;
		const queue: number[] = [];
		for (let n = 1; n <= session.partCount; n++) if (!this.#done.has(n)) queue.push(n);
		const worker = async () => {
			for (let n = queue.shift(); n !== undefined; n = queue.shift()) {
				await this.#sendPart(session, n, signal);
			}
		};
		await Promise.all(Array.from({ length: PARALLEL_PARTS }, worker));
	}

	async #sendPart(session: Session, partNumber: number, signal: AbortSignal): Promise<void> {
		const start = (partNumber - 1) * session.partSize;
		const slice = this.file.slice(start, start + this.#partLength(session, partNumber));
		for (let attempt = 1; ; attempt++) {
			signal.throwIfAborted();
			try {
				// One URL per try: each lives ten minutes at most, and a retry may come later.
				const { parts } = await api<{ parts: { partNumber: number; url: string }[] }>(
					`/api/uploads/${session.id}/parts`,
					{ method: 'POST', body: JSON.stringify({ partNumbers: [partNumber] }), signal }
				);
				await putPart(parts[0].url, slice, signal, (sent) => {
					this.#inFlight.set(partNumber, sent);
					this.#recount();
				});
				this.#inFlight.delete(partNumber);
				this.#done.set(partNumber, slice.size);
				this.partsSent++;
				this.#recount();
				return;
			} catch (error) {
				this.#inFlight.delete(partNumber);
				this.#recount();
				if (signal.aborted) throw signal.reason;
				const retryable =
					!(error instanceof HttpError) ||
					error.status === 0 ||
					error.status >= 500 ||
					error.status === 403 ||
					error.status === 408 ||
					error.status === 429;
				if (!retryable || attempt >= MAX_TRIES) throw error;
				this.message = `The connection faltered; trying part ${partNumber} again (try ${attempt + 1} of ${MAX_TRIES}).`;
				await wait(
					Math.min(30_000, 1000 * 2 ** (attempt - 1)) * (0.75 + Math.random() * 0.5),
					signal
				);
				this.message = null;
			}
		}
	}

	async #complete(signal: AbortSignal): Promise<void> {
		const session = this.#session!;
		this.phase = 'checking';
		this.bytesPerSecond = 0;
		try {
			const result = await api<{ recordingId: string }>(`/api/uploads/${session.id}/complete`, {
				method: 'POST',
				signal
			});
			remember(this.file, null);
			this.recordingId = result.recordingId;
			this.phase = 'done';
			this.#onFinished?.(this);
		} catch (error) {
			if (error instanceof HttpError && (error.status === 422 || error.status === 404)) {
				remember(this.file, null);
				this.#session = null;
				this.phase = 'refused';
				this.message = error.message;
				this.#onFinished?.(this);
				return;
			}
			throw error;
		}
	}

	#fail(error: unknown) {
		this.phase = 'failed';
		this.bytesPerSecond = 0;
		this.message =
			error instanceof Error
				? `${error.message} Your progress is kept: choose “Continue” to carry on.`
				: 'The upload stopped. Choose “Continue” to carry on.';
	}

	#recount() {
		let bytes = 0;
		for (const size of this.#done.values()) bytes += size;
		for (const sent of this.#inFlight.values()) bytes += sent;
		this.sentBytes = bytes;
		const now = performance.now();
		this.#samples.push({ at: now, bytes });
		while (this.#samples.length > 2 && now - this.#samples[0].at > SPEED_WINDOW_MS)
			this.#samples.shift();
		const first = this.#samples[0];
		const seconds = (now - first.at) / 1000;
		if (seconds > 0.5) this.bytesPerSecond = Math.max(0, (bytes - first.bytes) / seconds);
	}
}
