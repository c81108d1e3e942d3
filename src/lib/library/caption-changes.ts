/**
 * A caption revision's changes as the pages show them: one row per cue that differs between the
 * library's version and the captions now, in time order, with plain words and times.
 */
import type { CueDiff } from '../captions/diff';
import { plainText } from '../captions/text';
import { formatTimestamp } from '../captions/timestamp';
import type { Cue } from '../captions/types';

export interface CaptionChangeRow {
	change: 'changed' | 'added' | 'removed';
	/** When the cue starts (now, or in the library's version for a removed one). */
	at: string;
	/** Its words in the library's version; null for an added cue. */
	before: string | null;
	/** Its words now; null for a removed cue. */
	after: string | null;
	/** Its times, old and new, when they moved; null when they did not. */
	times: { before: string; after: string } | null;
}

const at = (seconds: number) => formatTimestamp(Math.max(0, seconds), { hours: 'auto' });
const span = (cue: Cue) => `${at(cue.start)}–${at(cue.end)}`;

/** The rows of a diff from the library's captions to the captions now. */
export function captionChangeRows(diff: CueDiff): CaptionChangeRow[] {
	return diff.entries.map((entry) => {
		if (entry.type === 'added') {
			return {
				change: 'added',
				at: at(entry.after.start),
				before: null,
				after: plainText(entry.after.text),
				times: null
			};
		}
		if (entry.type === 'removed') {
			return {
				change: 'removed',
				at: at(entry.before.start),
				before: plainText(entry.before.text),
				after: null,
				times: null
			};
		}
		const moved = entry.fields.includes('start') || entry.fields.includes('end');
		return {
			change: 'changed',
			at: at(entry.after.start),
			before: plainText(entry.before.text),
			after: plainText(entry.after.text),
			times: moved ? { before: span(entry.before), after: span(entry.after) } : null
		};
	});
}

const count = (n: number, what: string) => `${n} ${n === 1 ? 'cue' : 'cues'} ${what}`;

/** "1 cue changed, 2 cues added": what differs, in words; empty when nothing does. */
export function captionChangeSummary(diff: CueDiff): string {
	return [
		diff.changed ? count(diff.changed, 'changed') : '',
		diff.added ? count(diff.added, 'added') : '',
		diff.removed ? count(diff.removed, 'removed') : ''
	]
		.filter(Boolean)
		.join(', ');
}
