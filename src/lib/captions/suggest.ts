/**
 * Suggests where one exercise ends and the next begins in a narrated demonstration, from three
 * kinds of evidence: what the narrator says (cue text), quiet (caption gaps and audio silence) and
 * the picture (scene changes). Nearby signals are merged into one suggestion that lists them all.
 */
import { plainText } from './text';
import type { Cue } from './types';

export type SignalKind =
	| 'announcing-phrase'
	| 'ordinal'
	| 'exercise-name-change'
	| 'long-gap'
	| 'silence'
	| 'scene-change';

export interface Signal {
	kind: SignalKind;
	/** The evidence in words, e.g. `2.4 s of silence, 10.2 s to 12.6 s`. */
	detail: string;
	/** Text signals: the phrase or exercise name found, lower case. */
	phrase?: string;
	/** Quiet signals: how long the quiet lasts. */
	seconds?: number;
}

export interface Suggestion {
	time: number;
	score: number;
	signals: Signal[];
	/** The exercise named at this boundary ("Heel slides"), as a default title for what follows. */
	name?: string;
}

export interface WordLists {
	/** Phrases that announce the next exercise, lower case. */
	announcing: string[];
	/** Ordinal and number words that count exercises, lower case. */
	ordinals: string[];
	/** Words skipped when reading an exercise name after an announcing phrase. */
	filler: string[];
}

export interface SuggestInput {
	cues: readonly Cue[];
	silences: readonly { start: number; end: number }[];
	sceneChanges: readonly number[];
	durationSeconds: number;
}

export interface SuggestOptions {
	/** BCP 47 tag of the cues; picks the word lists by its primary subtag (English when unknown). */
	language: string;
	/** Word lists per primary language subtag, added to the built-in ones (see wordListsFor). */
	wordLists?: WordListsByLanguage;
	/** No boundary closer than this to another or to either end of the recording. Default 5 s. */
	minSegmentSeconds?: number;
	/** Signals this close together support one boundary. Default 1.5 s. */
	mergeWindowSeconds?: number;
	/** A caption gap at least this long is a signal. Default 2.5 s. */
	minGapSeconds?: number;
	/** An audio silence at least this long is a signal. Default 1.5 s. */
	minSilenceSeconds?: number;
	/** Suggestions scoring below this are left out. Default 0.5. */
	minScore?: number;
}

export const englishWordLists: WordLists = {
	announcing: [
		'next exercise',
		'the next one',
		"now we'll",
		'now we will',
		"let's move on",
		'let us move on',
		'moving on',
		'next up',
		"now let's",
		'our next'
	],
	ordinals: [
		'first',
		'second',
		'third',
		'fourth',
		'fifth',
		'sixth',
		'seventh',
		'eighth',
		'ninth',
		'tenth',
		'exercise one',
		'exercise two',
		'exercise three',
		'exercise four',
		'exercise five',
		'exercise six',
		'exercise seven',
		'exercise eight',
		'exercise nine',
		'exercise ten',
		'number one',
		'number two',
		'number three',
		'number four',
		'number five'
	],
	filler: [
		'is',
		'are',
		'do',
		'does',
		'try',
		'called',
		'the',
		'a',
		'an',
		'some',
		'to',
		'on',
		'onto',
		'with',
		'exercise',
		'one',
		'up',
		"we'll",
		'we',
		'will',
		'be',
		'doing',
		'going',
		"it's",
		'this'
	]
};

/** French lists (common classroom phrasing, our own choice; no published list exists). */
export const frenchWordLists: WordLists = {
	announcing: [
		'exercice suivant',
		'exercice d’après',
		"exercice d'après",
		'passons à',
		'on passe à',
		'maintenant nous allons',
		'maintenant on va',
		'ensuite'
	],
	ordinals: [
		'premier',
		'première',
		'deuxième',
		'troisième',
		'quatrième',
		'cinquième',
		'sixième',
		'septième',
		'huitième',
		'neuvième',
		'dixième',
		'exercice un',
		'exercice deux',
		'exercice trois',
		'exercice quatre',
		'exercice cinq'
	],
	filler: [
		'le',
		'la',
		'les',
		'un',
		'une',
		'des',
		'du',
		'de',
		'à',
		'au',
		'avec',
		'exercice',
		'on',
		'nous',
		'va',
		'allons',
		'faire',
		'appelé',
		'ce',
		'cet',
		'cette',
		"c'est",
		'est'
	]
};

