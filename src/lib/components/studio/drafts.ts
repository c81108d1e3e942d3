/**
 * The studio's copy of unsaved cues on this device (IndexedDB through idb-keyval), one per
 * track and the version the edits started from. A draft is written on every edit and removed
 * once the server holds the same cues, so any draft found when a track opens is unsaved work.
 */
import { createStore, del, get, keys, set, type UseStore } from 'idb-keyval';
import type { Cue } from '$lib/captions/types';

export interface Draft {
	trackId: string;
	/** The server version the edits started from. */
	baseVersion: number;
	cues: Cue[];
	/** When the last edit was kept, in milliseconds since the epoch. */
	updatedAt: number;
}

let store: UseStore | null = null;
function drafts(): UseStore {
	store ??= createStore('kinelume-studio', 'drafts');
	return store;
}

const prefix = (trackId: string) => `draft:${trackId}:`;
const keyOf = (trackId: string, baseVersion: number) => `${prefix(trackId)}${baseVersion}`;

/** Keeps `draft`, replacing an earlier one of the same track and base version. */
export async function keepDraft(draft: Draft): Promise<void> {
	await set(keyOf(draft.trackId, draft.baseVersion), draft, drafts());
}

/** Every draft of the track, newest first. */
export async function findDrafts(trackId: string): Promise<Draft[]> {
	const mine = (await keys(drafts())).filter(
		(key): key is string => typeof key === 'string' && key.startsWith(prefix(trackId))
	);
	const found = await Promise.all(mine.map((key) => get<Draft>(key, drafts())));
	return found
		.filter((d): d is Draft => !!d && Array.isArray(d.cues))
		.sort((a, b) => b.updatedAt - a.updatedAt);
}

/** Removes the track's drafts (all of them, or those from one base version). */
export async function dropDrafts(trackId: string, baseVersion?: number): Promise<void> {
	if (baseVersion !== undefined) {
		await del(keyOf(trackId, baseVersion), drafts());
		return;
	}
	for (const draft of await findDrafts(trackId)) {
		await del(keyOf(trackId, draft.baseVersion), drafts());
	}
}
