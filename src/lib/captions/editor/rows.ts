/**
 * Row keys for the studio's cues. Cue identifiers are the author's (often empty, sometimes
 * repeated), so the editor gives each cue its own key for selection and for keyed lists; the
 * keys never leave the page.
 */
import type { Cue } from '$lib/captions/types';

export type KeyedCue = Cue & { key: string };

let counter = 0;

/** The cues with a unique key each: kept where they have one, fresh for new cues and copies. */
export function withKeys(cues: readonly Cue[]): KeyedCue[] {
	const seen = new Set<string>();
	return cues.map((cue) => {
		const key = (cue as Partial<KeyedCue>).key;
		if (key && !seen.has(key)) {
			seen.add(key);
			return cue as KeyedCue;
		}
		const fresh = `row${++counter}`;
		seen.add(fresh);
		return { ...cue, key: fresh };
	});
}

/** The cues as the server and files hold them, without row keys. */
export function plainCues(cues: readonly Cue[]): Cue[] {
	return cues.map((cue) => {
		const { id, start, end, text, settings } = cue;
		return settings ? { id, start, end, text, settings } : { id, start, end, text };
	});
}

/** One string for comparing two sets of cues. */
export function sameCues(a: readonly Cue[], b: readonly Cue[]): boolean {
	return JSON.stringify(plainCues(a)) === JSON.stringify(plainCues(b));
}
