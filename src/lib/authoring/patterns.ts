/**
 * The small template language the drafting vocabulary is written in, compiled to regular
 * expressions over a transcript's matching text (see ./transcript.ts):
 *
 *   word            a word as said; an apostrophe in it may be left out ("dont")
 *   (a|b c)         one of the choices
 *   [a|b c]         one of the choices, or nothing
 *   …  (or ...)     up to four words in between, within one clause
 *   {name}          an amount said there; which names a phrase may use depends on where it is
 *                   (a dosage field, `ordinal` in a title phrase, `region` in a body-region context)
 *
 * It exists so a clinic can add its own words without writing regular expressions.
 */
import { DOSAGE_FIELDS } from '$lib/dosage/types';
import type { DraftAmount } from './exercise-draft';
import { matchingForm } from './transcript';
import type { DraftVocabulary } from './vocabulary/schema';

/** Where a template is used, which decides the placeholders it may have. */
export type TemplateContext = 'plain' | 'title' | 'region' | 'dosage';

export type PlaceholderKind = 'amount' | 'duration' | 'ordinal';

export interface Placeholder {
	name: string;
	kind: PlaceholderKind;
}

export interface CompiledPattern {
	template: string;
	regex: RegExp;
	/** The placeholders in order; capture group i + 1 holds placeholder i. */
	placeholders: readonly Placeholder[];
}

export interface PatternMatch {
	template: string;
	from: number;
	to: number;
	captures: { placeholder: Placeholder; text: string }[];
}

type Token =
	| { kind: 'words'; choices: string[]; optional: boolean }
	| { kind: 'gap' }
	| { kind: 'placeholder'; name: string; modifier: string | null };

/** Seconds fields: their placeholder takes a duration ("five seconds") unless marked `:amount`. */
const TIME_FIELDS: readonly string[] = ['holdSeconds', 'restSeconds'];

function tokenise(template: string): Token[] | string {
	const tokens: Token[] = [];
	const s = template.trim();
	let i = 0;
	while (i < s.length) {
		const ch = s[i];
		if (/\s/.test(ch)) {
			i++;
		} else if (ch === '…' || s.startsWith('...', i)) {
			tokens.push({ kind: 'gap' });
			i += ch === '…' ? 1 : 3;
		} else if (ch === '(' || ch === '[') {
			const end = s.indexOf(ch === '(' ? ')' : ']', i + 1);
			if (end < 0) return `"${ch}" is not closed`;
			const inner = s.slice(i + 1, end);
			if (/[()[\]{}…]/.test(inner)) return 'choices cannot hold other groups or placeholders';
			const choices = inner.split('|').map((c) => matchingForm(c).replace(/\s+/g, ' ').trim());
			if (choices.some((c) => !c)) return 'a group has an empty choice';
			tokens.push({ kind: 'words', choices, optional: ch === '[' });
			i = end + 1;
		} else if (ch === '{') {
			const end = s.indexOf('}', i + 1);
			if (end < 0) return '"{" is not closed';
			const [name, modifier, ...rest] = s.slice(i + 1, end).split(':');
			if (!/^[A-Za-z]+$/.test(name) || rest.length > 0)
				return `"{${s.slice(i + 1, end)}}" is not a placeholder`;
			tokens.push({ kind: 'placeholder', name, modifier: modifier ?? null });
			i = end + 1;
		} else if (')]}'.includes(ch)) {
			return `"${ch}" has nothing to close`;
		} else {
			let end = i;
			while (end < s.length && !/[\s()[\]{}…]/.test(s[end]) && !s.startsWith('...', end)) end++;
			tokens.push({ kind: 'words', choices: [matchingForm(s.slice(i, end))], optional: false });
			i = end;
		}
	}
	return tokens;
}

/** Why a template cannot be used in its context, or null when it can. */
export function templateProblem(template: string, context: TemplateContext): string | null {
	const tokens = tokenise(template);
	if (typeof tokens === 'string') return tokens;
	if (
		!tokens.some((t) => t.kind === 'words' && !t.optional) &&
		!tokens.some((t) => t.kind === 'placeholder')
	)
		return 'needs at least one word or placeholder that must be said';
	if (tokens[0].kind === 'gap' || tokens.at(-1)?.kind === 'gap')
		return '"…" must sit between two words';
	const placeholders = tokens.filter((t) => t.kind === 'placeholder');
	for (const p of placeholders) {
		const where = `{${p.name}${p.modifier ? `:${p.modifier}` : ''}}`;
		if (context === 'plain') return `${where}: placeholders are not used here`;
		if (context === 'title' && (p.name !== 'ordinal' || p.modifier))
			return `${where}: only {ordinal} is used in a title phrase`;
		if (context === 'region' && (p.name !== 'region' || p.modifier))
			return `${where}: only {region} is used here`;
		if (context === 'dosage') {
			if (!(DOSAGE_FIELDS as readonly string[]).includes(p.name))
				return `${where}: not a dosage field`;
			if (p.modifier !== null && !(p.modifier === 'amount' && TIME_FIELDS.includes(p.name)))
				return `${where}: only {holdSeconds:amount} and {restSeconds:amount} take a modifier`;
		}
	}
	if (context === 'region' && placeholders.length === 0) return 'must contain {region}';
	if (context === 'dosage' && placeholders.length === 0)
		return 'must contain a dosage field placeholder';
	return null;
}

