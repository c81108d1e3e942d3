/**
 * The bookkeeping of one patient's offline copies: which pages are saved (and from what data),
 * which exercises were opened with which files and sizes, and the current programme as Today last
 * listed it. Pure: the service worker reads it from its cache, asks these functions what to keep,
 * then deletes what they say to drop.
 */
import { replayPath, TODAY_PATH } from './scope';

const MB = 1024 * 1024;

/**
 * Our choice. Segment clips are cut to one exercise (H.264 at CRF 23: a 30-second clip at 720p
 * is about 10 MB), so a current programme of ten exercises fits many times over.
 */
export const OFFLINE_LIMITS = {
	/** A clip larger than this is not saved (it still plays online). */
	clipBytes: 30 * MB,
	/** Captions, a transcript or a poster larger than this is not saved. */
	smallFileBytes: 2 * MB,
	/** Every saved clip, caption file, transcript and poster together. */
	totalBytes: 100 * MB,
	/** Exercises kept at most, however small. */
	exercises: 30
};

export type OfflineLimits = typeof OFFLINE_LIMITS;

/**
 * A page copy made by a navigation answers for the data it was made from for this long, so the
 * page's own "keep" message right after it does not fetch it again.
 */
export const FRESH_NAVIGATION_MS = 20_000;

export interface SavedFile {
	url: string;
	bytes: number;
}

export interface SavedExercise {
	/** Programme item id (the replay page's id). */
	item: string;
	files: SavedFile[];
	/** When the patient last opened it (ms); the least recently opened go first. */
	openedAt: number;
}

export interface SavedPage {
	savedAt: number;
	/** A fingerprint of the page data the copy was made from; null when made by a navigation. */
	state: string | null;
}

export interface OfflineManifest {
	/** Item ids of the current programme as Today last listed them; null until Today was seen. */
	programme: string[] | null;
	/** Posters of the current programme's exercises, shown on Today. */
	posters: SavedFile[];
	pages: Record<string, SavedPage>;
	exercises: SavedExercise[];
}

export interface ManifestChange {
	manifest: OfflineManifest;
	/** Addresses saved before and no longer kept: delete them from the cache. */
	drop: string[];
}

export function emptyManifest(): OfflineManifest {
	return { programme: null, posters: [], pages: {}, exercises: [] };
}

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null;
const isString = (v: unknown): v is string => typeof v === 'string';
const isCount = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v) && v >= 0;

function readFiles(value: unknown): SavedFile[] {
	if (!Array.isArray(value)) return [];
	return value.filter(
		(f): f is SavedFile => isRecord(f) && isString(f.url) && isCount(f.bytes)
	) as SavedFile[];
}

/** The manifest from stored JSON; anything unreadable counts as nothing saved. */
export function readManifest(json: unknown): OfflineManifest {
	if (!isRecord(json)) return emptyManifest();
	const programme =
		Array.isArray(json.programme) && json.programme.every(isString) ? json.programme : null;
	const pages: Record<string, SavedPage> = {};
	if (isRecord(json.pages)) {
		for (const [url, page] of Object.entries(json.pages)) {
			if (isRecord(page) && isCount(page.savedAt)) {
				pages[url] = { savedAt: page.savedAt, state: isString(page.state) ? page.state : null };
			}
		}
	}
	const exercises = Array.isArray(json.exercises)
		? json.exercises
				.filter((e) => isRecord(e) && isString(e.item) && isCount(e.openedAt))
				.map((e) => ({ item: e.item, files: readFiles(e.files), openedAt: e.openedAt }))
		: [];
	return { programme, posters: readFiles(json.posters), pages, exercises };
}

/** Every address the manifest says is saved (pages, files, posters). */
export function savedUrls(manifest: OfflineManifest): Set<string> {
	const urls = new Set(Object.keys(manifest.pages));
	for (const e of manifest.exercises) for (const f of e.files) urls.add(f.url);
	for (const p of manifest.posters) urls.add(p.url);
	return urls;
}

export function savedBytes(manifest: OfflineManifest): number {
	let total = 0;
	for (const e of manifest.exercises) for (const f of e.files) total += f.bytes;
	for (const p of manifest.posters) total += p.bytes;
	return total;
}

