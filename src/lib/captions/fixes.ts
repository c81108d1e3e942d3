/**
 * The studio's one-click fixes for guideline findings. Each returns a new array (the editor keeps
 * the old one for undo) and leaves the cues untouched when the fix does not apply.
 */
import { checkCues, type Finding, type FindingKind, type GuidelineProfile } from './checks';
// edit.ts builds each single fix on this file's primitives, and the fixes of a whole kind build
// on those single fixes: the two files call each other's functions, never at load time.
import { applyFix, secondsNeeded, type EditOptions } from './edit';
import { toMillis } from './timestamp';
import { plainText } from './text';
import type { Cue } from './types';

interface Word {
	raw: string;
	width: number;
}

/** Splits cue text into words, keeping tags (which may contain spaces, like <v Coach>) inside them. */
function words(text: string): Word[] {
	const out: Word[] = [];
	let current = '';
	for (const m of text.matchAll(/<[^>]*>|\s+|[^\s<]+|</g)) {
		if (/^\s/.test(m[0]) && !m[0].startsWith('<')) {
			if (current) out.push({ raw: current, width: plainText(current).length });
			current = '';
		} else current += m[0];
	}
	if (current) out.push({ raw: current, width: plainText(current).length });
	return out;
}

// Words that belong with the word after them: a line should not end on one (common practice).
const BINDS_FORWARD = new Set(
	'a an the your my his her their this that these those to of with both each and or but'.split(' ')
);
// Words that start a phrase: breaking before them reads naturally (common practice).
const STARTS_PHRASE = new Set(
	'and or but so then with to for until while because as into onto from keeping without'.split(' ')
);

