/**
 * The studio's editing operations on a track's cues, kept pure so they can be tested alone.
 * Every operation takes cues sorted by start time and returns them still sorted; none of them
 * makes an overlap that was not there, or a cue that ends before it starts. An operation that
 * cannot apply returns the same array with `changed: false` and a sentence saying why.
 *
 * Cues keep any extra fields they carry (the studio's row keys) through every edit; a cue made
 * by an edit has none, and the second half of a split carries a copy of the first's.
 */
import type { FixKind, GuidelineProfile } from './checks';
import { closeGap, extendIntoGap, reflowLines, splitCue, splitTextNear } from './fixes';
import { countPlainWords, plainText } from './text';
import { formatTimestamp, toMillis } from './timestamp';
import type { Cue } from './types';

/** The shortest cue an edit will make: shorter ones cannot be read at all (common practice). */
export const MIN_CUE_SECONDS = 0.1;
/** How long a new cue lasts until its end is marked. */
export const NEW_CUE_SECONDS = 2;
/** One frame when a recording's frame rate is unknown: 25 per second, the common PAL rate. */
export const FALLBACK_FRAME_RATE = 25;

export type Edge = 'start' | 'end';

export interface Edit {
	cues: Cue[];
	/** The cue the edit acted on, to select next; -1 when there is none. */
	index: number;
	changed: boolean;
	/** Why nothing changed, or how the edit differs from what was asked. */
	note?: string;
}

export interface EditOptions {
	/** Length of the recording: no cue runs past it. */
	duration: number;
}

export interface Snap {
	/** Times an edge may jump to: other cues' edges and the playhead. */
	targets: readonly number[];
	/** How close (in seconds) an edge must come to a target to jump to it. */
	tolerance: number;
}

const at = (seconds: number) => formatTimestamp(Math.max(0, seconds), { hours: 'auto' });

function unchanged(cues: readonly Cue[], index: number, note: string): Edit {
	return { cues: cues as Cue[], index, changed: false, note };
}

function replaced(cues: readonly Cue[], index: number, cue: Cue, note?: string): Edit {
	const old = cues[index];
	if (old.start === cue.start && old.end === cue.end && old.text === cue.text) {
		return { cues: cues as Cue[], index, changed: false, ...(note ? { note } : {}) };
	}
	const next = [...cues];
	next[index] = cue;
	return { cues: next, index, changed: true, ...(note ? { note } : {}) };
}

const clamp = (value: number, low: number, high: number) => Math.min(Math.max(value, low), high);

/** Seconds in one frame at `frameRate` (the fallback rate when it is unknown). */
export function frameSeconds(frameRate: number | null | undefined): number {
	return 1 / (frameRate && frameRate > 0 ? frameRate : FALLBACK_FRAME_RATE);
}

/** The cue on screen at `time`: the last one whose start is at or before it and whose end is after. */
export function cueAt(cues: readonly Cue[], time: number): number {
	for (let k = cues.length - 1; k >= 0; k--) {
		if (cues[k].start <= time && time < cues[k].end) return k;
	}
	return -1;
}

/** Where a cue starting at `start` goes to keep the order: after every cue starting at or before it. */
export function insertionIndex(cues: readonly Cue[], start: number): number {
	let k = 0;
	while (k < cues.length && cues[k].start <= start) k++;
	return k;
}

/** `time`, or the nearest target within `tolerance` of it. */
export function snapTime(time: number, snap: Snap | undefined): number {
	if (!snap) return time;
	let best = time;
	let distance = snap.tolerance;
	for (const target of snap.targets) {
		const d = Math.abs(target - time);
		if (d <= distance) {
			best = target;
			distance = d;
		}
	}
	return best;
}

/** What an edge of cue `index` may snap to: every other cue's edges, plus `extra` (the playhead). */
export function snapTargets(cues: readonly Cue[], index: number, extra: number[] = []): number[] {
	const targets = [...extra];
	cues.forEach((cue, k) => {
		if (k !== index) targets.push(cue.start, cue.end);
	});
	return targets;
}

/**
 * How far cue `index` may reach without making an overlap or breaking the order: its start no
 * earlier than `low`, its end no later than `high`. An overlap that is already there is kept, not
 * made worse.
 */
function room(
	cues: readonly Cue[],
	index: number,
	duration: number
): { low: number; high: number } {
	const cue = cues[index];
	let low = 0;
	for (let k = 0; k < index; k++) low = Math.max(low, cues[k].end, cues[k].start);
	low = Math.min(low, cue.start);
	let high = Number.isFinite(duration) ? duration : Infinity;
	if (index + 1 < cues.length) high = Math.min(high, cues[index + 1].start);
	high = Math.max(high, cue.end);
	return { low, high };
}

