/**
 * Polling a JSON endpoint, the one way pages follow work that moves on by itself (a recording
 * being processed). Only `fetch` and a timer: a poll that fails — offline, a 5xx, a signed-out
 * 401, an HTML error page — is reported to `onProblem` and tried again later (each failure waits
 * twice as long, up to `maxEvery`; at once when the browser says it is online again), and it never touches the page's data or navigation. That is
 * the point: SvelteKit's `invalidateAll` falls back to a full page load when its data request
 * fails, which throws away anything running on the page, such as an upload.
 */

export interface PollOptions<T> {
	/** The endpoint, read again before each poll (so it may follow the page's address). */
	url: string | (() => string);
	/** Milliseconds from the end of one poll to the start of the next. */
	every: number;
	/** The longest wait after failures in a row (default: four times `every`). */
	maxEvery?: number;
	/** Poll once at once instead of waiting `every` first. */
	immediately?: boolean;
	/** Each answer; return false to stop polling. */
	onData: (data: T) => void | boolean | Promise<void | boolean>;
	/** True after a failed poll, false once one succeeds again (only on a change). */
	onProblem?: (failing: boolean) => void;
	fetch?: typeof fetch;
}

/** A GET of a JSON endpoint: the parsed body, or an error for no answer, a non-2xx or non-JSON. */
export async function fetchJson<T>(
	url: string,
	fetcher: typeof fetch = fetch,
	signal?: AbortSignal
): Promise<T> {
	const response = await fetcher(url, {
		headers: { Accept: 'application/json' },
		cache: 'no-store',
		signal
	});
	if (!response.ok) throw new Error(`${url} answered ${response.status}`);
	if (!(response.headers.get('content-type') ?? '').includes('application/json'))
		throw new Error(`${url} did not answer JSON`);
	return (await response.json()) as T;
}

/** Starts polling; returns the function that stops it (return it from an `$effect`). */
export function poll<T>(options: PollOptions<T>): () => void {
	const fetcher = options.fetch ?? ((input, init) => fetch(input, init));
	const maxEvery = options.maxEvery ?? options.every * 4;
	const controller = new AbortController();
	let timer: ReturnType<typeof setTimeout> | undefined;
	let failures = 0;
	let failing = false;
	let asking = false;

	const report = (now: boolean) => {
		if (now === failing) return;
		failing = now;
		options.onProblem?.(now);
	};

	const run = async () => {
		if (controller.signal.aborted || asking) return;
		asking = true;
		clearTimeout(timer);
		const url = typeof options.url === 'function' ? options.url() : options.url;
		let keepGoing = true;
		try {
			const data = await fetchJson<T>(url, fetcher, controller.signal);
			if (controller.signal.aborted) return;
			failures = 0;
			report(false);
			keepGoing = (await options.onData(data)) !== false;
		} catch {
			if (controller.signal.aborted) return;
			failures++;
			report(true);
		} finally {
			asking = false;
		}
		if (!keepGoing || controller.signal.aborted) return;
		const wait = Math.min(maxEvery, options.every * 2 ** Math.min(failures, 10));
		timer = setTimeout(() => void run(), wait);
	};

	// Back online after failures: ask at once rather than after the longer wait.
	const online = () => {
		if (failures > 0) void run();
	};
	globalThis.addEventListener?.('online', online);

	timer = setTimeout(() => void run(), options.immediately ? 0 : options.every);
	return () => {
		controller.abort();
		clearTimeout(timer);
		globalThis.removeEventListener?.('online', online);
	};
}