function breakCost(before: Word, after: Word | undefined): number {
	const tail = plainText(before.raw);
	const last = tail.toLowerCase().replace(/[^\p{L}]/gu, '');
	const next = after
		? plainText(after.raw)
				.toLowerCase()
				.replace(/[^\p{L}]/gu, '')
		: '';
	if (/[.!?]["'’”)]*$/.test(tail)) return -60;
	if (/[,;:–—]["'’”)]*$/.test(tail)) return -40;
	if (BINDS_FORWARD.has(last)) return 40;
	if (STARTS_PHRASE.has(next)) return -15;
	return 0;
}

function chunk(word: Word, maxChars: number): Word[] {
	// Only a word longer than a whole line is cut; tagged words are left whole to keep tags intact.
	if (word.width <= maxChars || word.raw.includes('<')) return [word];
	const pieces: Word[] = [];
	for (let i = 0; i < word.raw.length; i += maxChars) {
		const raw = word.raw.slice(i, i + maxChars);
		pieces.push({ raw, width: raw.length });
	}
	return pieces;
}

/**
 * Re-flows cue text into the fewest lines of at most `maxChars` visible characters, balancing
 * their lengths and preferring breaks after punctuation and before a new phrase.
 */
export function reflowLines(text: string, maxChars: number): string {
	const list = words(text).flatMap((w) => chunk(w, maxChars));
	if (list.length === 0) return '';
	const width = (from: number, to: number) => {
		let sum = to - from - 1;
		for (let k = from; k < to; k++) sum += list[k].width;
		return sum;
	};
	const n = list.length;
	if (width(0, n) <= maxChars) return list.map((w) => w.raw).join(' ');

	let lineCount = 1;
	for (let k = 0, used = -1; k < n; k++) {
		if (used >= 0 && used + 1 + list[k].width > maxChars) {
			lineCount++;
			used = list[k].width;
		} else used = used < 0 ? list[k].width : used + 1 + list[k].width;
	}
	const target = width(0, n) / lineCount;
	// best[l][j]: cheapest way to lay the first j words on l lines.
	const best = Array.from({ length: lineCount + 1 }, () => new Array<number>(n + 1).fill(Infinity));
	const from = Array.from({ length: lineCount + 1 }, () => new Array<number>(n + 1).fill(-1));
	best[0][0] = 0;
	for (let l = 1; l <= lineCount; l++) {
		for (let j = 1; j <= n; j++) {
			for (let i = j - 1; i >= 0; i--) {
				const w = width(i, j);
				if (w > maxChars && j - i > 1) break;
				if (best[l - 1][i] === Infinity) continue;
				const breakHere = j < n ? breakCost(list[j - 1], list[j]) : 0;
				const cost = best[l - 1][i] + (w - target) ** 2 + breakHere;
				if (cost < best[l][j]) {
					best[l][j] = cost;
					from[l][j] = i;
				}
			}
		}
	}
	const lines: string[] = [];
	for (let l = lineCount, j = n; l > 0; l--) {
		const i = from[l][j];
		lines.unshift(
			list
				.slice(i, j)
				.map((w) => w.raw)
				.join(' ')
		);
		j = i;
	}
	return lines.join('\n');
}

function nextIndex(cues: readonly Cue[], index: number): number {
	let found = -1;
	cues.forEach((other, k) => {
		if (k === index || other.start < cues[index].start) return;
		if (other.start === cues[index].start && k < index) return;
		if (found < 0 || other.start < cues[found].start) found = k;
	});
	return found;
}

function replace(cues: readonly Cue[], index: number, ...with_: Cue[]): Cue[] {
	return [...cues.slice(0, index), ...with_, ...cues.slice(index + 1)];
}

/**
 * Lengthens a short cue into the gap after it, up to `minDuration`, leaving at least `minGap`
 * before the next cue; when that would leave a smaller gap, the cue runs on to the next one.
 */
export function extendIntoGap(
	cues: readonly Cue[],
	id: string,
	minDuration: number,
	minGap: number
): Cue[] {
	const index = cues.findIndex((c) => c.id === id);
	if (index < 0) return [...cues];
	const cue = cues[index];
	const wanted = cue.start + minDuration;
	if (cue.end >= wanted) return [...cues];
	const n = nextIndex(cues, index);
	let end = wanted;
	if (n >= 0) {
		const nextStart = cues[n].start;
		if (nextStart <= cue.end) return [...cues];
		if (wanted > nextStart - minGap) end = nextStart;
	}
	return replace(cues, index, { ...cue, end: toMillis(end) });
}

/** Runs a cue on to the next one when the gap between them is at most `maxGap`. */
export function closeGap(cues: readonly Cue[], id: string, maxGap: number): Cue[] {
	const index = cues.findIndex((c) => c.id === id);
	if (index < 0) return [...cues];
	const n = nextIndex(cues, index);
	if (n < 0) return [...cues];
	const gap = cues[n].start - cues[index].end;
	if (gap <= 0 || gap > maxGap) return [...cues];
	return replace(cues, index, { ...cues[index], end: cues[n].start });
}

interface SplitPoint {
	/** Where the space starts in the cue text. */
	at: number;
	/** Visible characters before and after it. */
	before: number;
	after: number;
	/** How badly the words read broken here: 0 after a sentence, 0.5 inside a phrase. */
	cost: number;
}

function splitPoints(text: string): SplitPoint[] {
	const points: SplitPoint[] = [];
	for (const m of text.matchAll(/\s+/g)) {
		const at = m.index;
		if (insideTag(text, at)) continue;
		const left = plainText(text.slice(0, at)).trim();
		const right = plainText(text.slice(at)).trim();
		if (left === '' || right === '') continue;
		const cost = /[.!?]["'’”)]*$/.test(left)
			? 0
			: /[,;:–—]$/.test(left)
				? 0.15
				: STARTS_PHRASE.has(right.split(/\s/)[0].toLowerCase())
					? 0.3
					: 0.5;
		points.push({ at, before: left.length, after: right.length, cost });
	}
	return points;
}

/**
 * Where to split `text` into `parts` parts of at most `maxChars` visible characters each: the
 * sentence and phrase boundaries that keep the parts nearest the same length. Null when no
 * choice of boundaries gives parts that short.
 */
function bestSplit(text: string, parts: number, maxChars: number): number[] | null {
	const points = splitPoints(text);
	const cuts = parts - 1;
	if (cuts < 1 || points.length < cuts) return null;
	const total = Math.max(1, plainText(text).replace(/\s+/g, ' ').trim().length);
	const mean = (total - cuts) / parts;
	const off = (length: number) => (length > maxChars ? Infinity : Math.abs(length - mean) / total);
	// cost[j][c]: the cheapest way to make j + 1 cuts, the last at point c.
	const cost = Array.from({ length: cuts }, () => new Array<number>(points.length).fill(Infinity));
	const from = Array.from({ length: cuts }, () => new Array<number>(points.length).fill(-1));
	points.forEach((p, c) => (cost[0][c] = p.cost + off(p.before)));
	for (let j = 1; j < cuts; j++) {
		for (let c = j; c < points.length; c++) {
			for (let b = j - 1; b < c; b++) {
				const value =
					cost[j - 1][b] + points[c].cost + off(points[c].before - points[b].before - 1);
				if (value < cost[j][c]) {
					cost[j][c] = value;
					from[j][c] = b;
				}
			}
		}
	}
	let last = -1;
	let best = Infinity;
	points.forEach((p, c) => {
		const value = cost[cuts - 1][c] + off(p.after);
		if (value < best) {
			best = value;
			last = c;
		}
	});
	if (last < 0) return null;
	const ats: number[] = [];
	for (let j = cuts - 1, c = last; j >= 0; c = from[j][c], j--) ats.unshift(points[c].at);
	return ats;
}

/** Cue `index` cut at the text positions `ats`, times shared by visible characters. */
function cutAt(cues: readonly Cue[], index: number, ats: number[]): Cue[] {
	const cue = cues[index];
	const text = cue.text;
	const texts: string[] = [];
	let from = 0;
	let reopen = '';
	for (const at of [...ats, text.length]) {
		// Tags open at a cut are closed before it and opened again after it.
		const open = at < text.length ? openTagsAt(text, at) : [];
		const closing = [...open]
			.reverse()
			.map((tag) => `</${tagName(tag)}>`)
			.join('');
		texts.push(reopen + text.slice(from, at).replace(/\s+/g, ' ').trim() + closing);
		reopen = open.join('');
		from = at;
	}
	const chars = texts.map((t) => plainText(t).length);
	const sum = chars.reduce((a, b) => a + b, 0);
	const ids = new Set(cues.map((c) => c.id));
	let k = 2;
	let seen = 0;
	let start = cue.start;
	const parts = texts.map((partText, p) => {
		seen += chars[p];
		const end =
			p === texts.length - 1 ? cue.end : toMillis(cue.start + ((cue.end - cue.start) * seen) / sum);
		let id = cue.id;
		if (p > 0 && cue.id !== '') {
			while (ids.has(`${cue.id}.${k}`)) k++;
			id = `${cue.id}.${k++}`;
		}
		const part = { ...cue, id, start, end, text: partText };
		start = end;
		return part;
	});
	return replace(cues, index, ...parts);
}

/**
 * Splits a cue in two at the sentence or phrase boundary nearest its middle. Times are shared in
 * proportion to the visible characters on each side; tags open at the split are closed and reopened.
 */
export function splitCue(cues: readonly Cue[], id: string): Cue[] {
	const index = cues.findIndex((c) => c.id === id);
	if (index < 0) return [...cues];
	const ats = bestSplit(cues[index].text, 2, Infinity);
	return ats ? cutAt(cues, index, ats) : [...cues];
}

function insideTag(text: string, at: number): boolean {
	const open = text.lastIndexOf('<', at);
	return open >= 0 && text.lastIndexOf('>', at) < open;
}

const tagName = (tag: string) => /^<([a-z]+)/i.exec(tag)?.[1].toLowerCase() ?? '';

function openTagsAt(text: string, at: number): string[] {
	const open: string[] = [];
	for (const m of text.slice(0, at).matchAll(/<(\/?)([a-z]+)[^>]*>/gi)) {
		if (m[1]) {
			const k = open.map(tagName).lastIndexOf(m[2].toLowerCase());
			if (k >= 0) open.splice(k);
		} else open.push(m[0]);
	}
	return open;
}

/**
 * Splits cue text in two at the space (outside tags) nearest `fraction` of its visible
 * characters, for splitting a cue at a chosen time; tags open at the split are closed and
 * reopened. Text without a usable space stays whole on the left.
 */
export function splitTextNear(text: string, fraction: number): [string, string] {
	const total = plainText(text).length;
	let best: { at: number; distance: number } | null = null;
	for (const m of text.matchAll(/\s+/g)) {
		const at = m.index;
		if (insideTag(text, at)) continue;
		const left = plainText(text.slice(0, at)).trim();
		if (left === '' || plainText(text.slice(at)).trim() === '') continue;
		// Nearness to the time comes first; a sentence or clause end nearby wins a close call.
		const pause = /[.!?]["'’”)]*$/.test(left) ? 0 : /[,;:–—]$/.test(left) ? 0.04 : 0.08;
		const distance = Math.abs(left.length / Math.max(1, total) - fraction) + pause;
		if (!best || distance < best.distance) best = { at, distance };
	}
	if (!best) return [text, ''];
	const open = openTagsAt(text, best.at);
	const closing = [...open]
		.reverse()
		.map((tag) => `</${tagName(tag)}>`)
		.join('');
	return [
		text.slice(0, best.at).trimEnd() + closing,
		open.join('') + text.slice(best.at).trimStart()
	];
}

/** The kinds of finding whose fix is mechanical enough to run on every cue at once. */
export const FIX_ALL_KINDS = [
	'reading-rate',
	'too-short',
	'too-long',
	'line-too-long',
	'too-many-lines',
	'gap-too-short'
] as const satisfies readonly FindingKind[];
export type FixAllKind = (typeof FIX_ALL_KINDS)[number];

export function canFixAll(kind: FindingKind): kind is FixAllKind {
	return (FIX_ALL_KINDS as readonly FindingKind[]).includes(kind);
}

export interface Unfixed {
	/** The cue's position in the fixed cues. */
	index: number;
	why: string;
}

export interface FixAllResult {
	cues: Cue[];
	/** Findings of the kind that the fixes removed. */
	fixed: number;
	/** Findings of the kind the checks still make on the fixed cues, each with why it stayed. */
	unfixed: Unfixed[];
}

/** A fix tried on one cue: the cues with it in place of the cue and `added` parts after it. */
type Attempt = { cues: Cue[]; added: number; action: Action } | { why: string };
type Action = 'lengthen' | 'split' | 'reflow' | 'close';

const plainWords = (cues: readonly Cue[]) =>
	cues
		.map((c) => plainText(c.text))
		.join(' ')
		.split(/\s+/)
		.filter(Boolean)
		.join(' ');
const secs = (s: number) => `${Math.round(s * 100) / 100} s`;
const visibleLength = (cue: Cue) => plainText(cue.text).replace(/\s+/g, ' ').trim().length;

/** Why a fix was refused when the checks find on its result a kind the cue did not have. */
const DOING: Record<Action, string> = {
	lengthen: 'Showing it long enough to read',
	split: 'Splitting it',
	reflow: 'Re-flowing its lines',
	close: 'Closing the gap'
};
const WOULD_LEAVE: Partial<Record<FindingKind, string>> = {
	'too-short': 'a cue on screen too briefly to read',
	'too-long': 'a cue on screen too long',
	'reading-rate': 'a cue that is read too fast',
	'gap-too-short': 'too short a gap before the next cue',
	'line-too-long': 'a line that is too long',
	'too-many-lines': 'a cue with too many lines'
};
const BY_HAND = 'The fix would break another guideline here; change it by hand.';
const WORD_TOO_LONG =
	'It has a word longer than a line, which no layout can fit; change it by hand.';

/** Shows cue `index` long enough to be read, in the free time after it, or says why it cannot. */
function lengthen(
	cues: Cue[],
	index: number,
	profile: GuidelineProfile,
	options: EditOptions
): Attempt {
	const cue = cues[index];
	const next = cues[index + 1];
	const needed = secondsNeeded(cue, profile);
	const nextStart = next ? next.start : Infinity;
	const limit = Math.min(nextStart, options.duration);
	if (limit <= cue.end) {
		return {
			why:
				nextStart <= options.duration
					? 'The next cue starts as it ends, so there is no free time to show it longer.'
					: 'It ends with the recording, so there is no free time to show it longer.'
		};
	}
	if (cue.start + needed > limit) {
		const where = nextStart <= options.duration ? 'the next cue' : 'the recording ends';
		return {
			why: `It needs ${secs(needed)} on screen; there is room for ${secs(limit - cue.start)} before ${where}.`
		};
	}
	const edit = applyFix(cues, index, 'extend-into-gap', profile, options);
	return edit.changed ? { cues: edit.cues, added: 0, action: 'lengthen' } : { why: BY_HAND };
}

function linesFit(cue: Cue, profile: GuidelineProfile): boolean {
	const lines = plainText(cue.text).split('\n');
	return (
		lines.length <= profile.maxLines.value &&
		lines.every((line) => line.length <= profile.maxCharsPerLine.value)
	);
}

/** The cue's lines re-flowed when they break the profile's limits (a split joins a cue's lines). */
function withLinesThatFit(cue: Cue, profile: GuidelineProfile): Cue {
	if (linesFit(cue, profile) || hasWordLongerThanALine(cue, profile)) return cue;
	return { ...cue, text: reflowLines(cue.text, profile.maxCharsPerLine.value) };
}

/** reflowLines cuts such a word; the fixes of a whole kind leave it whole instead. */
function hasWordLongerThanALine(cue: Cue, profile: GuidelineProfile): boolean {
	return plainText(cue.text)
		.split(/\s+/)
		.some((word) => word.length > profile.maxCharsPerLine.value);
}

/**
 * Splits cue `index` into the fewest parts, cut at sentence and phrase boundaries, that each
 * have at most `maxChars` visible characters and pass `fits` once their lines are re-flowed.
 */
function splitInParts(
	cues: Cue[],
	index: number,
	maxChars: number,
	fits: (part: Cue) => boolean,
	profile: GuidelineProfile
): Attempt {
	const text = cues[index].text;
	const points = splitPoints(text).length;
	if (points === 0) return { why: 'It has no space between words to split it at.' };
	for (let parts = 2; parts <= Math.min(points + 1, 12); parts++) {
		const ats = bestSplit(text, parts, maxChars);
		if (!ats) continue;
		const out = cutAt(cues, index, ats).map((c, k) =>
			k >= index && k < index + parts ? withLinesThatFit(c, profile) : c
		);
		if (out.slice(index, index + parts).every(fits))
			return { cues: out, added: parts - 1, action: 'split' };
	}
	return {
		why: 'No split at its sentence or phrase boundaries gives parts that meet the guidelines.'
	};
}

function attempt(
	cues: Cue[],
	finding: Finding,
	profile: GuidelineProfile,
	options: EditOptions
): Attempt {
	const index = finding.index;
	const cue = cues[index];
	const room = profile.maxCharsPerLine.value * profile.maxLines.value;
	switch (finding.kind) {
		case 'gap-too-short': {
			const edit = applyFix(cues, index, 'close-gap', profile, options);
			return edit.changed ? { cues: edit.cues, added: 0, action: 'close' } : { why: BY_HAND };
		}
		case 'too-short':
		case 'reading-rate':
			return lengthen(cues, index, profile, options);
		case 'too-long': {
			// Parts share the time by visible characters, so a part's share of them is its share of the time.
			const duration = cue.end - cue.start;
			const maxChars = Math.floor((visibleLength(cue) * profile.maxSeconds.value) / duration);
			return splitInParts(
				cues,
				index,
				maxChars,
				(c) => c.end - c.start <= profile.maxSeconds.value,
				profile
			);
		}
		case 'line-too-long':
		case 'too-many-lines': {
			if (hasWordLongerThanALine(cue, profile)) return { why: WORD_TOO_LONG };
			const reflowed = withLinesThatFit(cue, profile);
			if (linesFit(reflowed, profile)) {
				return { cues: replace(cues, index, reflowed), added: 0, action: 'reflow' };
			}
			// Too many words for the lines, however they are laid out: the cue becomes two or more.
			return splitInParts(cues, index, room, (c) => linesFit(c, profile), profile);
		}
		default:
			return { why: 'This kind is fixed by hand.' };
	}
}

/** The findings of cues `from` to `to` (exclusive), checked beside the cue before and the one after. */
function findingsAround(
	cues: readonly Cue[],
	from: number,
	to: number,
	profile: GuidelineProfile
): Finding[] {
	const low = Math.max(0, from - 1);
	return checkCues(cues.slice(low, to + 1), profile).filter(
		(f) => f.index >= from - low && f.index < to - low
	);
}

/** Why a fix tried on cue `index` may not stay, or null when it removes the finding and adds none. */
function refusal(
	before: readonly Cue[],
	index: number,
	tried: { cues: Cue[]; added: number; action: Action },
	kind: FindingKind,
	profile: GuidelineProfile
): string | null {
	const parts = tried.cues.slice(index, index + 1 + tried.added);
	if (plainWords(parts) !== plainWords([before[index]])) return BY_HAND;
	const had = new Set(findingsAround(before, index, index + 1, profile).map((f) => f.kind));
	const now = findingsAround(tried.cues, index, index + 1 + tried.added, profile);
	if (now.some((f) => f.kind === kind))
		return `${DOING[tried.action]} would not be enough; change it by hand.`;
	const broke = now.find((f) => !had.has(f.kind));
	if (!broke) return null;
	const leave = WOULD_LEAVE[broke.kind];
	return leave ? `${DOING[tried.action]} would leave ${leave}.` : BY_HAND;
}

/**
 * Fixes every finding of `kind` at once, the way each finding's own Fix would, but only where
 * the result removes the finding and breaks no other guideline: lines re-flowed (or a cue too
 * long for its lines split and re-flowed), short gaps closed, cues shown longer in the free time
 * after them, over-long cues split at phrase boundaries. Words are never lost, no cue runs past
 * the next cue's start or the end of the recording, and the checks run again on the result.
 */
export function fixAllOfKind(
	cues: readonly Cue[],
	kind: FindingKind,
	profile: GuidelineProfile,
	options: EditOptions
): FixAllResult {
	const targets = checkCues(cues, profile).filter((f) => f.kind === kind);
	const refused = (why: string): FixAllResult => ({
		cues: [...cues],
		fixed: 0,
		unfixed: targets.map((f) => ({ index: f.index, why }))
	});
	if (!canFixAll(kind)) return refused('This kind is fixed by hand.');
	// Every fix finds the next cue by position; in a track out of order that is the wrong one.
	if (cues.some((c, k) => k > 0 && c.start < cues[k - 1].start)) {
		return refused('The cues are out of order; put them in order first.');
	}

	let out = [...cues];
	let fixed = 0;
	// Reasons are kept by the refused cue itself, which no later fix replaces or moves.
	const reasons = new Map<Cue, string>();
	// From the last cue to the first: a split adds its parts after the cue it splits, so the
	// positions of the cues still to fix stay where the checks found them.
	for (const finding of [...targets].sort((a, b) => b.index - a.index)) {
		const tried = attempt(out, finding, profile, options);
		const why = 'why' in tried ? tried.why : refusal(out, finding.index, tried, kind, profile);
		if (why !== null || 'why' in tried) {
			reasons.set(out[finding.index], why ?? BY_HAND);
			continue;
		}
		out = tried.cues;
		fixed++;
	}
	const unfixed = checkCues(out, profile)
		.filter((f) => f.kind === kind)
		.map((f) => ({ index: f.index, why: reasons.get(out[f.index]) ?? BY_HAND }));
	return { cues: out, fixed, unfixed };
}