/** Moves cue `index` to start at `start` (snapping either edge), keeping its length and its neighbours' room. */
export function moveCue(
	cues: readonly Cue[],
	index: number,
	start: number,
	options: EditOptions & { snap?: Snap }
): Edit {
	const cue = cues[index];
	if (!cue) return unchanged(cues, index, 'There is no such cue.');
	const length = Math.max(0, cue.end - cue.start);
	let wanted = start;
	if (options.snap) {
		// Whichever edge lands nearer a target decides; an edge near none has no say.
		const startTo = snapTime(start, options.snap);
		const endTo = snapTime(start + length, options.snap);
		const dStart = startTo === start ? Infinity : Math.abs(startTo - start);
		const dEnd = endTo === start + length ? Infinity : Math.abs(endTo - (start + length));
		if (dStart <= dEnd && dStart !== Infinity) wanted = startTo;
		else if (dEnd !== Infinity) wanted = endTo - length;
	}
	// Whole milliseconds, so rounding can never push the end past the room it was given.
	const { low, high } = room(cues, index, options.duration);
	const ms = (seconds: number) => Math.round(seconds * 1000);
	const lengthMs = ms(length);
	const latestMs = Math.max(ms(low), Number.isFinite(high) ? ms(high) - lengthMs : Infinity);
	const startMs = clamp(ms(wanted), ms(low), latestMs);
	const note =
		Math.abs(startMs - ms(wanted)) > 0
			? 'Stopped where it would have covered another cue.'
			: undefined;
	return replaced(
		cues,
		index,
		{ ...cue, start: startMs / 1000, end: (startMs + lengthMs) / 1000 },
		note
	);
}

/** Moves one edge of cue `index` to `time` (snapped), keeping at least MIN_CUE_SECONDS and its neighbours' room. */
export function resizeCue(
	cues: readonly Cue[],
	index: number,
	edge: Edge,
	time: number,
	options: EditOptions & { snap?: Snap }
): Edit {
	const cue = cues[index];
	if (!cue) return unchanged(cues, index, 'There is no such cue.');
	const wanted = snapTime(time, options.snap);
	const { low, high } = room(cues, index, options.duration);
	let value: number;
	let limit: string | undefined;
	if (edge === 'start') {
		let latest = Math.max(cue.end - MIN_CUE_SECONDS, Math.min(cue.start, cue.end));
		if (index + 1 < cues.length) latest = Math.min(latest, cues[index + 1].start);
		latest = Math.max(latest, low);
		value = toMillis(clamp(wanted, low, latest));
		if (wanted < low - 0.0005) {
			limit =
				low > 0
					? `Starts where the cue before ends (${at(low)}).`
					: 'Starts where the recording starts.';
		} else if (wanted > latest + 0.0005) limit = 'Kept the shortest length a cue may have.';
	} else {
		const earliest = Math.min(cue.start + MIN_CUE_SECONDS, Math.max(cue.end, cue.start));
		value = toMillis(clamp(wanted, earliest, Math.max(high, earliest)));
		if (wanted > high + 0.0005) {
			limit =
				index + 1 < cues.length && high === cues[index + 1].start
					? `Ends where the next cue starts (${at(high)}).`
					: `Ends where the recording ends (${at(high)}).`;
		} else if (wanted < earliest - 0.0005) limit = 'Kept the shortest length a cue may have.';
	}
	return replaced(cues, index, { ...cue, [edge]: value }, limit);
}

/** Moves one edge of cue `index` by `delta` seconds (a tenth of a second, or a frame). */
export function nudgeEdge(
	cues: readonly Cue[],
	index: number,
	edge: Edge,
	delta: number,
	options: EditOptions
): Edit {
	const cue = cues[index];
	if (!cue) return unchanged(cues, index, 'Select a cue first.');
	return resizeCue(cues, index, edge, cue[edge] + delta, options);
}

/** A new empty cue at `time`, lasting NEW_CUE_SECONDS or until the next cue or the recording's end. */
export function newCueAt(
	cues: readonly Cue[],
	time: number,
	options: EditOptions & { length?: number }
): Edit {
	const start = toMillis(Math.max(0, time));
	const covering = cueAt(cues, start);
	if (covering >= 0) {
		return unchanged(
			cues,
			covering,
			`A cue already covers ${at(start)}. Split it, or move the playhead to a gap.`
		);
	}
	const index = insertionIndex(cues, start);
	let end = start + (options.length ?? NEW_CUE_SECONDS);
	if (index < cues.length) end = Math.min(end, cues[index].start);
	if (Number.isFinite(options.duration)) end = Math.min(end, options.duration);
	end = toMillis(end);
	if (end - start < MIN_CUE_SECONDS - 0.0005) {
		return unchanged(cues, -1, `There is no room for a cue at ${at(start)}.`);
	}
	const cue: Cue = { id: '', start, end, text: '' };
	return { cues: [...cues.slice(0, index), cue, ...cues.slice(index)], index, changed: true };
}

