/**
 * What the service worker (src/service-worker) may keep for offline use, by address: the
 * patient's two pages and the files of a segment they replay. Nothing else is ever stored for a
 * person; the app's built files are public and kept apart.
 */

/** Response header on patient pages naming whose offline copies they are (see offlineKey). */
export const OFFLINE_KEY_HEADER = 'X-Kinelume-Offline-Key';

/** Caches of the built app, one per build version (public files only). */
export const APP_CACHE_PREFIX = 'kinelume-app-';

/** Caches of one patient's sign-in: pages, clips, captions, posters. */
export const PATIENT_CACHE_PREFIX = 'kinelume-patient-';

/** Where the bookkeeping of a patient cache lives inside it; never requested from the server. */
export const MANIFEST_URL = '/__kinelume-offline/manifest.json';

export const TODAY_PATH = '/today';

const UUID = '[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}';
const REPLAY = new RegExp(`^/replay/(${UUID})$`);
const SEGMENT_FILE = new RegExp(
	`^/api/segments/(${UUID})/(clip\\.mp4|captions\\.vtt|transcript\\.json|poster-\\d{1,3}\\.jpg)$`
);
const KEY = /^[0-9a-f]{32}$/;

export type OfflinePath =
	| { kind: 'today' }
	| { kind: 'replay'; item: string }
	| { kind: 'segment-file'; segment: string; file: string };

/** Which kind of offline-capable address `pathname` is, or null for everything else. */
export function classifyPath(pathname: string): OfflinePath | null {
	if (pathname === TODAY_PATH) return { kind: 'today' };
	const replay = REPLAY.exec(pathname);
	if (replay) return { kind: 'replay', item: replay[1] };
	const file = SEGMENT_FILE.exec(pathname);
	if (file) return { kind: 'segment-file', segment: file[1], file: file[2] };
	return null;
}

/** The replay page of a programme item. */
export function replayPath(item: string): string {
	return `/replay/${item}`;
}

/** The cache of one sign-in's copies, or null when `key` is not a key the server makes. */
export function patientCacheName(key: string | null | undefined): string | null {
	return key && KEY.test(key) ? `${PATIENT_CACHE_PREFIX}${key}` : null;
}

export function isPatientCache(name: string): boolean {
	return name.startsWith(PATIENT_CACHE_PREFIX);
}

/** True for files a patient cache may hold for an exercise: a segment's clip, captions, poster. */
export function isSegmentFile(pathname: string): boolean {
	return classifyPath(pathname)?.kind === 'segment-file';
}
