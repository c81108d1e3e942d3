/**
 * Proposes an exercise from the captions of its segment: title, position, equipment, movement type,
 * side, body region, dosage and a safety-notes draft. Each proposal carries the words it came from,
 * and a field the narration does not settle is left empty — a wrong proposal costs the clinician
 * more than a missing one, so conflicting evidence gives no proposal. Nothing here is advice: the
 * drafts only repeat what was said, and nothing is saved until the clinician confirms.
 *
 * The words looked for are data (./vocabulary/en.json); this module only knows how to weigh them.
 */
import type { Cue } from '$lib/captions/types';
import { DOSAGE_FIELDS, DOSAGE_LIMITS, type DosageField } from '$lib/dosage/types';
import type { ExerciseSide, MovementType, Position } from '$lib/exercises/vocabulary';
import { matchAll, patternCompiler, type PatternCompiler, type PatternMatch } from './patterns';
import {
	clausesOf,
	piecesOf,
	sentencesOf,
	sourceOf,
	transcriptOf,
	type DraftSource,
	type Span,
	type Transcript
} from './transcript';
import { englishVocabulary, type DraftVocabulary } from './vocabulary';

export type { DraftSource } from './transcript';

/** A proposed value and the caption words it came from (first mention first). */
export interface Proposal<T> {
	value: T;
	from: DraftSource[];
}

/**
 * A dosage number as said: one value, or a range the clinician settles ("a few times a day",
 * "eight to ten") — never silently turned into one number.
 */
export type DraftAmount =
	| { kind: 'exact'; value: number }
	| { kind: 'range'; min: number; max: number; needsChoice: true };

export type DosageDraft = Partial<Record<DosageField, Proposal<DraftAmount>>>;

export interface SafetyNotesDraft {
	/** A Markdown bullet list of the cautions as said (to be sanitised where it is shown). */
	markdown: string;
	notes: Proposal<string>[];
}

export interface ExerciseDraft {
	title: Proposal<string> | null;
	/** A BODY_REGIONS label where one fits. */
	bodyRegion: Proposal<string> | null;
	position: Proposal<Position> | null;
	/** EQUIPMENT_SUGGESTIONS labels where one fits, in the order first mentioned. */
	equipment: Proposal<string>[];
	movementType: Proposal<MovementType> | null;
	side: Proposal<ExerciseSide> | null;
	dosage: DosageDraft;
	/** Dosage fields proposed as a range, which the clinician must settle before saving. */
	needsChoice: DosageField[];
	safetyNotes: SafetyNotesDraft | null;
}

/** One reading of a segment: its transcript, the vocabulary and what each sentence is. */
interface Reading {
	transcript: Transcript;
	vocabulary: DraftVocabulary;
	compiler: PatternCompiler;
	sentences: Span[];
	/** Sentences that offer an option or a later progression, whose words are not this exercise. */
	alternativeSentences: Span[];
}

interface Found<T> extends Span {
	value: T;
}

const overlaps = (a: Span, b: Span) => a.from < b.to && b.from < a.to;
const byStart = (a: Span, b: Span) => a.from - b.from;

/** A record's entries with its key type kept (Object.entries only promises strings). */
const entriesOf = <K extends string, V>(record: Partial<Record<K, V>>) =>
	Object.entries(record) as [K, V][];

const isDosageField = (name: string): name is DosageField =>
	(DOSAGE_FIELDS as readonly string[]).includes(name);