/**
 * "Mark start" at `time`: the cue on screen then (the selected one first) starts there; with no
 * cue on screen, a new one begins.
 */
export function markStart(
	cues: readonly Cue[],
	time: number,
	options: EditOptions & { selected?: number | null }
): Edit {
	const inside = (k: number) => cues[k] && cues[k].start <= time && time < cues[k].end;
	const target =
		options.selected != null && inside(options.selected) ? options.selected : cueAt(cues, time);
	if (target < 0) return newCueAt(cues, time, options);
	return resizeCue(cues, target, 'start', time, options);
}

/** "Mark end" at `time`: the selected cue (or the last one starting before `time`) ends there. */
export function markEnd(
	cues: readonly Cue[],
	time: number,
	options: EditOptions & { selected?: number | null }
): Edit {
	let target = -1;
	if (options.selected != null && cues[options.selected]?.start < time) target = options.selected;
	else for (let k = 0; k < cues.length && cues[k].start < time; k++) target = k;
	if (target < 0)
		return unchanged(cues, -1, 'No cue starts before the playhead: mark a start first.');
	return resizeCue(cues, target, 'end', time, options);
}

/** The next free identifier after splitting the cue `id` ("intro" → "intro.2"); none for none. */
function secondId(cues: readonly Cue[], id: string): string {
	if (id === '') return '';
	const ids = new Set(cues.map((c) => c.id));
	let k = 2;
	while (ids.has(`${id}.${k}`)) k++;
	return `${id}.${k}`;
}

/** Splits cue `index` at `time`; its words are shared at the space nearest the same proportion. */
export function splitAt(cues: readonly Cue[], index: number, time: number): Edit {
	const cue = cues[index];
	if (!cue) return unchanged(cues, index, 'There is no cue at the playhead to split.');
	const cut = toMillis(time);
	if (cut < cue.start + MIN_CUE_SECONDS || cut > cue.end - MIN_CUE_SECONDS) {
		return unchanged(
			cues,
			index,
			`Move the playhead inside the cue (${at(cue.start)} to ${at(cue.end)}) to split it.`
		);
	}
	const [left, right] = splitTextNear(cue.text, (cut - cue.start) / (cue.end - cue.start));
	const first: Cue = { ...cue, end: cut, text: left };
	const second: Cue = { ...cue, id: secondId(cues, cue.id), start: cut, text: right };
	return {
		cues: [...cues.slice(0, index), first, second, ...cues.slice(index + 1)],
		index,
		changed: true
	};
}

/** Joins cue `index` with the one after it: one cue from the first's start to the later end, text on two lines. */
export function mergeWithNext(cues: readonly Cue[], index: number): Edit {
	const cue = cues[index];
	const next = cues[index + 1];
	if (!cue) return unchanged(cues, index, 'Select a cue first.');
	if (!next)
		return unchanged(cues, index, 'This is the last cue: there is nothing after it to join.');
	const text = [cue.text.trim(), next.text.trim()].filter(Boolean).join('\n');
	const merged: Cue = { ...cue, end: Math.max(cue.end, next.end), text };
	return {
		cues: [...cues.slice(0, index), merged, ...cues.slice(index + 2)],
		index,
		changed: true
	};
}

export function removeCue(cues: readonly Cue[], index: number): Edit {
	if (!cues[index]) return unchanged(cues, index, 'Select a cue first.');
	const next = [...cues.slice(0, index), ...cues.slice(index + 1)];
	return { cues: next, index: Math.min(index, next.length - 1), changed: true };
}

export function setText(cues: readonly Cue[], index: number, text: string): Edit {
	const cue = cues[index];
	if (!cue) return unchanged(cues, index, 'There is no such cue.');
	return replaced(cues, index, { ...cue, text });
}

/**
 * Sets both times as typed. Unlike dragging, typed times may overlap another cue (the checks
 * say so); the cue moves to its place in the order, and an end not after the start is refused.
 */
export function setTimes(
	cues: readonly Cue[],
	index: number,
	start: number,
	end: number,
	options: EditOptions
): Edit {
	const cue = cues[index];
	if (!cue) return unchanged(cues, index, 'There is no such cue.');
	const s = toMillis(start);
	const e = toMillis(end);
	if (!(s >= 0) || !Number.isFinite(e))
		return unchanged(cues, index, 'Give times of zero or more.');
	if (e <= s) return unchanged(cues, index, `The end must come after the start (${at(s)}).`);
	if (Number.isFinite(options.duration) && s >= options.duration) {
		return unchanged(cues, index, `The recording ends at ${at(options.duration)}.`);
	}
	if (s === cue.start && e === cue.end) return { cues: cues as Cue[], index, changed: false };
	const rest = [...cues.slice(0, index), ...cues.slice(index + 1)];
	const place = insertionIndex(rest, s);
	return {
		cues: [...rest.slice(0, place), { ...cue, start: s, end: e }, ...rest.slice(place)],
		index: place,
		changed: true
	};
}