/** Keeps only the pages of Today and of exercises still kept, then says what went. */
function settle(before: OfflineManifest, after: OfflineManifest): ManifestChange {
	const pagesKept = new Set([TODAY_PATH, ...after.exercises.map((e) => replayPath(e.item))]);
	const pages = Object.fromEntries(
		Object.entries(after.pages).filter(([url]) => pagesKept.has(url))
	);
	const manifest = { ...after, pages };
	const kept = savedUrls(manifest);
	return { manifest, drop: [...savedUrls(before)].filter((url) => !kept.has(url)) };
}

/**
 * Whether the page at `url` must be fetched again to save it: not when the saved copy was made
 * from the same data (`state`), nor when a navigation saved it moments ago.
 */
export function pageNeedsFetch(
	manifest: OfflineManifest,
	url: string,
	state: string,
	now: number
): boolean {
	const saved = manifest.pages[url];
	if (!saved) return true;
	if (saved.state === state) return false;
	return !(saved.state === null && now - saved.savedAt < FRESH_NAVIGATION_MS);
}

/** Notes a page copy just saved, made from data `state` (null when saved by a navigation). */
export function notePage(
	manifest: OfflineManifest,
	url: string,
	state: string | null,
	now: number
): OfflineManifest {
	return { ...manifest, pages: { ...manifest.pages, [url]: { savedAt: now, state } } };
}

/** A page answered by a navigation whose data is not known here keeps the state it had. */
export function notePageAgain(
	manifest: OfflineManifest,
	url: string,
	state: string,
	now: number
): OfflineManifest {
	const saved = manifest.pages[url];
	return notePage(manifest, url, state, saved?.savedAt ?? now);
}

/**
 * The patient opened an exercise: it becomes the most recent, with the files now saved for it
 * (`files` null keeps those it had, as when only its page was saved). Then the least recently
 * opened exercises go until the count and the total size fit; an exercise too large to fit alone
 * keeps its page but none of its files.
 */
export function openExercise(
	manifest: OfflineManifest,
	opened: { item: string; files: SavedFile[] | null; openedAt: number },
	limits: OfflineLimits = OFFLINE_LIMITS
): ManifestChange {
	const earlier = manifest.exercises.find((e) => e.item === opened.item);
	const entry: SavedExercise = {
		item: opened.item,
		files: opened.files ?? earlier?.files ?? [],
		openedAt: opened.openedAt
	};
	const byRecency = [entry, ...manifest.exercises.filter((e) => e.item !== opened.item)].sort(
		(a, b) => b.openedAt - a.openedAt
	);
	const budget = limits.totalBytes - manifest.posters.reduce((n, p) => n + p.bytes, 0);
	const kept: SavedExercise[] = [];
	let total = 0;
	for (const e of byRecency) {
		if (kept.length >= limits.exercises) break;
		const bytes = e.files.reduce((n, f) => n + f.bytes, 0);
		if (total + bytes > budget) {
			if (e === entry) kept.push({ ...e, files: [] });
			else break;
			continue;
		}
		total += bytes;
		kept.push(e);
	}
	return settle(manifest, { ...manifest, exercises: kept });
}

/**
 * Today listed the current programme: exercises of other programmes go (with their pages and
 * files), and the programme's posters are those given, as many as fit the limits.
 */
export function listProgramme(
	manifest: OfflineManifest,
	items: string[],
	posters: SavedFile[],
	limits: OfflineLimits = OFFLINE_LIMITS
): ManifestChange {
	const current = new Set(items);
	const exercises = manifest.exercises.filter((e) => current.has(e.item));
	let room =
		limits.totalBytes - exercises.reduce((n, e) => n + e.files.reduce((m, f) => m + f.bytes, 0), 0);
	const kept: SavedFile[] = [];
	for (const poster of posters) {
		if (kept.length >= limits.exercises || poster.bytes > room) break;
		if (kept.some((p) => p.url === poster.url)) continue;
		kept.push(poster);
		room -= poster.bytes;
	}
	return settle(manifest, { ...manifest, programme: [...items], exercises, posters: kept });
}
