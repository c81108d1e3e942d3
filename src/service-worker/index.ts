/// <reference types="@sveltejs/kit" />
/**
 * Replay offline. Registered by the patient pages only (src/lib/offline/register.ts). It keeps:
 * - the built app (public files, one cache per build; the one before stays, for pages saved
 *   under it), answered from the cache first;
 * - for the signed-in patient only, in a cache named by their sign-in's key (the
 *   X-Kinelume-Offline-Key header of their pages): Today and the replay pages they opened, each
 *   saved from the network on every visit and answered from the copy only when the network fails;
 *   and the whole clip, captions, transcript and poster of each exercise opened, answered from the
 *   copy (byte ranges included) only when the network fails. Bounds: src/lib/offline/manifest.ts.
 * Nothing else is intercepted: staff pages, other pages, changes (POST) and __data.json go to the
 * network as before (offline, SvelteKit then loads the page in full, which comes from the copy).
 * Sign-out, and any page seen by someone who is not a patient, delete the patient caches.
 */
import { build, files, version } from '$service-worker';
import {
	emptyManifest,
	listProgramme,
	notePage,
	notePageAgain,
	OFFLINE_LIMITS,
	openExercise,
	pageNeedsFetch,
	readManifest,
	type OfflineManifest,
	type SavedFile
} from '$lib/offline/manifest';
import { readMessage, savedAddress, type WorkerMessage } from '$lib/offline/messages';
import { offlinePageResponse } from '$lib/offline/offline-page';
import { answerFromSaved } from '$lib/offline/range';
import {
	APP_CACHE_PREFIX,
	classifyPath,
	isPatientCache,
	MANIFEST_URL,
	OFFLINE_KEY_HEADER,
	patientCacheName,
	replayPath,
	TODAY_PATH
} from '$lib/offline/scope';

const sw = self as unknown as ServiceWorkerGlobalScope;
const APP_CACHE = `${APP_CACHE_PREFIX}${version}`;
const APP_FILES = new Set([...build, ...files]);

sw.addEventListener('install', (event) => {
	event.waitUntil(
		caches
			.open(APP_CACHE)
			.then((cache) => cache.addAll([...APP_FILES]))
			.then(() => sw.skipWaiting())
	);
});

sw.addEventListener('activate', (event) => {
	event.waitUntil(
		(async () => {
			const older = (await caches.keys())
				.filter((name) => name.startsWith(APP_CACHE_PREFIX) && name !== APP_CACHE)
				.sort();
			// The newest older build stays: pages saved under it still find their scripts.
			await Promise.all(older.slice(0, -1).map((name) => caches.delete(name)));
			await sw.clients.claim();
		})()
	);
});

sw.addEventListener('fetch', (event) => {
	const request = event.request;
	if (request.method !== 'GET') return;
	const url = new URL(request.url);
	if (url.origin !== sw.location.origin) return;
	if (APP_FILES.has(url.pathname) || url.pathname.startsWith('/_app/immutable/')) {
		event.respondWith(appFile(request));
		return;
	}
	const place = classifyPath(url.pathname);
	if (place?.kind === 'segment-file') event.respondWith(segmentFile(request, url));
	else if (place && request.mode === 'navigate') event.respondWith(patientPage(event, url));
});

sw.addEventListener('message', (event) => {
	const message = readMessage(event.data);
	if (!message) return;
	if (message.type === 'forget') {
		generation++;
		event.waitUntil(forgetAll());
		return;
	}
	event.waitUntil(enqueue(() => keep(message)));
});

/** A built file: from this build's cache, else the build before's (immutable names), else the network. */
async function appFile(request: Request): Promise<Response> {
	return (
		(await caches.match(request, { cacheName: APP_CACHE })) ??
		(await caches.match(request)) ??
		fetch(request)
	);
}

/** The one patient cache on this phone (there is never more than one), or null. */
async function patientCache(): Promise<string | null> {
	const names = (await caches.keys()).filter(isPatientCache);
	return names.length === 1 ? names[0] : null;
}

async function savedCopy(pathname: string): Promise<Response | undefined> {
	const cacheName = await patientCache();
	return cacheName ? caches.match(pathname, { cacheName }) : undefined;
}

async function segmentFile(request: Request, url: URL): Promise<Response> {
	try {
		return await fetch(request);
	} catch (offline) {
		const saved = await savedCopy(url.pathname);
		if (!saved) throw offline;
		return answerFromSaved(saved, request);
	}
}

async function patientPage(event: FetchEvent, url: URL): Promise<Response> {
	try {
		const response = await fetch(event.request);
		const key = response.headers.get(OFFLINE_KEY_HEADER);
		if (key && url.search === '' && response.status === 200 && response.type === 'basic') {
			const copy = response.clone();
			event.waitUntil(enqueue(() => savePage(key, url.pathname, copy)));
		}
		return response;
	} catch {
		const saved = await savedCopy(url.pathname);
		if (saved) return saved;
		return offlinePageResponse({ todaySaved: Boolean(await savedCopy(TODAY_PATH)) });
	}
}

// Saving runs one task at a time, so the manifest is never read and written by two at once.
let queue: Promise<void> = Promise.resolve();
function enqueue(task: () => Promise<void>): Promise<void> {
	queue = queue.then(task).catch((error: unknown) => console.error('[offline]', error));
	return queue;
}

// Raised by every "forget": a task started before it stops at its next step and leaves nothing.
let generation = 0;

async function forgetAll(): Promise<void> {
	const names = (await caches.keys()).filter(isPatientCache);
	await Promise.all(names.map((name) => caches.delete(name)));
}

