/**
 * A segment's cues read as one running text, so that a phrase split across two captions ("lie on
 * your" / "back") is still found, and every character found can be traced back to its cue.
 */
import { plainText } from '$lib/captions/text';
import type { Cue } from '$lib/captions/types';

/** Where drafted words came from, for the screen to show "from: 'lying on your back'". */
export interface DraftSource {
	/** Index in the cues given to the draft (the first cue the words are in). */
	cueIndex: number;
	cueId: string;
	/** Seconds, from the start of the first cue to the end of the last cue holding the words. */
	start: number;
	end: number;
	/** The words as they were captioned, without markup. */
	words: string;
}

export interface Span {
	from: number;
	to: number;
}

export interface Transcript {
	cues: readonly Cue[];
	/** What was said, markup removed and spaces collapsed, cue after cue in time order. */
	said: string;
	/** `said` for matching: the same length, so an offset in one is the same place in the other. */
	text: string;
	/** Where each cue's words are in the text, with the cue's index in `cues`. */
	pieces: readonly (Span & { cueIndex: number })[];
}

const isLetter = (ch: string | undefined) => ch !== undefined && /\p{L}/u.test(ch);

/**
 * Lower case, straight apostrophes, and a hyphen between letters read as a space ("side-lying" is
 * "side lying", "rolled-up" is "rolled up"), keeping every character where it was.
 */
export function matchingForm(text: string): string {
	let out = '';
	for (let i = 0; i < text.length; i++) {
		const ch = text[i];
		const lower = ch.toLowerCase();
		if (ch === '’' || ch === '‘') out += "'";
		else if ((ch === '-' || ch === '‐') && isLetter(text[i - 1]) && isLetter(text[i + 1]))
			out += ' ';
		// A character whose lower case is longer (rare) stays as it is, so offsets still line up.
		else out += lower.length === ch.length ? lower : ch;
	}
	return out;
}

/** The cues as one text, in time order (ties keep the given order). */
export function transcriptOf(cues: readonly Cue[]): Transcript {
	const order = cues
		.map((cue, index) => ({ cue, index }))
		.sort((a, b) => a.cue.start - b.cue.start || a.index - b.index);
	let said = '';
	const pieces: (Span & { cueIndex: number })[] = [];
	for (const { cue, index } of order) {
		const words = plainText(cue.text).replace(/\s+/g, ' ').trim();
		if (!words) continue;
		if (said) said += ' ';
		pieces.push({ cueIndex: index, from: said.length, to: said.length + words.length });
		said += words;
	}
	return { cues, said, text: matchingForm(said), pieces };
}

/** The cues and words behind a stretch of the transcript. */
export function sourceOf(transcript: Transcript, span: Span): DraftSource {
	const inside = transcript.pieces.filter((p) => p.from < span.to && span.from < p.to);
	const first = inside[0] ?? transcript.pieces[0];
	const last = inside.at(-1) ?? first;
	const firstCue = transcript.cues[first.cueIndex];
	return {
		cueIndex: first.cueIndex,
		cueId: firstCue.id,
		start: firstCue.start,
		end: transcript.cues[last.cueIndex].end,
		words: transcript.said.slice(span.from, span.to).trim()
	};
}

/** The pieces (cue stretches) a span touches, first to last. */
export function piecesOf(transcript: Transcript, span: Span): Span[] {
	return transcript.pieces.filter((p) => p.from < span.to && span.from < p.to);
}

/** Sentences: stretches between full stops, question and exclamation marks and semicolons. */
export function sentencesOf(transcript: Transcript): Span[] {
	const out: Span[] = [];
	for (const m of transcript.text.matchAll(/[^.!?;]+/g)) {
		const lead = m[0].length - m[0].trimStart().length;
		const from = m.index + lead;
		const to = m.index + m[0].trimEnd().length;
		if (to > from) out.push({ from, to });
	}
	return out;
}

const escapeRegex = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

/**
 * A sentence cut into clauses before each break word ("…a stretch, but it shouldn't hurt"). A break
 * written with a leading comma (", so") only counts after a comma.
 */
export function clausesOf(
	transcript: Transcript,
	sentence: Span,
	breaks: readonly string[]
): Span[] {
	const text = transcript.text.slice(sentence.from, sentence.to);
	const cuts = new Set<number>();
	for (const entry of breaks) {
		const needsComma = entry.trimStart().startsWith(',');
		const word = escapeRegex(matchingForm(entry.replace(/^\s*,/, '').trim()));
		if (!word) continue;
		const pattern = new RegExp(`${needsComma ? ',\\s*' : '[\\s,]+'}(${word})(?=[\\s,])`, 'gu');
		for (const m of text.matchAll(pattern)) cuts.add(m.index + m[0].length - m[1].length);
	}
	const bounds = [0, ...[...cuts].sort((a, b) => a - b), text.length];
	const out: Span[] = [];
	for (let i = 0; i + 1 < bounds.length; i++) {
		const piece = text.slice(bounds[i], bounds[i + 1]);
		const from = sentence.from + bounds[i] + (piece.length - piece.trimStart().length);
		const to = sentence.from + bounds[i] + piece.replace(/[\s,]+$/, '').length;
		if (to > from) out.push({ from, to });
	}
	return out;
}
