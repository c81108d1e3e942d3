/**
 * Guideline checks run on every edit in the studio. Each profile number carries its source so the
 * studio can show why a cue is flagged; numbers with no published source say "common practice".
 */
import { formatTimestamp, toMillis } from './timestamp';
import { countPlainWords, plainText } from './text';
import type { Cue } from './types';

export type FixKind = 'reflow-lines' | 'extend-into-gap' | 'split-cue' | 'close-gap';

export type FindingKind =
	| 'end-before-start'
	| 'out-of-order'
	| 'overlap'
	| 'gap-too-short'
	| 'too-short'
	| 'too-long'
	| 'reading-rate'
	| 'line-too-long'
	| 'too-many-lines'
	| 'empty'
	| 'unbalanced-tags';

export interface Finding {
	cueId: string;
	/** Position in the checked array, since cue identifiers may be empty or repeated. */
	index: number;
	kind: FindingKind;
	severity: 'error' | 'warning';
	message: string;
	fix?: FixKind;
}

export interface Limit {
	value: number;
	source: string;
}

export interface GuidelineProfile {
	id: 'bbc' | 'dcmp';
	label: string;
	maxCharsPerLine: Limit;
	maxLines: Limit;
	/** Above this the cue is flagged as a warning. */
	targetWordsPerMinute: Limit;
	/** Above this the cue is an error: no guideline allows it. */
	maxWordsPerMinute: Limit;
	maxCharsPerSecond: Limit;
	/** Below this a cue is a warning; below `minSecondsHard` (when set) it is an error. */
	minSeconds: Limit;
	minSecondsHard?: Limit;
	maxSeconds: Limit;
	/** A gap between cues, when there is one, should be at least this long. */
	minGapSeconds: Limit;
}

const BBC = 'BBC Subtitle Guidelines (2026 edition)';
const DCMP = 'DCMP Captioning Key';

export const profiles: Record<GuidelineProfile['id'], GuidelineProfile> = {
	bbc: {
		id: 'bbc',
		label: 'BBC Subtitle Guidelines',
		maxCharsPerLine: { value: 37, source: `${BBC}: at most 37 characters per line (broadcast)` },
		maxLines: { value: 2, source: `${BBC}: at most 2 lines (16:9 picture)` },
		targetWordsPerMinute: {
			value: 180,
			source: `${BBC}: reading rate 160–180 words per minute; the top of the range is used`
		},
		maxWordsPerMinute: {
			value: 200,
			source: `${BBC}: minimum about 0.3 s per word, i.e. 200 words per minute (computed)`
		},
		maxCharsPerSecond: {
			value: 17,
			source:
				'Common practice: 180 words per minute at about 5.7 characters per word with its space (estimate, no published figure)'
		},
		minSeconds: {
			value: 1,
			source: 'Common practice: about 1 s on screen for the shortest caption (no BBC figure)'
		},
		maxSeconds: {
			value: 7,
			source: 'Common practice: about 7 s at most on screen (no BBC figure)'
		},
		minGapSeconds: {
			value: 1,
			source: `${BBC}: gaps between subtitles, if any, at least 1 s (1.5 s preferred)`
		}
	},
	dcmp: {
		id: 'dcmp',
		label: 'DCMP Captioning Key',
		maxCharsPerLine: { value: 32, source: `${DCMP}: 32 characters per line` },
		maxLines: {
			value: 2,
			source: `${DCMP}: two lines (recalled from memory, not verified in REFERENCES.md)`
		},
		targetWordsPerMinute: {
			value: 160,
			source: `${DCMP}: 150–160 words per minute for adult special-interest media`
		},
		maxWordsPerMinute: {
			value: 225,
			source: `${DCMP}: adult near-verbatim captions never above 225 words per minute`
		},
		maxCharsPerSecond: {
			value: 15,
			source:
				'Common practice: 160 words per minute at about 5.7 characters per word with its space (estimate, no published figure)'
		},
		minSeconds: {
			value: 2,
			source: `${DCMP}: adult near-verbatim captions never under 2 s on screen`
		},
		minSecondsHard: {
			value: 2,
			source: `${DCMP}: adult near-verbatim captions never under 2 s on screen`
		},
		maxSeconds: {
			value: 7,
			source: 'Common practice: about 7 s at most on screen (no DCMP figure)'
		},
		minGapSeconds: {
			value: 1,
			source: 'Common practice: DCMP gives no gap figure; the BBC’s 1 s is used'
		}
	}
};

const TAGS = new Set(['c', 'i', 'b', 'u', 'ruby', 'rt', 'v', 'lang']);

/** Words per minute for `words` shown for `seconds` (BBC worked example: 2 words in 1 s = 120). */
export function wordsPerMinute(words: number, seconds: number): number {
	return seconds > 0 ? (words * 60) / seconds : Infinity;
}

const secs = (s: number) => `${Math.round(s * 100) / 100} s`;
const at = (s: number) => formatTimestamp(s, { hours: 'auto' });

/** Describes the first tag problem in cue text, or null when every tag is closed in order. */
export function tagProblem(text: string): string | null {
	const open: string[] = [];
	for (const m of text.matchAll(/<(\/?)([a-z]+)[^>]*>/gi)) {
		const [, closing, rawName] = m;
		const name = rawName.toLowerCase();
		if (!TAGS.has(name)) continue;
		if (!closing) {
			open.push(name);
			continue;
		}
		if (open.at(-1) === name) open.pop();
		else if (open.includes(name)) return `<${open.at(-1)}> is still open when </${name}> closes`;
		else return `</${name}> closes a tag that was never opened`;
	}
	// A <v> may run to the end of the cue without </v> (W3C WebVTT cue text syntax; recalled, not in REFERENCES.md).
	const unclosed = open.filter((name) => name !== 'v');
	return unclosed.length > 0 ? `<${unclosed.at(-1)}> is never closed` : null;
}