/** Word lists keyed by primary language subtag ("en", "fr"). */
export type WordListsByLanguage = Record<string, Partial<WordLists>>;

export const builtInWordLists: Record<string, WordLists> = {
	en: englishWordLists,
	fr: frenchWordLists
};

/**
 * The word lists for a cue language: the built-in lists of its primary subtag (English when there
 * are none), with any configured lists for that subtag added to them (never replacing them).
 */
export function wordListsFor(language: string, extra: WordListsByLanguage = {}): WordLists {
	const primary = language.trim().toLowerCase().split(/[-_]/)[0] || 'en';
	const base = builtInWordLists[primary] ?? englishWordLists;
	const added = extra[primary] ?? {};
	const lower = (words: readonly string[] = []) =>
		words.map((w) => w.trim().toLowerCase()).filter(Boolean);
	return {
		announcing: [...new Set([...base.announcing, ...lower(added.announcing)])],
		ordinals: [...new Set([...base.ordinals, ...lower(added.ordinals)])],
		filler: [...new Set([...base.filler, ...lower(added.filler)])]
	};
}

// Evidence weights (our own calibration, common practice: text is the strongest evidence, quiet
// alone is weak because narrators also pause during holds and rests).
const WEIGHT: Record<SignalKind, number> = {
	'announcing-phrase': 0.6,
	ordinal: 0.4,
	'exercise-name-change': 0.5,
	'long-gap': 0.3,
	silence: 0.3,
	'scene-change': 0.35
};

interface Candidate {
	kind: SignalKind;
	detail: string;
	phrase?: string;
	seconds?: number;
	/** For an exercise-name-change: the name, lower case. */
	name?: string;
	/** Where the boundary may fall for this signal. */
	from: number;
	to: number;
	/** The preferred instant inside [from, to]. */
	at: number;
}

const round = (s: number) => Math.round(s * 10) / 10;
const secs = (s: number) => `${round(s)} s`;
const quote = (text: string) => (text.length > 60 ? `"${text.slice(0, 57)}…"` : `"${text}"`);
const escape = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
const normalise = (s: string) => s.toLowerCase().replace(/[’‘]/g, "'").replace(/\s+/g, ' ');

interface Phrase {
	words: string;
	pattern: RegExp;
}

function phrases(list: readonly string[]): Phrase[] {
	return list.map(normalise).map((words) => ({
		words,
		// A hyphen after the phrase makes a compound ("first-week exercises"), not a count.
		pattern: new RegExp(`(^|[^\\p{L}'])${escape(words)}(?![\\p{L}-])`, 'u')
	}));
}

/** Where a whole-word phrase starts in the text, or -1. */
function phraseIndex(text: string, phrase: Phrase): number {
	const m = phrase.pattern.exec(text);
	return m ? m.index + m[1].length : -1;
}

