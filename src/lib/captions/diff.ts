/**
 * Which cues changed between two versions of a track, for the version view. Cues are paired by
 * identifier first (the studio keeps identifiers across edits), then the rest by how much their
 * times overlap, so a cue whose text was retyped still reads as "changed" rather than as one cue
 * removed and another added.
 */
import type { Cue } from './types';

export type CueField = 'id' | 'start' | 'end' | 'text' | 'settings';

export type CueDiffEntry =
	| { type: 'added'; after: Cue }
	| { type: 'removed'; before: Cue }
	| { type: 'changed'; before: Cue; after: Cue; fields: CueField[] };

export interface CueDiff {
	/** Added, removed and changed cues in time order; unchanged cues are only counted. */
	entries: CueDiffEntry[];
	added: number;
	removed: number;
	changed: number;
	unchanged: number;
}

// Times are stored to the millisecond; anything closer is the same time.
const SAME_TIME = 0.0005;

function changedFields(before: Cue, after: Cue): CueField[] {
	const fields: CueField[] = [];
	if (before.id !== after.id) fields.push('id');
	if (Math.abs(before.start - after.start) > SAME_TIME) fields.push('start');
	if (Math.abs(before.end - after.end) > SAME_TIME) fields.push('end');
	if (before.text !== after.text) fields.push('text');
	if (JSON.stringify(before.settings ?? {}) !== JSON.stringify(after.settings ?? {}))
		fields.push('settings');
	return fields;
}

function overlap(a: Cue, b: Cue): number {
	return Math.min(a.end, b.end) - Math.max(a.start, b.start);
}

/** Compares two versions' cues. */
export function diffCues(before: readonly Cue[], after: readonly Cue[]): CueDiff {
	const pairOf = new Map<number, number>();
	const taken = new Set<number>();

	// Repeated identifiers pair up in file order.
	const byId = new Map<string, number[]>();
	before.forEach((cue, i) => {
		if (cue.id === '') return;
		byId.set(cue.id, [...(byId.get(cue.id) ?? []), i]);
	});
	after.forEach((cue, j) => {
		const candidates = cue.id === '' ? undefined : byId.get(cue.id);
		const i = candidates?.shift();
		if (i === undefined) return;
		pairOf.set(j, i);
		taken.add(i);
	});

	// The remaining cues pair by the largest overlap first, so one long cue split in two pairs
	// with the half that covers most of it.
	const candidates: { i: number; j: number; amount: number }[] = [];
	after.forEach((a, j) => {
		if (pairOf.has(j)) return;
		before.forEach((b, i) => {
			if (taken.has(i)) return;
			const amount = overlap(a, b);
			if (amount > 0) candidates.push({ i, j, amount });
		});
	});
	candidates.sort((x, y) => y.amount - x.amount || x.j - y.j || x.i - y.i);
	for (const { i, j } of candidates) {
		if (pairOf.has(j) || taken.has(i)) continue;
		pairOf.set(j, i);
		taken.add(i);
	}

	const entries: CueDiffEntry[] = [];
	let unchanged = 0;
	after.forEach((cue, j) => {
		const i = pairOf.get(j);
		if (i === undefined) {
			entries.push({ type: 'added', after: cue });
			return;
		}
		const fields = changedFields(before[i], cue);
		if (fields.length === 0) unchanged++;
		else entries.push({ type: 'changed', before: before[i], after: cue, fields });
	});
	before.forEach((cue, i) => {
		if (!taken.has(i)) entries.push({ type: 'removed', before: cue });
	});
	const startOf = (e: CueDiffEntry) => (e.type === 'removed' ? e.before.start : e.after.start);
	entries.sort((x, y) => startOf(x) - startOf(y));
	const count = (type: CueDiffEntry['type']) => entries.filter((e) => e.type === type).length;
	return {
		entries,
		added: count('added'),
		removed: count('removed'),
		changed: count('changed'),
		unchanged
	};
}