/** Checks cues in the order given against one profile. */
export function checkCues(cues: readonly Cue[], profile: GuidelineProfile): Finding[] {
	const findings: Finding[] = [];
	let latest: { end: number; index: number } | null = null;
	for (let index = 0; index < cues.length; index++) {
		const cue = cues[index];
		const add = (
			kind: FindingKind,
			severity: Finding['severity'],
			message: string,
			fix?: FixKind
		) => findings.push({ cueId: cue.id, index, kind, severity, message, ...(fix ? { fix } : {}) });
		const previous = index > 0 ? cues[index - 1] : null;
		const next = index + 1 < cues.length ? cues[index + 1] : null;
		// Times are whole milliseconds; rounding the difference keeps 1.009 − 0.009 at 1 s, not just under.
		const duration = toMillis(cue.end - cue.start);

		if (cue.end <= cue.start) {
			add(
				'end-before-start',
				'error',
				`Ends at ${at(cue.end)}, not after its start at ${at(cue.start)}.`
			);
		}
		if (previous && cue.start < previous.start) {
			add(
				'out-of-order',
				'error',
				`Starts at ${at(cue.start)}, before the cue above it (${at(previous.start)}).`
			);
		}
		if (latest && cue.start < latest.end && cue.end > cue.start) {
			const other = cues[latest.index];
			const label = other.id ? `cue "${other.id}"` : `cue ${latest.index + 1}`;
			add(
				'overlap',
				'warning',
				`Overlaps ${label} by ${secs(latest.end - cue.start)}: two captions on screen at once.`
			);
		}
		if (next && cue.end > cue.start) {
			const gap = toMillis(next.start - cue.end);
			if (gap > 0 && gap < profile.minGapSeconds.value) {
				add(
					'gap-too-short',
					'warning',
					`A ${secs(gap)} gap before the next cue flickers; close it or make it at least ${secs(profile.minGapSeconds.value)} (${profile.minGapSeconds.source}).`,
					'close-gap'
				);
			}
		}
		// A cue that ends before it starts is reported above and would hide real overlaps.
		if (cue.end > cue.start && (!latest || cue.end > latest.end)) latest = { end: cue.end, index };

		const plain = plainText(cue.text);
		if (plain.trim() === '') {
			add('empty', 'error', 'Has no text.');
			continue;
		}
		const tags = cue.text.includes('<') ? tagProblem(cue.text) : null;
		if (tags) add('unbalanced-tags', 'error', `Tags do not match: ${tags}.`);
		if (duration <= 0) continue;

		const roomAfter = next ? toMillis(next.start - cue.end) : Infinity;
		const canExtend = roomAfter > 0;
		const hard = profile.minSecondsHard;
		if (duration < profile.minSeconds.value) {
			add(
				'too-short',
				hard && duration < hard.value ? 'error' : 'warning',
				`On screen for ${secs(duration)}; at least ${secs(profile.minSeconds.value)} (${profile.minSeconds.source}).`,
				canExtend ? 'extend-into-gap' : undefined
			);
		}
		if (duration > profile.maxSeconds.value) {
			add(
				'too-long',
				'warning',
				`On screen for ${secs(duration)}; at most ${secs(profile.maxSeconds.value)} (${profile.maxSeconds.source}).`,
				'split-cue'
			);
		}

		const words = countPlainWords(plain);
		// Rounded far below anything shown, so a cue given exactly the time it needs (123 characters
		// for 8.2 s is 15 per second) is not flagged for binary fractions (15.000000000000002).
		const wpm = Math.round(wordsPerMinute(words, duration) * 1e6) / 1e6;
		const cps = Math.round((plain.replace(/\n/g, ' ').length / duration) * 1e6) / 1e6;
		const rateFix: FixKind = canExtend ? 'extend-into-gap' : 'split-cue';
		if (wpm > profile.targetWordsPerMinute.value) {
			const hardLimit = wpm > profile.maxWordsPerMinute.value;
			const limit = hardLimit ? profile.maxWordsPerMinute : profile.targetWordsPerMinute;
			add(
				'reading-rate',
				hardLimit ? 'error' : 'warning',
				`Reading rate ${Math.round(wpm)} words per minute (${words} words in ${secs(duration)}); at most ${limit.value} (${limit.source}).`,
				rateFix
			);
		} else if (cps > profile.maxCharsPerSecond.value) {
			add(
				'reading-rate',
				'warning',
				`Reading rate ${Math.round(cps * 10) / 10} characters per second; at most ${profile.maxCharsPerSecond.value} (${profile.maxCharsPerSecond.source}).`,
				rateFix
			);
		}

		const lines = plain.split('\n');
		const longest = Math.max(...lines.map((l) => l.length));
		const totalChars = lines.join(' ').length;
		const fitsInLines = totalChars <= profile.maxCharsPerLine.value * profile.maxLines.value;
		if (longest > profile.maxCharsPerLine.value) {
			add(
				'line-too-long',
				'warning',
				`A line has ${longest} characters; at most ${profile.maxCharsPerLine.value} (${profile.maxCharsPerLine.source}).`,
				fitsInLines ? 'reflow-lines' : 'split-cue'
			);
		}
		if (lines.length > profile.maxLines.value) {
			add(
				'too-many-lines',
				'warning',
				`Has ${lines.length} lines; at most ${profile.maxLines.value} (${profile.maxLines.source}).`,
				fitsInLines ? 'reflow-lines' : 'split-cue'
			);
		}
	}
	return findings;
}