/** The last few words before `at` in its clause (a comma or sentence mark ends the look back). */
function wordsBefore(reading: Reading, at: number, count: number): string[] {
	const text = reading.transcript.text.slice(0, at);
	const clauseStart = Math.max(...[',', '.', '!', '?', ';', ':'].map((m) => text.lastIndexOf(m)));
	const words = text.slice(clauseStart + 1).match(/[\p{L}\p{N}']+/gu) ?? [];
	return words.slice(-count);
}

/** Whether one of `phrases` is among the words just before `at` (apostrophes ignored). */
function saidJustBefore(
	reading: Reading,
	at: number,
	phrases: readonly string[],
	count: number,
	atEnd: boolean
): boolean {
	const plain = (s: string) => s.toLowerCase().replace(/['’]/g, '').replace(/\s+/g, ' ').trim();
	const window = ` ${plain(wordsBefore(reading, at, count).join(' '))} `;
	return phrases.some((p) => {
		const phrase = ` ${plain(p)} `;
		return atEnd ? window.endsWith(phrase) : window.includes(phrase);
	});
}

const NEGATION_WINDOW_WORDS = 3;
const LEAD_IN_WINDOW_WORDS = 2;

interface SayOptions {
	/** Skip a phrase offered as an alternative ("… or sitting"). */
	leadIns?: boolean;
	/** Keep negated phrases too: "don't arch your back" still talks about the back. */
	keepNegated?: boolean;
	substitutions?: Readonly<Record<string, readonly string[]>>;
}

/**
 * Where the templates were said, leaving out phrases that were negated ("don't lift it yourself")
 * and phrases in a sentence about an option or a later progression.
 */
function said(
	reading: Reading,
	templates: readonly string[],
	options: SayOptions = {}
): PatternMatch[] {
	const { vocabulary, compiler, transcript } = reading;
	const out: PatternMatch[] = [];
	for (const template of templates) {
		for (const m of matchAll(compiler.compile(template, options.substitutions), transcript.text)) {
			if (reading.alternativeSentences.some((s) => s.from <= m.from && m.from < s.to)) continue;
			if (
				!options.keepNegated &&
				saidJustBefore(reading, m.from, vocabulary.negators, NEGATION_WINDOW_WORDS, false)
			)
				continue;
			if (
				options.leadIns &&
				saidJustBefore(reading, m.from, vocabulary.alternativeLeadIns, LEAD_IN_WINDOW_WORDS, true)
			)
				continue;
			out.push(m);
		}
	}
	return out;
}

/** Every value's phrases, found; where two overlap the longer wins ("rolled towel" over "towel"). */
function findValues<K extends string>(
	reading: Reading,
	phrasesByValue: Partial<Record<K, string[]>>,
	options: SayOptions = {}
): Found<K>[] {
	const found: Found<K>[] = [];
	for (const [value, templates] of entriesOf(phrasesByValue)) {
		for (const m of said(reading, templates, options))
			found.push({ value, from: m.from, to: m.to });
	}
	const kept: Found<K>[] = [];
	const longestFirst = [...found].sort((a, b) => b.to - b.from - (a.to - a.from) || byStart(a, b));
	for (const f of longestFirst) if (!kept.some((k) => overlaps(k, f))) kept.push(f);
	return kept.sort(byStart);
}

/** Found values grouped into proposals, in the order each value was first said. */
function proposals<T>(reading: Reading, found: readonly Found<T>[]): Proposal<T>[] {
	const out: Proposal<T>[] = [];
	for (const f of [...found].sort(byStart)) {
		const source = sourceOf(reading.transcript, f);
		const known = out.find((p) => p.value === f.value);
		if (known) known.from.push(source);
		else out.push({ value: f.value, from: [source] });
	}
	return out;
}

/** The value with the most evidence, or null when two values have the same amount. */
function clearWinner<T>(candidates: Proposal<T>[]): Proposal<T> | null {
	const ranked = [...candidates].sort((a, b) => b.from.length - a.from.length);
	if (ranked.length === 0) return null;
	if (ranked.length > 1 && ranked[1].from.length === ranked[0].from.length) return null;
	return ranked[0];
}

function draftTitle(reading: Reading): Proposal<string> | null {
	const { transcript, vocabulary, compiler } = reading;
	const text = transcript.text;
	const lower = (list: readonly string[]) => new Set(list.map((w) => w.toLowerCase()));
	const skip = lower(vocabulary.titleSkipWords);
	const stop = lower(vocabulary.titleStopWords);
	const reject = lower(vocabulary.titleRejectWords);
	const announcements = vocabulary.titleAnnouncing
		.flatMap((t) => matchAll(compiler.compile(t), text))
		.sort(byStart);
	for (const announcement of announcements) {
		let start = announcement.to;
		while (start < text.length && /[\s,:\-–—]/.test(text[start])) start++;
		let end = start;
		while (end < text.length && !/[.!?;,:()]/.test(text[end])) end++;
		// Words as said, so a hyphenated name ("side-lying") stays one word.
		let words = [...transcript.said.slice(start, end).matchAll(/[\p{L}\p{N}'’-]+/gu)].map((m) => ({
			word: m[0].toLowerCase().replace(/’/g, "'"),
			from: start + m.index,
			to: start + m.index + m[0].length
		}));
		while (words.length > 0 && skip.has(words[0].word)) words = words.slice(1);
		const stopAt = words.findIndex((w, i) => i > 0 && stop.has(w.word));
		if (stopAt > 0) words = words.slice(0, stopAt);
		const first = words[0];
		const last = words.at(-1);
		if (!first || !last || words.length > vocabulary.titleMaxWords) continue;
		// "Now we'll do ten of those" or "let's do it again" announce no name.
		const notAName = words.some(
			(w) => reject.has(w.word) || /\d/.test(w.word) || Object.hasOwn(vocabulary.numbers, w.word)
		);
		if (notAName) continue;
		const name = transcript.said.slice(first.from, last.to).toLowerCase();
		return {
			value: name.charAt(0).toUpperCase() + name.slice(1),
			from: [sourceOf(transcript, { from: announcement.from, to: last.to })]
		};
	}
	return null;
}

function draftPosition(reading: Reading): Proposal<Position> | null {
	const found = findValues(reading, reading.vocabulary.position, { leadIns: true });
	// The first position said is where the exercise starts ("sit … then stand up").
	const start = found[0];
	return start
		? proposals(
				reading,
				found.filter((f) => f.value === start.value)
			)[0]
		: null;
}

function draftMovementType(reading: Reading): Proposal<MovementType> | null {
	// Phrases that say how the movement is made outweigh verbs that only suggest it.
	for (const tier of [reading.vocabulary.movementSpecific, reading.vocabulary.movementGeneral]) {
		const found = findValues(reading, tier);
		if (found.length > 0) return clearWinner(proposals(reading, found));
	}
	return null;
}

function draftSide(reading: Reading): Proposal<ExerciseSide> | null {
	const candidates = proposals(reading, findValues(reading, reading.vocabulary.side));
	const of = (side: ExerciseSide) => candidates.find((c) => c.value === side);
	// Both sides said outright settles it; a named side beats "the operated one"; left and right
	// together without "both" (one arm helping the other) settle nothing.
	const both = of('both');
	if (both) return both;
	const left = of('left');
	const right = of('right');
	if (left && right) return null;
	return left ?? right ?? of('either') ?? null;
}

function draftBodyRegion(reading: Reading): Proposal<string> | null {
	const { vocabulary } = reading;
	const labels = new Set([
		...Object.keys(vocabulary.bodyRegionWords),
		...Object.keys(vocabulary.bodyRegionPhrases)
	]);
	const candidates: Proposal<string>[] = [];
	for (const label of labels) {
		const nouns = vocabulary.bodyRegionWords[label] ?? [];
		const matches = [
			...said(reading, vocabulary.bodyRegionPhrases[label] ?? [], { keepNegated: true }),
			...(nouns.length
				? said(reading, vocabulary.bodyRegionContexts, {
						keepNegated: true,
						substitutions: { region: nouns }
					})
				: [])
		];
		const found = matches.map((m) => ({ value: label, from: m.from, to: m.to }));
		candidates.push(...proposals(reading, found));
	}
	return clearWinner(candidates);
}

const sameAmount = (a: DraftAmount, b: DraftAmount) =>
	a.kind === 'exact'
		? b.kind === 'exact' && a.value === b.value
		: b.kind === 'range' && a.min === b.min && a.max === b.max;

function withinLimits(field: DosageField, amount: DraftAmount): boolean {
	const { min, max } = DOSAGE_LIMITS[field];
	const ends = amount.kind === 'exact' ? [amount.value] : [amount.min, amount.max];
	return ends.every((n) => Number.isInteger(n) && n >= min && n <= max);
}

function draftDosage(reading: Reading): DosageDraft {
	const { vocabulary, compiler } = reading;
	const consumed: Span[] = [];
	const found: Partial<Record<DosageField, Found<DraftAmount>[]>> = {};
	const note = (field: DosageField, amount: DraftAmount, span: Span) => {
		(found[field] ??= []).push({ value: amount, ...span });
	};
	// Templates are tried most specific first and words used once are not read again, so "three
	// times a day" is sessions a day and never also three reps.
	for (const template of vocabulary.dosage) {
		for (const m of said(reading, [template])) {
			if (consumed.some((c) => overlaps(c, m))) continue;
			const amounts: [DosageField, DraftAmount][] = [];
			for (const { placeholder, text } of m.captures) {
				const amount =
					placeholder.kind === 'duration'
						? compiler.parseDuration(text)
						: compiler.parseAmount(text);
				if (!isDosageField(placeholder.name) || !amount) break;
				if (!withinLimits(placeholder.name, amount)) break;
				amounts.push([placeholder.name, amount]);
			}
			if (amounts.length !== m.captures.length) continue;
			for (const [field, amount] of amounts) note(field, amount, m);
			consumed.push(m);
		}
	}
	for (const fixed of vocabulary.dosageFixed) {
		const amount: DraftAmount =
			fixed.value !== undefined
				? { kind: 'exact', value: fixed.value }
				: { kind: 'range', min: fixed.min ?? 0, max: fixed.max ?? 0, needsChoice: true };
		if (!withinLimits(fixed.field, amount)) continue;
		for (const m of said(reading, [fixed.phrase])) {
			if (consumed.some((c) => overlaps(c, m))) continue;
			note(fixed.field, amount, m);
			consumed.push(m);
		}
	}
	const dosage: DosageDraft = {};
	for (const field of DOSAGE_FIELDS) {
		const list = (found[field] ?? []).sort(byStart);
		const first = list[0];
		// Two different amounts for one field (not marked as a progression) settle nothing.
		if (!first || !list.every((f) => sameAmount(f.value, first.value))) continue;
		dosage[field] = {
			value: first.value,
			from: list.map((f) => sourceOf(reading.transcript, f))
		};
	}
	return dosage;
}

/** Where a note starts once leading fillers ("and", "remember") are dropped. */
function afterLeadingFillers(text: string, from: number, to: number, fillers: readonly string[]) {
	for (let again = true; again; ) {
		again = false;
		while (from < to && /[\s,]/.test(text[from])) from++;
		const filler = fillers.find(
			(f) => text.startsWith(f, from) && !/[\p{L}\p{N}']/u.test(text[from + f.length] ?? '')
		);
		if (filler) {
			from += filler.length;
			again = true;
		}
	}
	return from;
}

const escapeMarkdown = (text: string) => text.replace(/([\\`*_[\]#<>|])/g, '\\$1');

function draftSafetyNotes(reading: Reading): SafetyNotesDraft | null {
	const { transcript, vocabulary, compiler } = reading;
	const text = transcript.text;
	const triggers = vocabulary.cautions.flatMap((t) => matchAll(compiler.compile(t), text));
	const fillers = vocabulary.leadingFillers
		.map((f) => f.toLowerCase().trim())
		.sort((a, b) => b.length - a.length);
	const notes: Proposal<string>[] = [];
	for (const sentence of reading.sentences) {
		for (const clause of clausesOf(transcript, sentence, vocabulary.clauseBreaks)) {
			const inside = triggers.filter((t) => clause.from <= t.from && t.to <= clause.to);
			if (inside.length === 0) continue;
			let { from, to } = clause;
			if (text.slice(from, to).split(/\s+/).length > vocabulary.maxNoteWords) {
				// An unpunctuated transcript makes one endless sentence: keep the captions with the caution.
				const pieces = piecesOf(transcript, { from: inside[0].from, to: inside.at(-1)?.to ?? to });
				from = Math.max(from, pieces[0]?.from ?? from);
				to = Math.min(to, pieces.at(-1)?.to ?? to);
			}
			from = afterLeadingFillers(text, from, to, fillers);
			if (from >= to) continue;
			const words = transcript.said.slice(from, to).replace(/[\s,]+$/, '');
			const bullet = `${words.charAt(0).toUpperCase()}${words.slice(1)}.`;
			if (notes.some((n) => n.value.toLowerCase() === bullet.toLowerCase())) continue;
			notes.push({ value: bullet, from: [sourceOf(transcript, { from, to })] });
		}
	}
	if (notes.length === 0) return null;
	return { markdown: notes.map((n) => `- ${escapeMarkdown(n.value)}`).join('\n'), notes };
}

/**
 * A proposed exercise from the cues of one segment (in any order; they are read in time order).
 * `vocabulary` picks the words looked for: English by default, or `vocabularyFor(language, extras)`.
 */
export function draftExercise(
	cues: readonly Cue[],
	vocabulary: DraftVocabulary = englishVocabulary
): ExerciseDraft {
	const transcript = transcriptOf(cues);
	const compiler = patternCompiler(vocabulary);
	const sentences = sentencesOf(transcript);
	const markers = vocabulary.alternativeMarkers.flatMap((t) =>
		matchAll(compiler.compile(t), transcript.text)
	);
	const alternativeSentences = sentences.filter((s) =>
		markers.some((m) => s.from <= m.from && m.from < s.to)
	);
	const reading: Reading = { transcript, vocabulary, compiler, sentences, alternativeSentences };
	const dosage = draftDosage(reading);
	return {
		title: draftTitle(reading),
		bodyRegion: draftBodyRegion(reading),
		position: draftPosition(reading),
		equipment: proposals(reading, findValues(reading, vocabulary.equipment)),
		movementType: draftMovementType(reading),
		side: draftSide(reading),
		dosage,
		needsChoice: DOSAGE_FIELDS.filter((f) => dosage[f]?.value.kind === 'range'),
		safetyNotes: draftSafetyNotes(reading)
	};
}
