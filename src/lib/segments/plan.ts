/**
 * The clinician's working plan of a recording's segments: interior boundaries, and for each part
 * between them a title and whether it is an exercise to keep. Pure, so the segments page and the
 * server check a plan by the same rules.
 */
import { formatTimestamp } from '../captions/timestamp';
import type { Signal, Suggestion } from '../captions/suggest';

/** The shortest segment a clinician may confirm. */
export const MIN_SEGMENT_SECONDS = 1;
export const MAX_TITLE_LENGTH = 120;
export const MAX_SEGMENTS = 100;
/** Segment ends may sit this far past the recording's probed length (container rounding). */
const END_SLACK_SECONDS = 0.001;

/** One segment to confirm: seconds into the recording, end exclusive. */
export interface PlannedSegment {
	title: string;
	start: number;
	end: number;
}

export interface DraftPart {
	title: string;
	/** Left out parts (an introduction, a closing word) are not cut. */
	include: boolean;
}

/** `parts.length === boundaries.length + 1`; boundaries sorted, strictly inside the recording. */
export interface Draft {
	boundaries: number[];
	/** For each boundary, the suggestion it was accepted from (an index), or null. */
	sources: (number | null)[];
	parts: DraftPart[];
}

export interface DraftSegment extends DraftPart {
	index: number;
	start: number;
	end: number;
}

const ms = (t: number) => Math.round(t * 1000) / 1000;

export function emptyDraft(): Draft {
	return { boundaries: [], sources: [], parts: [{ title: '', include: true }] };
}

/** The parts of a draft with their times. */
export function draftSegments(draft: Draft, durationSeconds: number): DraftSegment[] {
	const edges = [0, ...draft.boundaries, durationSeconds];
	return draft.parts.map((part, index) => ({
		...part,
		index,
		start: edges[index],
		end: edges[index + 1]
	}));
}

/** Where a boundary may go: at least MIN_SEGMENT_SECONDS from its neighbours and the ends. */
function room(draft: Draft, index: number, durationSeconds: number): [number, number] {
	const before = index > 0 ? draft.boundaries[index - 1] : 0;
	const after = index < draft.boundaries.length - 1 ? draft.boundaries[index + 1] : durationSeconds;
	return [before + MIN_SEGMENT_SECONDS, after - MIN_SEGMENT_SECONDS];
}

export type DraftChange =
	| { ok: true; draft: Draft; index: number }
	| { ok: false; message: string };

/**
 * Splits the part under `time` in two. The left keeps its title; the right takes `title` (an
 * exercise name from the captions) or starts untitled. When the very first part is split by a
 * named boundary and has no name itself, it is what comes before the first exercise (usually a
 * welcome) and is left out until the clinician includes it.
 */
export function addBoundary(
	draft: Draft,
	time: number,
	durationSeconds: number,
	title = '',
	source: number | null = null
): DraftChange {
	const t = ms(time);
	if (!(t >= MIN_SEGMENT_SECONDS && t <= durationSeconds - MIN_SEGMENT_SECONDS)) {
		return {
			ok: false,
			message: `A boundary must be at least ${MIN_SEGMENT_SECONDS} s from the start and the end.`
		};
	}
	const at = draft.boundaries.findIndex((b) => b > t);
	const index = at < 0 ? draft.boundaries.length : at;
	const before = index > 0 ? draft.boundaries[index - 1] : 0;
	const after = index < draft.boundaries.length ? draft.boundaries[index] : durationSeconds;
	if (t - before < MIN_SEGMENT_SECONDS || after - t < MIN_SEGMENT_SECONDS) {
		return {
			ok: false,
			message: `That is within ${MIN_SEGMENT_SECONDS} s of another boundary; segments must be at least ${MIN_SEGMENT_SECONDS} s long.`
		};
	}
	const split = draft.parts[index];
	const left =
		index === 0 && title && !split.title.trim() && split.include
			? { title: '', include: false }
			: split;
	const parts = [
		...draft.parts.slice(0, index),
		left,
		{ title, include: Boolean(title) || split.include || index === 0 },
		...draft.parts.slice(index + 1)
	];
	const boundaries = [...draft.boundaries.slice(0, index), t, ...draft.boundaries.slice(index)];
	const sources = [...draft.sources.slice(0, index), source, ...draft.sources.slice(index)];
	return { ok: true, draft: { boundaries, sources, parts }, index };
}