/**
 * How long a cue must stay on screen to be read within the profile: its minimum duration, and
 * long enough for its words at the target rate and its characters at the top rate.
 */
export function secondsNeeded(cue: Cue, profile: GuidelineProfile): number {
	const plain = plainText(cue.text);
	const words = countPlainWords(plain);
	const chars = plain.replace(/\n/g, ' ').length;
	const needed = Math.max(
		profile.minSeconds.value,
		(words * 60) / profile.targetWordsPerMinute.value,
		chars / profile.maxCharsPerSecond.value
	);
	return Math.ceil(needed * 1000) / 1000;
}

/**
 * Runs a fix from fixes.ts (which finds its cue by identifier) on cue `index`, which may have an
 * empty or repeated identifier: the cue gets a stand-in identifier for the call and its own back after.
 */
function byPosition(
	cues: readonly Cue[],
	index: number,
	fix: (cues: Cue[], id: string) => Cue[]
): Cue[] | null {
	const original = cues[index].id;
	let temp = '\u0000fix';
	while (cues.some((c) => c.id === temp || c.id.startsWith(`${temp}.`))) temp += '\u0000';
	const marked = cues.map((c, k) => (k === index ? { ...c, id: temp } : c));
	const out = fix(marked, temp);
	if (out.length === marked.length && out.every((c, k) => c === marked[k])) return null;
	const second = secondId(cues, original);
	return out.map((c) =>
		c.id === temp ? { ...c, id: original } : c.id.startsWith(`${temp}.`) ? { ...c, id: second } : c
	);
}

/** Applies the fix a finding offers to cue `index`, with the numbers of `profile`. */
export function applyFix(
	cues: readonly Cue[],
	index: number,
	fix: FixKind,
	profile: GuidelineProfile,
	options: EditOptions
): Edit {
	const cue = cues[index];
	if (!cue) return unchanged(cues, index, 'There is no such cue.');
	const nothing = 'This fix could not change the cue; change it by hand.';
	if (fix === 'reflow-lines') {
		const edit = setText(cues, index, reflowLines(cue.text, profile.maxCharsPerLine.value));
		return edit.changed ? edit : { ...edit, note: nothing };
	}
	let out: Cue[] | null = null;
	if (fix === 'extend-into-gap') {
		const needed = secondsNeeded(cue, profile);
		out = byPosition(cues, index, (c, id) =>
			extendIntoGap(c, id, needed, profile.minGapSeconds.value)
		);
		if (out && Number.isFinite(options.duration) && out[index].end > options.duration) {
			const end = toMillis(Math.max(options.duration, cue.end));
			out = end === cue.end ? null : out.map((c, k) => (k === index ? { ...c, end } : c));
		}
	} else if (fix === 'split-cue') {
		out = byPosition(cues, index, splitCue);
	} else if (fix === 'close-gap') {
		out = byPosition(cues, index, (c, id) => closeGap(c, id, profile.minGapSeconds.value));
	}
	if (!out) return unchanged(cues, index, nothing);
	// A fix changes one cue's times or splits it in place; sorting again keeps the order promise.
	const order = out.map((c, k) => ({ c, k })).sort((a, b) => a.c.start - b.c.start || a.k - b.k);
	const sorted = order.map((o) => o.c);
	const moved = order.findIndex((o) => o.k === index);
	return { cues: sorted, index: moved, changed: true };
}

/**
 * Seconds for a time typed by a person: "1:02.5", "00:01:02.500", "62.5" or "62,5"; null when
 * it is not a time. More lenient than a WebVTT timestamp, which needs exactly three decimals.
 */
export function parseTypedTime(text: string): number | null {
	const parts = text.trim().replace(',', '.').split(':');
	if (parts.length > 3 || parts.some((p) => p === '')) return null;
	const seconds = parts.pop()!;
	if (!/^\d+(\.\d{1,3})?$/.test(seconds) || parts.some((p) => !/^\d+$/.test(p))) return null;
	const [hours, minutes] = parts.length === 2 ? parts.map(Number) : [0, Number(parts[0] ?? 0)];
	if (parts.length > 0 && Number(seconds) >= 60) return null;
	if (parts.length === 2 && minutes >= 60) return null;
	return toMillis(hours * 3600 + minutes * 60 + Number(seconds));
}
