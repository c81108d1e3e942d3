/**
 * What patient pages tell the service worker, and the worker's check of it. A page names what it
 * showed (Today: the programme's items and posters; a replay: its item and segment files) and the
 * key of the sign-in it belongs to; the worker saves only addresses of those kinds.
 */
import { classifyPath, patientCacheName } from './scope';

export type WorkerMessage =
	| { type: 'keep-today'; key: string; state: string; items: string[]; posters: string[] }
	| { type: 'keep-exercise'; key: string; state: string; item: string; files: string[] }
	| { type: 'forget' };

export const TODAY_ROUTE = '/(patient)/today';
export const REPLAY_ROUTE = '/(patient)/replay/[id=id]';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;
const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null;
const isString = (v: unknown): v is string => typeof v === 'string';
/** A clip's smaller version (`?v=360`): fetched as such, kept under the clip's own address. */
const CLIP_VERSION = /\/clip\.mp4\?v=\d{3,4}$/;

/** The address a file is kept under: a clip's version under the clip's own address. */
export function savedAddress(url: string): string {
	return CLIP_VERSION.test(url) ? url.slice(0, url.indexOf('?')) : url;
}

const isSegmentFile = (v: unknown): v is string =>
	isString(v) &&
	(v === savedAddress(v) || CLIP_VERSION.test(v)) &&
	classifyPath(savedAddress(v))?.kind === 'segment-file';

/**
 * A short fingerprint of a page's data (FNV-1a over its JSON), so the worker can tell whether its
 * saved copy of the page was made from the same data. Not a security measure.
 */
export function fingerprint(data: unknown): string {
	let json: string;
	try {
		json = JSON.stringify(data) ?? '';
	} catch {
		json = String(Date.now());
	}
	let hash = 0x811c9dc5;
	for (let i = 0; i < json.length; i++) {
		hash ^= json.charCodeAt(i);
		hash = Math.imul(hash, 0x01000193) >>> 0;
	}
	return hash.toString(16).padStart(8, '0');
}

/** The message a patient page sends once it shows `data`, or null for any other page. */
export function keepMessageFor(
	routeId: string | null,
	data: Record<string, unknown>,
	key: string
): WorkerMessage | null {
	const state = fingerprint(data);
	if (routeId === TODAY_ROUTE) {
		const view = isRecord(data.view) ? data.view : null;
		const items = view && Array.isArray(view.items) ? view.items.filter(isRecord) : [];
		return {
			type: 'keep-today',
			key,
			state,
			items: items.map((i) => i.id).filter(isString),
			posters: items.map((i) => i.poster).filter(isSegmentFile)
		};
	}
	if (routeId === REPLAY_ROUTE && isString(data.itemId)) {
		const media = isRecord(data.media) ? data.media : {};
		// The smallest version of the clip: offline copies are about a tenth of the largest.
		const clip = media.offlineClip ?? media.clip;
		const files = [clip, media.captions, media.transcript, media.poster].filter(isSegmentFile);
		return { type: 'keep-exercise', key, state, item: data.itemId, files };
	}
	return null;
}

/** A message as the worker accepts it, or null when it is not one of ours. */
export function readMessage(value: unknown): WorkerMessage | null {
	if (!isRecord(value)) return null;
	if (value.type === 'forget') return { type: 'forget' };
	if (!patientCacheName(isString(value.key) ? value.key : null) || !isString(value.state)) {
		return null;
	}
	const key = value.key as string;
	const state = value.state.slice(0, 64);
	const ids = (v: unknown) =>
		Array.isArray(v) ? v.filter((i) => isString(i) && UUID.test(i)) : [];
	const files = (v: unknown) => (Array.isArray(v) ? v.filter(isSegmentFile) : []);
	if (value.type === 'keep-today') {
		return {
			type: 'keep-today',
			key,
			state,
			items: ids(value.items),
			posters: files(value.posters)
		};
	}
	if (value.type === 'keep-exercise' && isString(value.item) && UUID.test(value.item)) {
		return { type: 'keep-exercise', key, state, item: value.item, files: files(value.files) };
	}
	return null;
}