/** Moves boundary `index` to `time`, held between its neighbours with room for a segment. */
export function moveBoundary(
	draft: Draft,
	index: number,
	time: number,
	durationSeconds: number
): Draft {
	if (index < 0 || index >= draft.boundaries.length) return draft;
	const [low, high] = room(draft, index, durationSeconds);
	if (low > high) return draft;
	const boundaries = [...draft.boundaries];
	boundaries[index] = ms(Math.min(high, Math.max(low, time)));
	return { ...draft, boundaries };
}

/**
 * Removes boundary `index`, merging the parts on either side: the merged part keeps the left
 * title (or the right one when the left has none) and is kept if either was.
 */
export function removeBoundary(draft: Draft, index: number): Draft {
	if (index < 0 || index >= draft.boundaries.length) return draft;
	const left = draft.parts[index];
	const right = draft.parts[index + 1];
	const merged = {
		title: left.title.trim() ? left.title : right.title,
		include: left.include || right.include
	};
	return {
		boundaries: draft.boundaries.filter((_, i) => i !== index),
		sources: draft.sources.filter((_, i) => i !== index),
		parts: [...draft.parts.slice(0, index), merged, ...draft.parts.slice(index + 2)]
	};
}

export function updatePart(draft: Draft, index: number, change: Partial<DraftPart>): Draft {
	if (index < 0 || index >= draft.parts.length) return draft;
	return { ...draft, parts: draft.parts.map((p, i) => (i === index ? { ...p, ...change } : p)) };
}

/** Every suggestion taken as a boundary, each named part titled by its exercise name. */
export function draftFromSuggestions(
	suggestions: readonly Pick<Suggestion, 'time' | 'name'>[],
	durationSeconds: number
): Draft {
	let draft = emptyDraft();
	const order = suggestions.map((s, i) => ({ ...s, i })).sort((a, b) => a.time - b.time);
	for (const s of order) {
		const next = addBoundary(draft, s.time, durationSeconds, s.name ?? '', s.i);
		if (next.ok) draft = next.draft;
	}
	return draft;
}

/**
 * Marks boundaries that sit within MIN_SEGMENT_SECONDS of a suggestion as taken from it (nearest
 * first), so a draft rebuilt from confirmed segments shows its suggestions as accepted.
 */
export function linkSuggestions(
	draft: Draft,
	suggestions: readonly Pick<Suggestion, 'time'>[]
): Draft {
	const sources = [...draft.sources];
	const pairs = suggestions
		.flatMap((s, i) => draft.boundaries.map((b, k) => ({ i, k, distance: Math.abs(b - s.time) })))
		.filter((p) => p.distance < MIN_SEGMENT_SECONDS)
		.sort((a, b) => a.distance - b.distance);
	const taken = new Set(sources.filter((x) => x !== null));
	for (const { i, k } of pairs) {
		if (sources[k] !== null || taken.has(i)) continue;
		sources[k] = i;
		taken.add(i);
	}
	return { ...draft, sources };
}

/**
 * A draft that shows confirmed segments again, for adjusting: a boundary at every start and end
 * inside the recording; the stretches between segments are left-out parts.
 */
export function draftFromSegments(
	segments: readonly PlannedSegment[],
	durationSeconds: number
): Draft {
	const sorted = [...segments].sort((a, b) => a.start - b.start);
	const edges = [
		...new Set(
			sorted.flatMap((s) => [ms(s.start), ms(s.end)]).filter((t) => t > 0 && t < durationSeconds)
		)
	].sort((a, b) => a - b);
	const all = [0, ...edges, durationSeconds];
	const parts = all.slice(0, -1).map((start, i) => {
		const end = all[i + 1];
		const segment = sorted.find((s) => ms(s.start) <= start && ms(s.end) >= end);
		return segment ? { title: segment.title, include: true } : { title: '', include: false };
	});
	return { boundaries: edges, sources: edges.map(() => null), parts };
}