/** A short title-like name after `at` in the sentence, or null (e.g. "heel slides"). */
function exerciseName(text: string, at: number, filler: Set<string>): string | null {
	// A name ends at the first clause break ("the narrow stance, for your balance").
	const sentence = text.slice(at).split(/[.!?;,]/)[0];
	const words = sentence.split(/[\s:,–—]+/).filter((w) => /[\p{L}]/u.test(w));
	let k = 0;
	while (k < words.length && filler.has(words[k])) k++;
	const name = words.slice(k);
	// An instruction ("lie on your back with both legs straight") runs long; a name does not.
	if (name.length === 0 || name.length > 4 || !name.every((w) => /^[\p{L}'-]+$/u.test(w)))
		return null;
	return name.join(' ');
}

function textCandidates(cues: readonly Cue[], lists: WordLists): Candidate[] {
	const out: Candidate[] = [];
	const filler = new Set(lists.filler.map(normalise));
	const announcing = phrases(lists.announcing);
	const ordinals = phrases(lists.ordinals);
	let lastName: string | null = null;
	cues.forEach((cue, i) => {
		const text = normalise(plainText(cue.text));
		const from = i > 0 ? Math.min(cues[i - 1].end, cue.start) : cue.start;
		const base = { from, to: cue.start, at: cue.start };
		let nameAt = -1;
		for (const phrase of announcing) {
			const k = phraseIndex(text, phrase);
			if (k < 0) continue;
			const detail = `"${phrase.words}" in ${quote(plainText(cue.text))}`;
			out.push({ ...base, kind: 'announcing-phrase', detail, phrase: phrase.words });
			nameAt = k + phrase.words.length;
			break;
		}
		for (const word of ordinals) {
			const k = phraseIndex(text, word);
			if (k < 0) continue;
			out.push({
				...base,
				kind: 'ordinal',
				detail: `"${word.words}" in ${quote(plainText(cue.text))}`,
				phrase: word.words
			});
			if (nameAt < 0) nameAt = k + word.words.length;
			break;
		}
		if (nameAt < 0) return;
		const name = exerciseName(text, nameAt, filler);
		if (name && name !== lastName) {
			const detail = lastName
				? `"${name}" after "${lastName}"`
				: `"${name}", the first exercise named`;
			out.push({ ...base, kind: 'exercise-name-change', detail, phrase: name, name });
			lastName = name;
		}
	});
	return out;
}

function quietCandidates(input: SuggestInput, minGap: number, minSilence: number): Candidate[] {
	const out: Candidate[] = [];
	const cues = [...input.cues].sort((a, b) => a.start - b.start);
	let from = cues.length > 0 ? cues[0].end : 0;
	for (let i = 1; i < cues.length; i++) {
		const to = cues[i].start;
		if (to - from >= minGap) {
			const detail = `${secs(to - from)} without captions, ${secs(from)} to ${secs(to)}`;
			const seconds = round(to - from);
			out.push({ kind: 'long-gap', detail, seconds, from, to, at: (from + to) / 2 });
		}
		// A long cue can cover later, shorter ones: the quiet starts after the latest end so far.
		from = Math.max(from, cues[i].end);
	}
	for (const s of input.silences) {
		if (s.end - s.start < minSilence) continue;
		const detail = `${secs(s.end - s.start)} of silence, ${secs(s.start)} to ${secs(s.end)}`;
		out.push({
			kind: 'silence',
			detail,
			seconds: round(s.end - s.start),
			from: s.start,
			to: s.end,
			at: (s.start + s.end) / 2
		});
	}
	for (const t of input.sceneChanges) {
		out.push({
			kind: 'scene-change',
			detail: `picture changes at ${secs(t)}`,
			from: t,
			to: t,
			at: t
		});
	}
	return out;
}

/** Noisy-or across independent kinds of evidence; gap and silence are one kind (both are quiet). */
function scoreOf(kinds: Set<SignalKind>): number {
	const textMiss = [...TEXT_KINDS].reduce((p, k) => p * (kinds.has(k) ? 1 - WEIGHT[k] : 1), 1);
	const quiet =
		kinds.has('long-gap') && kinds.has('silence')
			? Math.max(WEIGHT['long-gap'], WEIGHT.silence) + 0.1
			: kinds.has('long-gap')
				? WEIGHT['long-gap']
				: kinds.has('silence')
					? WEIGHT.silence
					: 0;
	const picture = kinds.has('scene-change') ? WEIGHT['scene-change'] : 0;
	return Math.round((1 - textMiss * (1 - quiet) * (1 - picture)) * 1000) / 1000;
}

const TEXT_KINDS: ReadonlySet<SignalKind> = new Set([
	'announcing-phrase',
	'ordinal',
	'exercise-name-change'
]);

type Span = { from: number; to: number };

/** How far outside the quiet stretch a scene change may fall and still place the boundary. */
const SCENE_SLACK_SECONDS = 0.5;

const longest = (list: Span[]): Span | null =>
	list.reduce<Span | null>((a, b) => (!a || b.to - b.from > a.to - a.from ? b : a), null);

/**
 * Picks the instant: a scene change inside the quiet stretch, else the middle of it. The quiet
 * stretch is the silence within the caption gap (nobody speaks and no caption is cut), else the
 * silence, else the caption gap before the announcing cue.
 */
function placeOf(group: Candidate[]): number {
	const of = (kind: SignalKind) => group.filter((c) => c.kind === kind);
	const silence = longest(of('silence'));
	const gap = longest([
		...of('long-gap'),
		...group.filter((c) => TEXT_KINDS.has(c.kind) && c.from < c.to)
	]);
	let quiet: Span | null = silence ?? gap;
	if (silence && gap && Math.max(silence.from, gap.from) < Math.min(silence.to, gap.to)) {
		quiet = { from: Math.max(silence.from, gap.from), to: Math.min(silence.to, gap.to) };
	}
	const scenes = of('scene-change');
	if (!quiet) return scenes[0]?.at ?? group[0].at;
	const within = (slack: number) =>
		scenes.find((c) => c.at >= quiet.from - slack && c.at <= quiet.to + slack);
	// A picture cut often lands a frame or two after the sound resumes (the first frame at or after
	// the cut); it is still the same boundary, and a sharper instant than the middle of the quiet.
	const cut = within(0) ?? within(SCENE_SLACK_SECONDS);
	return cut ? cut.at : (quiet.from + quiet.to) / 2;
}

/** Suggested boundaries in time order, each with the signals that support it. */
export function suggestBoundaries(input: SuggestInput, options: SuggestOptions): Suggestion[] {
	const lists = wordListsFor(options.language, options.wordLists);
	const minSegment = options.minSegmentSeconds ?? 5;
	const window = options.mergeWindowSeconds ?? 1.5;
	const minScore = options.minScore ?? 0.5;
	const cues = [...input.cues].sort((a, b) => a.start - b.start);
	const candidates = [
		...textCandidates(cues, lists),
		...quietCandidates(input, options.minGapSeconds ?? 2.5, options.minSilenceSeconds ?? 1.5)
	].sort((a, b) => a.from - b.from || a.to - b.to);

	const groups: Candidate[][] = [];
	let reach = -Infinity;
	for (const c of candidates) {
		const last = groups.at(-1);
		if (last && c.from <= reach + window) {
			last.push(c);
			reach = Math.max(reach, c.to);
		} else {
			groups.push([c]);
			reach = c.to;
		}
	}

	const suggestions = groups
		.map((group) => {
			const time = Math.round(placeOf(group) * 1000) / 1000;
			const seen = new Set<string>();
			const signals = group
				.filter((c) => {
					const key = `${c.kind}|${c.detail}`;
					return !seen.has(key) && (seen.add(key), true);
				})
				.map(({ kind, detail, phrase, seconds }) => ({
					kind,
					detail,
					...(phrase !== undefined ? { phrase } : {}),
					...(seconds !== undefined ? { seconds } : {})
				}));
			const named = group.find((c) => c.name)?.name;
			const suggestion: Suggestion = {
				time,
				score: scoreOf(new Set(group.map((c) => c.kind))),
				signals
			};
			if (named) suggestion.name = named.charAt(0).toUpperCase() + named.slice(1);
			return suggestion;
		})
		.filter(
			(s) =>
				s.score >= minScore && s.time >= minSegment && s.time <= input.durationSeconds - minSegment
		);

	// Of two suggestions closer than a segment can be, the better supported one stays.
	const kept: Suggestion[] = [];
	for (const s of [...suggestions].sort((a, b) => b.score - a.score || a.time - b.time)) {
		if (kept.every((k) => Math.abs(k.time - s.time) >= minSegment)) kept.push(s);
	}
	return kept.sort((a, b) => a.time - b.time);
}