const escapeRegex = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
/** One word; an apostrophe is optional because speech-to-text often drops it. */
const wordPattern = (word: string) => escapeRegex(word).replace(/'/g, "'?");
/** Between two words: spaces, or a comma or colon with any spaces. */
const SEP = '(?:\\s*[,:]\\s*|\\s+)';
/** Up to four words that stay inside one clause. */
const GAP = `(?:${SEP}[^\\s.!?;,:]+){0,4}?`;

/** Alternation of phrases, longest first so "rolled up towel" wins over "rolled". */
function alternation(phrases: Iterable<string>, sep = SEP): string {
	const list = [...new Set([...phrases].map((p) => matchingForm(p).replace(/\s+/g, ' ').trim()))]
		.filter(Boolean)
		.sort((a, b) => b.length - a.length);
	// A pattern that can never match, so an empty list never matches everything.
	if (list.length === 0) return '(?!)';
	return list.map((p) => p.split(' ').map(wordPattern).join(sep)).join('|');
}

export interface PatternCompiler {
	compile(
		template: string,
		substitutions?: Readonly<Record<string, readonly string[]>>
	): CompiledPattern;
	/** "eight to ten", "a few", "about 12" → an amount; null when it is not one. */
	parseAmount(text: string): DraftAmount | null;
	/** "five seconds", "1 min", "half a minute" → seconds; null when it is not one. */
	parseDuration(text: string): DraftAmount | null;
}

const exact = (value: number): DraftAmount => ({ kind: 'exact', value });
const between = (min: number, max: number): DraftAmount =>
	min === max ? exact(min) : { kind: 'range', min, max, needsChoice: true };

const compilers = new WeakMap<DraftVocabulary, PatternCompiler>();

/** The compiler for one vocabulary (made once per vocabulary object). */
export function patternCompiler(vocabulary: DraftVocabulary): PatternCompiler {
	const known = compilers.get(vocabulary);
	if (known) return known;

	const numbers = new Map(
		Object.entries(vocabulary.numbers).map(([w, n]) => [matchingForm(w).trim(), n])
	);
	const numberWord = `(?:${alternation(numbers.keys(), '\\s+')})`;
	const number = `(?:\\d{1,4}|${numberWord}(?:\\s+${numberWord})?)`;
	const joiner = `(?:\\s*[-–]\\s*|\\s+(?:${alternation(vocabulary.rangeJoiners, '\\s+')})\\s+)`;
	const vague = alternation(
		vocabulary.vagueAmounts.map((v) => v.phrase),
		'\\s+'
	);
	const approximators = vocabulary.approximators
		.map((a) => matchingForm(a).trim())
		.sort((a, b) => b.length - a.length);
	const amount = `(?:(?:${alternation(approximators, '\\s+')})\\s+)?(?:${vague}|${number}(?:${joiner}${number})?)`;
	const unit = `(?:${alternation(Object.keys(vocabulary.timeUnits), '\\s+')})`;
	const durationPhrases = new Map(
		Object.entries(vocabulary.durationPhrases).map(([p, s]) => [matchingForm(p).trim(), s])
	);
	const duration = `(?:${alternation(durationPhrases.keys(), '\\s+')}|${amount}\\s*${unit}(?![\\p{L}\\p{N}]))`;
	const ordinal = `(?:${alternation(vocabulary.ordinals, '\\s+')}|${number})`;
	const units = new Map(
		Object.entries(vocabulary.timeUnits).map(([u, s]) => [matchingForm(u).trim(), s])
	);
	const unitAtEnd = new RegExp(`^(.*?)\\s*(${unit})$`, 'u');
	const rangeSplit = new RegExp(`^(.+?)${joiner}(.+)$`, 'u');
	const vagueByPhrase = new Map(
		vocabulary.vagueAmounts.map((v) => [matchingForm(v.phrase).replace(/\s+/g, ' ').trim(), v])
	);

	function parseNumber(text: string): number | null {
		if (/^\d+$/.test(text)) return Number(text);
		const whole = numbers.get(text);
		if (whole !== undefined) return whole;
		const [tens, ones, ...more] = text.split(' ');
		const t = numbers.get(tens);
		const o = ones === undefined ? undefined : numbers.get(ones);
		// Only "twenty five"-style compounds; "one two" is counting, not a number.
		if (
			more.length ||
			t === undefined ||
			o === undefined ||
			t < 20 ||
			t % 10 !== 0 ||
			o < 1 ||
			o > 9
		)
			return null;
		return t + o;
	}

	function parseAmount(raw: string): DraftAmount | null {
		let text = matchingForm(raw).replace(/\s+/g, ' ').trim();
		for (let again = true; again; ) {
			again = false;
			for (const a of approximators) {
				if (text.startsWith(`${a} `)) {
					text = text.slice(a.length + 1);
					again = true;
				}
			}
		}
		const v = vagueByPhrase.get(text);
		if (v) return between(v.min, v.max);
		const range = rangeSplit.exec(text);
		if (range) {
			const [low, high] = [parseNumber(range[1]), parseNumber(range[2])];
			if (low !== null && high !== null && low <= high) return between(low, high);
		}
		const n = parseNumber(text);
		return n === null ? null : exact(n);
	}

	function parseDuration(raw: string): DraftAmount | null {
		const text = matchingForm(raw).replace(/\s+/g, ' ').trim();
		const phrase = durationPhrases.get(text);
		if (phrase !== undefined) return exact(phrase);
		const m = unitAtEnd.exec(text);
		const seconds = m ? units.get(m[2]) : undefined;
		const counted = m && seconds !== undefined ? parseAmount(m[1]) : null;
		if (!counted || seconds === undefined) return null;
		return counted.kind === 'exact'
			? exact(Math.round(counted.value * seconds))
			: between(Math.round(counted.min * seconds), Math.round(counted.max * seconds));
	}

	const compiled = new Map<string, CompiledPattern>();

	function compile(
		template: string,
		substitutions: Readonly<Record<string, readonly string[]>> = {}
	): CompiledPattern {
		const key = `${template}\u0000${JSON.stringify(substitutions)}`;
		const known = compiled.get(key);
		if (known) return known;
		const tokens = tokenise(template);
		if (typeof tokens === 'string') throw new Error(`Drafting phrase "${template}": ${tokens}`);
		const placeholders: Placeholder[] = [];
		let source = '';
		let atStart = true;
		for (const token of tokens) {
			if (token.kind === 'gap') {
				source += GAP;
				continue;
			}
			let fragment: string;
			let optional = false;
			if (token.kind === 'words') {
				fragment = `(?:${alternation(token.choices)})`;
				optional = token.optional;
			} else if (substitutions[token.name]) {
				fragment = `(?:${alternation(substitutions[token.name])})`;
			} else {
				const kind: PlaceholderKind =
					token.name === 'ordinal'
						? 'ordinal'
						: TIME_FIELDS.includes(token.name) && token.modifier !== 'amount'
							? 'duration'
							: 'amount';
				placeholders.push({ name: token.name, kind });
				fragment = `(${kind === 'ordinal' ? ordinal : kind === 'duration' ? duration : amount})`;
			}
			if (optional) {
				// An optional first item carries its own separator, so the next item adds none.
				source += atStart ? `(?:${fragment}${SEP})?` : `(?:${SEP}${fragment})?`;
			} else {
				source += (atStart ? '' : SEP) + fragment;
				atStart = false;
			}
		}
		const regex = new RegExp(`(?<![\\p{L}\\p{N}'])(?:${source})(?![\\p{L}\\p{N}])`, 'gu');
		const pattern = { template, regex, placeholders };
		compiled.set(key, pattern);
		return pattern;
	}

	const compiler: PatternCompiler = { compile, parseAmount, parseDuration };
	compilers.set(vocabulary, compiler);
	return compiler;
}

/** Every place the pattern matches, left to right, without overlaps. */
export function matchAll(pattern: CompiledPattern, text: string): PatternMatch[] {
	const out: PatternMatch[] = [];
	for (const m of text.matchAll(pattern.regex)) {
		out.push({
			template: pattern.template,
			from: m.index,
			to: m.index + m[0].length,
			captures: pattern.placeholders.map((placeholder, i) => ({
				placeholder,
				text: m[i + 1] ?? ''
			}))
		});
	}
	return out;
}