/** The segments to confirm: the kept parts, titles trimmed. */
export function planFromDraft(draft: Draft, durationSeconds: number): PlannedSegment[] {
	return draftSegments(draft, durationSeconds)
		.filter((s) => s.include)
		.map((s) => ({ title: s.title.trim(), start: s.start, end: s.end }));
}

/**
 * Everything wrong with a plan, one sentence each. `label` names segment i in those sentences
 * ("Segment 1" unless the page numbers its parts otherwise).
 */
export function planProblems(
	plan: readonly PlannedSegment[],
	durationSeconds: number,
	label: (index: number) => string = (i) => `Segment ${i + 1}`
): string[] {
	const problems: string[] = [];
	const lower = (text: string) => text.charAt(0).toLowerCase() + text.slice(1);
	if (plan.length === 0) problems.push('Keep at least one segment to confirm.');
	if (plan.length > MAX_SEGMENTS) {
		problems.push(`A recording can have at most ${MAX_SEGMENTS} segments.`);
	}
	plan.forEach((s, i) => {
		const n = label(i);
		const title = s.title.trim();
		if (!title) problems.push(`${n} needs a name.`);
		else if (title.length > MAX_TITLE_LENGTH) {
			problems.push(`${n}'s name is longer than ${MAX_TITLE_LENGTH} characters.`);
		}
		if (!(Number.isFinite(s.start) && Number.isFinite(s.end))) {
			problems.push(`${n} needs a start and an end time.`);
			return;
		}
		if (s.start < 0) problems.push(`${n} starts before the recording does.`);
		if (s.end > durationSeconds + END_SLACK_SECONDS) {
			problems.push(`${n} ends after the recording does (${formatTime(durationSeconds)}).`);
		}
		if (s.end - s.start < MIN_SEGMENT_SECONDS) {
			problems.push(`${n} is shorter than ${MIN_SEGMENT_SECONDS} s.`);
		}
		const previous = plan[i - 1];
		if (previous && s.start < previous.end - END_SLACK_SECONDS) {
			problems.push(`${n} starts before ${lower(label(i - 1))} ends; segments may not overlap.`);
		}
	});
	return problems;
}

/** m:ss.t for the page (h:mm:ss.t past an hour). */
export function formatTime(seconds: number): string {
	const s = Math.max(0, seconds);
	const text = formatTimestamp(Math.round(s * 10) / 10, { hours: 'auto' });
	// 00:12.300 → 0:12.3
	return text.replace(/^0(\d:)/, '$1').replace(/(\.\d)\d\d$/, '$1');
}

const SIGNAL_ORDER: Signal['kind'][] = [
	'announcing-phrase',
	'ordinal',
	'exercise-name-change',
	'scene-change',
	'silence',
	'long-gap'
];

/** A suggestion's signals for reading: what was said first, then the picture, then the quiet. */
export function orderedSignals(signals: readonly Signal[]): Signal[] {
	return [...signals].sort((a, b) => SIGNAL_ORDER.indexOf(a.kind) - SIGNAL_ORDER.indexOf(b.kind));
}

/** A signal in a few words, for the list beside each suggestion. */
export function signalLabel(signal: Signal): string {
	const seconds = signal.seconds !== undefined ? `${signal.seconds} s` : '';
	switch (signal.kind) {
		case 'announcing-phrase':
			return `phrase “${signal.phrase ?? ''}”`;
		case 'ordinal':
			return `counting word “${signal.phrase ?? ''}”`;
		case 'exercise-name-change':
			return `new exercise name “${signal.phrase ?? ''}”`;
		case 'long-gap':
			return `gap ${seconds} between cues`;
		case 'silence':
			return `${seconds} silence`;
		case 'scene-change':
			return 'scene change';
	}
}

/** How sure a suggestion is, in a word with its percentage. */
export function confidenceLabel(score: number): string {
	const word = score >= 0.85 ? 'high' : score >= 0.65 ? 'medium' : 'low';
	return `${word} confidence (${Math.round(score * 100)} %)`;
}