interface Opened {
	name: string;
	cache: Cache;
	manifest: OfflineManifest;
	generation: number;
}

/** Opens the cache of sign-in `key`, deleting any other patient's first. */
async function openFor(key: string): Promise<Opened | null> {
	const name = patientCacheName(key);
	if (!name) return null;
	const started = generation;
	const others = (await caches.keys()).filter((n) => isPatientCache(n) && n !== name);
	await Promise.all(others.map((n) => caches.delete(n)));
	if (started !== generation) return null;
	const cache = await caches.open(name);
	const stored = await cache.match(MANIFEST_URL);
	const manifest = stored ? readManifest(await stored.json().catch(() => null)) : emptyManifest();
	return { name, cache, manifest, generation: started };
}

async function finish(opened: Opened, manifest: OfflineManifest, drop: string[]): Promise<void> {
	if (opened.generation === generation) {
		await Promise.all(drop.map((url) => opened.cache.delete(url)));
		await opened.cache.put(
			MANIFEST_URL,
			new Response(JSON.stringify(manifest), { headers: { 'Content-Type': 'application/json' } })
		);
	}
	// Forgotten meanwhile: whatever this task wrote goes too.
	if (opened.generation !== generation) await caches.delete(opened.name);
}

/** A navigation's answer, saved as the copy of that page. */
async function savePage(key: string, pathname: string, response: Response): Promise<void> {
	const opened = await openFor(key);
	if (!opened) return;
	await opened.cache.put(pathname, response);
	const now = Date.now();
	let manifest = notePage(opened.manifest, pathname, null, now);
	let drop: string[] = [];
	const place = classifyPath(pathname);
	if (place?.kind === 'replay') {
		({ manifest, drop } = openExercise(manifest, { item: place.item, files: null, openedAt: now }));
	}
	await finish(opened, manifest, drop);
}

async function keep(message: Exclude<WorkerMessage, { type: 'forget' }>): Promise<void> {
	const opened = await openFor(message.key);
	if (!opened) return;
	const now = Date.now();
	const page = message.type === 'keep-today' ? TODAY_PATH : replayPath(message.item);
	let manifest = opened.manifest;
	if (!pageNeedsFetch(manifest, page, message.state, now)) {
		manifest = notePageAgain(manifest, page, message.state, now);
	} else if (await fetchPage(opened.cache, page, message.key)) {
		manifest = notePage(manifest, page, message.state, now);
	}
	const saved: SavedFile[] = [];
	const wanted = message.type === 'keep-today' ? message.posters : message.files;
	for (const url of wanted) {
		if (opened.generation !== generation) return;
		// A clip's smaller version is kept under the clip's own address, which every version's
		// request falls back to offline (segmentFile looks up the pathname).
		const address = savedAddress(url);
		const limit = address.endsWith('.mp4')
			? OFFLINE_LIMITS.clipBytes
			: OFFLINE_LIMITS.smallFileBytes;
		const bytes = await saveFile(opened.cache, url, address, limit);
		if (bytes !== null) saved.push({ url: address, bytes });
	}
	const change =
		message.type === 'keep-today'
			? listProgramme(manifest, message.items, saved)
			: openExercise(manifest, { item: message.item, files: saved, openedAt: now });
	await finish(opened, change.manifest, change.drop);
}

/** Fetches a patient page and saves it, if the answer is that page for sign-in `key`. */
async function fetchPage(cache: Cache, pathname: string, key: string): Promise<boolean> {
	try {
		const response = await fetch(pathname, { headers: { Accept: 'text/html' } });
		if (response.status !== 200 || response.headers.get(OFFLINE_KEY_HEADER) !== key) return false;
		await cache.put(pathname, response);
		return true;
	} catch {
		return false;
	}
}

/**
 * Saves the whole file at `url` (at most `limit` bytes) under `address` (the app's, whatever
 * storage address it redirected to), revalidating a copy already saved by its ETag. Returns the
 * saved size, or null when nothing may be kept: too large, or refused now (signed out, no longer
 * in the programme). An unreachable server keeps the copy as it is.
 */
async function saveFile(
	cache: Cache,
	url: string,
	address: string,
	limit: number
): Promise<number | null> {
	const old = await cache.match(address);
	const oldBytes = old ? Number(old.headers.get('Content-Length') ?? 0) : null;
	const headers = new Headers();
	const etag = old?.headers.get('ETag');
	if (etag) headers.set('If-None-Match', etag);
	let response: Response;
	try {
		// Media answers with a redirect to storage; the bytes come from there under CORS. The
		// browser's HTTP cache may hold the same address from the player's own (no-CORS) reads,
		// stored without CORS headers, which a CORS read must not be answered from.
		response = await fetch(url, { headers, cache: 'no-store' });
	} catch {
		return oldBytes;
	}
	if (response.status === 304) return oldBytes;
	if (response.status !== 200) {
		await response.body?.cancel();
		return [401, 403, 404, 410].includes(response.status) ? null : oldBytes;
	}
	if (Number(response.headers.get('Content-Length') ?? 0) > limit) {
		await response.body?.cancel();
		return null;
	}
	const body = await response.blob();
	if (body.size > limit) return null;
	const kept = new Headers({ 'Content-Length': String(body.size) });
	for (const name of ['Content-Type', 'ETag', 'Last-Modified']) {
		const value = response.headers.get(name);
		if (value) kept.set(name, value);
	}
	await cache.put(address, new Response(body, { status: 200, headers: kept }));
	return body.size;
}
