/**
 * The studio's one-click fixes for guideline findings. Each returns a new array (the editor keeps
 * the old one for undo) and leaves the cues untouched when the fix does not apply.
 */
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
	at: number;
	cost: number;
}

/**
 * Splits a cue in two at the sentence or phrase boundary nearest its middle. Times are shared in
 * proportion to the visible characters on each side; tags open at the split are closed and reopened.
 */
export function splitCue(cues: readonly Cue[], id: string): Cue[] {
	const index = cues.findIndex((c) => c.id === id);
	if (index < 0) return [...cues];
	const cue = cues[index];
	const text = cue.text;
	const total = plainText(text).replace(/\s+/g, ' ').trim().length;
	let bestPoint: SplitPoint | null = null;
	for (const m of text.matchAll(/\s+/g)) {
		const at = m.index;
		if (insideTag(text, at)) continue;
		const left = plainText(text.slice(0, at)).trim();
		const right = plainText(text.slice(at)).trim();
		if (left === '' || right === '') continue;
		const kind = /[.!?]["'’”)]*$/.test(left)
			? 0
			: /[,;:–—]$/.test(left)
				? 0.15
				: STARTS_PHRASE.has(right.split(/\s/)[0].toLowerCase())
					? 0.3
					: 0.5;
		const balance = Math.abs(left.length - right.length) / Math.max(1, total);
		const cost = balance + kind;
		if (!bestPoint || cost < bestPoint.cost) bestPoint = { at, cost };
	}
	if (!bestPoint) return [...cues];

	const open = openTagsAt(text, bestPoint.at);
	const closing = [...open]
		.reverse()
		.map((tag) => `</${tagName(tag)}>`)
		.join('');
	const leftText = text.slice(0, bestPoint.at).replace(/\s+/g, ' ').trim() + closing;
	const rightText = open.join('') + text.slice(bestPoint.at).replace(/\s+/g, ' ').trim();
	const leftChars = plainText(leftText).length;
	const rightChars = plainText(rightText).length;
	const cut = toMillis(cue.start + ((cue.end - cue.start) * leftChars) / (leftChars + rightChars));
	const ids = new Set(cues.map((c) => c.id));
	let secondId = '';
	if (cue.id !== '') {
		let k = 2;
		while (ids.has(`${cue.id}.${k}`)) k++;
		secondId = `${cue.id}.${k}`;
	}
	return replace(
		cues,
		index,
		{ ...cue, end: cut, text: leftText },
		{ ...cue, id: secondId, start: cut, text: rightText }
	);
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
