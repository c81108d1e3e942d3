/**
 * Captions for one exercise segment, and the chapters track of a whole recording.
 */
import { toMillis } from './timestamp';
import type { Cue } from './types';

/**
 * The cues that overlap [start, end), clipped to it and shifted so the segment starts at zero.
 * A cue that straddles a boundary keeps the part inside; nothing shorter than a millisecond is kept.
 */
export function shiftAndClip(cues: readonly Cue[], start: number, end: number): Cue[] {
	const out: Cue[] = [];
	for (const cue of cues) {
		if (cue.end <= start || cue.start >= end || cue.end <= cue.start) continue;
		const from = toMillis(Math.max(cue.start, start) - start);
		const to = toMillis(Math.min(cue.end, end) - start);
		if (to > from) out.push({ ...cue, start: from, end: to });
	}
	return out;
}

export interface Segment {
	start: number;
	end: number;
	title: string;
}

/** Chapter titles are plain text (W3C WebVTT chapter title text): markup is escaped. */
function chapterTitle(title: string): string {
	return title
		.replace(/\s+/g, ' ')
		.trim()
		.replace(/&/g, '&amp;')
		.replace(/</g, '&lt;')
		.replace(/>/g, '&gt;');
}

/** A chapters track's cues from confirmed segments, in time order, ids chapter-1, chapter-2, … */
export function chaptersFromSegments(segments: readonly Segment[]): Cue[] {
	return [...segments]
		.sort((a, b) => a.start - b.start || b.end - a.end)
		.map((s, i) => ({
			id: `chapter-${i + 1}`,
			start: toMillis(s.start),
			end: toMillis(s.end),
			text: chapterTitle(s.title)
		}));
}

export interface ChapterProblem {
	cueId: string;
	index: number;
	message: string;
}

/**
 * W3C WebVTT, chapter cues: chapter cues must be in order and may not partly overlap; one may
 * sit wholly inside another (nesting). 00:00–01:00 with 00:30–01:30 is the spec's invalid example.
 */
export function validateChapters(cues: readonly Cue[]): ChapterProblem[] {
	const problems: ChapterProblem[] = [];
	const name = (i: number) => (cues[i].id ? `"${cues[i].id}"` : `${i + 1}`);
	cues.forEach((cue, i) => {
		const add = (message: string) => problems.push({ cueId: cue.id, index: i, message });
		if (cue.end <= cue.start) add(`Chapter ${name(i)} ends before it starts.`);
		if (cue.text.trim() === '') add(`Chapter ${name(i)} has no title.`);
		if (i > 0 && cue.start < cues[i - 1].start) add(`Chapter ${name(i)} is out of time order.`);
		for (let j = 0; j < i; j++) {
			const other = cues[j];
			const disjoint = other.end <= cue.start || cue.end <= other.start;
			const nested =
				(other.start <= cue.start && cue.end <= other.end) ||
				(cue.start <= other.start && other.end <= cue.end);
			if (!disjoint && !nested) {
				add(
					`Chapter ${name(i)} partly overlaps chapter ${name(j)}; chapters may only sit one inside another.`
				);
			}
		}
	});
	return problems;
}
