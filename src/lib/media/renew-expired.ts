/**
 * Media players left open past their storage address's lifetime.
 *
 * Kinelume's media endpoints answer with a redirect to a presigned storage address that works
 * for MEDIA_URL_LIFETIME_SECONDS, and at least half of it from the moment it is handed out
 * (storage/media-urls.ts signs per half-lifetime window). Chromium keeps asking that address,
 * not the app's, for every later byte range of the element's file. Once it has run out, storage
 * refuses it with an XML error that Chromium's opaque-response blocking turns into a retried
 * failure: the player waits for ever and fires no error. So an element whose address may have
 * run out is loaded again from its own address (the app's, which checks the viewer again and
 * redirects to a fresh one) as soon as it needs bytes it does not hold — a seek outside what it
 * has buffered, or waiting for data — and on a network error; the place, speed and playing state
 * are put back once it has loaded. Files that are not the app's, a file that never loaded (no
 * metadata yet) and a seventh renewal within a minute are left to the page.
 */

export const MEDIA_ERR_NETWORK = 2;
const HAVE_METADATA = 1;
const MAX_RENEWALS = 6;
const RENEWAL_WINDOW_MS = 60_000;

/** The parts of an HTMLMediaElement this needs (so it can be tried without a browser). */
export interface RenewableMedia extends EventTarget {
	readonly error: { code: number } | null;
	readonly currentSrc: string;
	readonly paused: boolean;
	readonly readyState: number;
	readonly buffered: { readonly length: number; start(i: number): number; end(i: number): number };
	currentTime: number;
	playbackRate: number;
	load(): void;
	play(): Promise<void>;
}

/** True when `src` is one of the app's own endpoints (which redirect to storage). */
export function isAppMedia(src: string, origin: string): boolean {
	try {
		const url = new URL(src, origin);
		return url.origin === origin && url.pathname.startsWith('/api/');
	} catch {
		return false;
	}
}

function isBuffered(media: RenewableMedia, time: number): boolean {
	for (let i = 0; i < media.buffered.length; i++) {
		if (media.buffered.start(i) <= time && time < media.buffered.end(i)) return true;
	}
	return false;
}

const TRIGGERS = ['seeking', 'waiting', 'stalled', 'error'] as const;
export type Trigger = (typeof TRIGGERS)[number];

/**
 * Keeps the renewal state of every element: when its address was last fetched (its last
 * `loadstart`) and its recent renewals. One per document.
 */
export class MediaRenewal {
	readonly #loadedAt = new WeakMap<RenewableMedia, number>();
	readonly #renewals = new WeakMap<RenewableMedia, number[]>();

	constructor(
		private readonly origin: string,
		private readonly lifetimeSeconds: number
	) {}

	/** The element asked for its file anew (its address is fresh from now). */
	loadStarted(media: RenewableMedia, now: number = Date.now()): void {
		this.#loadedAt.set(media, now);
	}

	/** Whether the element's storage address may no longer work (unknown age counts as old). */
	mayHaveRunOut(media: RenewableMedia, now: number = Date.now()): boolean {
		const at = this.#loadedAt.get(media);
		return at === undefined || now - at >= (this.lifetimeSeconds * 1000) / 2;
	}

	/**
	 * Renews the element if `trigger` calls for it; true when it did (an error is then taken care
	 * of and should go no further).
	 */
	handle(media: RenewableMedia, trigger: Trigger, now: number = Date.now()): boolean {
		if (media.readyState < HAVE_METADATA || !isAppMedia(media.currentSrc, this.origin)) {
			return false;
		}
		const due =
			trigger === 'error'
				? media.error?.code === MEDIA_ERR_NETWORK
				: this.mayHaveRunOut(media, now) &&
					(trigger !== 'seeking' || !isBuffered(media, media.currentTime));
		if (!due) return false;
		const recent = (this.#renewals.get(media) ?? []).filter((at) => now - at < RENEWAL_WINDOW_MS);
		if (recent.length >= MAX_RENEWALS) return false;
		this.#renewals.set(media, [...recent, now]);
		renew(media);
		this.loadStarted(media, now);
		return true;
	}
}

/** Loads the element again from its own address, resuming at the same place, speed and state. */
function renew(media: RenewableMedia): void {
	const at = media.currentTime;
	const rate = media.playbackRate;
	const playing = !media.paused;
	media.addEventListener(
		'loadedmetadata',
		() => {
			media.currentTime = at;
			media.playbackRate = rate;
			if (playing) media.play().catch(() => {});
		},
		{ once: true }
	);
	media.load();
}

/**
 * Watches every audio and video element of the document (media events do not bubble; they are
 * caught on the way down). A renewed element's error goes no further, so its page never shows
 * it. Returns the function that stops.
 */
export function keepMediaAddressesFresh(doc: Document, lifetimeSeconds: number): () => void {
	const renewal = new MediaRenewal(doc.location.origin, lifetimeSeconds);
	const onLoadStart = (event: Event) => {
		if (event.target instanceof HTMLMediaElement) renewal.loadStarted(event.target);
	};
	const onNeed = (event: Event) => {
		const target = event.target;
		if (!(target instanceof HTMLMediaElement)) return;
		if (renewal.handle(target, event.type as Trigger) && event.type === 'error') {
			event.stopImmediatePropagation();
		}
	};
	// Elements the page's markup started loading before this script ran: their addresses came with
	// the page, no earlier than its navigation. Counted as unknown (old), their first wait for
	// data would load them all over again.
	for (const media of doc.querySelectorAll('audio, video')) {
		if (media instanceof HTMLMediaElement) renewal.loadStarted(media, performance.timeOrigin);
	}
	doc.addEventListener('loadstart', onLoadStart, true);
	for (const type of TRIGGERS) doc.addEventListener(type, onNeed, true);
	return () => {
		doc.removeEventListener('loadstart', onLoadStart, true);
		for (const type of TRIGGERS) doc.removeEventListener(type, onNeed, true);
	};
}
