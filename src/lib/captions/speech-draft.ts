/**
 * Draft cues timed to the narration, for a track that has none yet. The speech is what lies
 * between the silences ffmpeg finds; pauses of at least the guideline's gap end a cue, and a
 * stretch of speech longer than the guideline's longest cue is cut at its longest pauses. Words
 * recognised by a speech-to-text service, when there are any, go into the cue on screen at their
 * time; without them every cue is blank, ready for the clinician to type into.
 */
import type { GuidelineProfile } from './checks';
import { reflowLines } from './fixes';
import { toMillis } from './timestamp';
import type { Cue } from './types';

export interface TimeSpan {
	start: number;
	end: number;
}

/** A stretch of recognised speech with its words, as a speech-to-text service returns it. */
export interface RecognisedSegment extends TimeSpan {
	text: string;
}

export interface DraftLimits {
	/** A cue should be on screen at least this long. */
	minSeconds: number;
	/** And at most this long: longer speech is cut at its pauses. */
	maxSeconds: number;
	/** A pause at least this long always ends a cue (a shorter gap between cues flickers). */
	minGapSeconds: number;
	/** For laying recognised words out in lines. */
	maxCharsPerLine: number;
	/** Sound shorter than this between two silences is a click, not speech. Default 0.15 s. */
	minSpeechSeconds?: number;
}

export interface SpeechDraftInput {
	/** Silences in time order, as the detector found them. */
	silences: readonly TimeSpan[];
	durationSeconds: number;
	/** Recognised words with their times; absent when no service gave any. */
	segments?: readonly RecognisedSegment[];
}

export interface SpeechDraftCues {
	cues: Cue[];
	/** Cuts made at even times inside speech with no pause to cut at. */
	evenCuts: number;
}

/** The limits of a guideline profile, with where each comes from kept in the profile. */
export function draftLimits(profile: GuidelineProfile): DraftLimits {
	return {
		minSeconds: profile.minSeconds.value,
		maxSeconds: profile.maxSeconds.value,
		minGapSeconds: profile.minGapSeconds.value,
		maxCharsPerLine: profile.maxCharsPerLine.value
	};
}

/**
 * The stretches of `[0, durationSeconds]` outside every silence, in time order. Sound shorter
 * than `minSpeechSeconds` is left out: a click or a breath between two silences is no cue.
 */
export function speechRegions(
	silences: readonly TimeSpan[],
	durationSeconds: number,
	minSpeechSeconds = 0.15
): TimeSpan[] {
	const quiet = [...silences]
		.filter((s) => s.end > s.start)
		.sort((a, b) => a.start - b.start || a.end - b.end);
	const regions: TimeSpan[] = [];
	let from = 0;
	for (const silence of quiet) {
		const start = from;
		const end = Math.min(silence.start, durationSeconds);
		if (end - start >= minSpeechSeconds) regions.push({ start, end });
		from = Math.max(from, silence.end);
	}
	if (durationSeconds - from >= minSpeechSeconds)
		regions.push({ start: from, end: durationSeconds });
	return regions;
}

/** Regions in time order with overlapping ones joined. */
function joinOverlaps(spans: readonly TimeSpan[]): TimeSpan[] {
	const sorted = [...spans].sort((a, b) => a.start - b.start);
	const out: TimeSpan[] = [];
	for (const span of sorted) {
		const last = out.at(-1);
		if (last && span.start <= last.end) last.end = Math.max(last.end, span.end);
		else out.push({ ...span });
	}
	return out;
}

/**
 * Cuts `[start, end]` (the speech `regions` inside it) into parts no longer than the limit: at
 * the longest pause that leaves both sides long enough, else at the pause that leaves the
 * shorter side longest, else (speech with no pause) at even times. A part ends where the speech
 * after the pause begins, so the cue stays up through the pause and the next follows with no gap.
 */
function cutAtPauses(
	regions: readonly TimeSpan[],
	start: number,
	end: number,
	limits: DraftLimits,
	counter: { evenCuts: number }
): TimeSpan[] {
	if (end - start <= limits.maxSeconds) return [{ start, end }];
	let best: { k: number; fits: boolean; pause: number; shorter: number } | null = null;
	for (let k = 1; k < regions.length; k++) {
		const cut = regions[k].start;
		const pause = cut - regions[k - 1].end;
		const shorter = Math.min(cut - start, end - cut);
		const fits = shorter >= limits.minSeconds;
		const better =
			!best ||
			(fits && !best.fits) ||
			(fits === best.fits &&
				(fits
					? pause > best.pause + 1e-9 ||
						(Math.abs(pause - best.pause) <= 1e-9 && shorter > best.shorter)
					: shorter > best.shorter));
		if (better) best = { k, fits, pause, shorter };
	}
	if (best) {
		const cut = regions[best.k].start;
		return [
			...cutAtPauses(regions.slice(0, best.k), start, cut, limits, counter),
			...cutAtPauses(regions.slice(best.k), cut, end, limits, counter)
		];
	}
	const parts = Math.ceil((end - start) / limits.maxSeconds - 1e-9);
	counter.evenCuts += parts - 1;
	const step = (end - start) / parts;
	return Array.from({ length: parts }, (_, i) => ({
		start: start + i * step,
		end: i === parts - 1 ? end : start + (i + 1) * step
	}));
}

/** Gives a cue shorter than the guideline's minimum more time, where there is room for it. */
function lengthenShort(
	spans: TimeSpan[],
	limits: DraftLimits,
	durationSeconds: number
): TimeSpan[] {
	const out = spans.map((s) => ({ ...s }));
	for (let i = 0; i < out.length; i++) {
		const span = out[i];
		if (span.end - span.start >= limits.minSeconds) continue;
		const next = out[i + 1];
		const wanted = span.start + limits.minSeconds;
		const room = next ? next.start - limits.minGapSeconds : durationSeconds;
		// Held on after the speech into the quiet that follows, leaving a full gap before the next.
		if (wanted <= room) {
			span.end = Math.max(span.end, wanted);
			continue;
		}
		// Otherwise shown together with a neighbour, when both fit on screen for the longest time.
		const previous = out[i - 1];
		const withNext = next ? next.end - span.start : Infinity;
		const withPrevious = previous ? span.end - previous.start : Infinity;
		if (Math.min(withNext, withPrevious) <= limits.maxSeconds) {
			if (withNext <= withPrevious) {
				next.start = span.start;
				out.splice(i, 1);
			} else {
				previous.end = span.end;
				out.splice(i, 1);
			}
			i = Math.max(-1, i - 2);
			continue;
		}
		// Or kept up until the next one starts (the checks say if it is still short).
		if (next) span.end = Math.max(span.end, Math.min(wanted, next.start));
		else span.end = Math.max(span.end, Math.min(wanted, durationSeconds));
	}
	return out;
}

/**
 * Cue times for speech regions: one cue per stretch of speech between pauses of at least
 * `minGapSeconds`, each cut at its longest pauses until it is no longer than `maxSeconds`; a cue
 * still shorter than `minSeconds` is held on into the quiet after it, or joined to a neighbour.
 */
export function timeCues(
	regions: readonly TimeSpan[],
	durationSeconds: number,
	limits: DraftLimits
): { spans: TimeSpan[]; evenCuts: number } {
	const ordered = joinOverlaps(
		regions
			.map((r) => ({ start: Math.max(0, r.start), end: Math.min(durationSeconds, r.end) }))
			.filter((r) => r.end > r.start)
	);
	const counter = { evenCuts: 0 };
	const spans: TimeSpan[] = [];
	let block: TimeSpan[] = [];
	const flush = () => {
		if (block.length === 0) return;
		spans.push(...cutAtPauses(block, block[0].start, block.at(-1)!.end, limits, counter));
		block = [];
	};
	for (const region of ordered) {
		const last = block.at(-1);
		if (last && region.start - last.end >= limits.minGapSeconds) flush();
		block.push(region);
	}
	flush();
	const lengthened = lengthenShort(spans, limits, durationSeconds).map((s) => ({
		start: toMillis(s.start),
		end: toMillis(s.end)
	}));
	return { spans: lengthened, evenCuts: counter.evenCuts };
}

/** Recognised text made safe as WebVTT cue text: `&`, `<` and `>` as character references. */
export function escapeCueText(text: string): string {
	return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');
}

/** The index of the span on screen at `time`, or else the nearest one. */
function spanFor(spans: readonly TimeSpan[], time: number): number {
	let nearest = 0;
	let distance = Infinity;
	for (let i = 0; i < spans.length; i++) {
		const { start, end } = spans[i];
		if (time >= start && time < end) return i;
		const d = time < start ? start - time : time - end;
		if (d < distance) {
			distance = d;
			nearest = i;
		}
	}
	return nearest;
}

/**
 * The words of `segments` shared out over `spans`: each word is placed in time by its share of
 * its segment's characters and goes to the span on screen then (or the nearest). Returns each
 * span's text, laid out in lines of at most `maxCharsPerLine`.
 */
export function wordsForSpans(
	spans: readonly TimeSpan[],
	segments: readonly RecognisedSegment[],
	maxCharsPerLine: number
): string[] {
	const words: string[][] = spans.map(() => []);
	if (spans.length === 0) return [];
	for (const segment of segments) {
		const list = segment.text.trim().split(/\s+/).filter(Boolean);
		if (list.length === 0) continue;
		const weights = list.map((w) => w.length + 1);
		const total = weights.reduce((a, b) => a + b, 0);
		const length = Math.max(0, segment.end - segment.start);
		let before = 0;
		list.forEach((word, j) => {
			const time = segment.start + ((before + weights[j] / 2) / total) * length;
			before += weights[j];
			words[spanFor(spans, time)].push(word);
		});
	}
	return words.map((w) =>
		w.length ? reflowLines(escapeCueText(w.join(' ')), maxCharsPerLine) : ''
	);
}

/**
 * Draft cues for a recording with no captions: timed to the speech between `silences`, carrying
 * the recognised words of `segments` when given (speech the detector missed but the service
 * heard is timed from the service's segment), blank otherwise.
 */
export function draftCues(input: SpeechDraftInput, limits: DraftLimits): SpeechDraftCues {
	const { durationSeconds } = input;
	let regions = speechRegions(input.silences, durationSeconds, limits.minSpeechSeconds);
	const heard = (input.segments ?? []).filter(
		(s) => s.text.trim() !== '' && s.end > s.start && s.start < durationSeconds
	);
	const missed = heard.filter((s) => !regions.some((r) => r.start < s.end && s.start < r.end));
	if (missed.length > 0) {
		regions = joinOverlaps([
			...regions,
			...missed.map((s) => ({ start: Math.max(0, s.start), end: Math.min(durationSeconds, s.end) }))
		]);
	}
	const { spans, evenCuts } = timeCues(regions, durationSeconds, limits);
	const texts = heard.length > 0 ? wordsForSpans(spans, heard, limits.maxCharsPerLine) : [];
	return {
		cues: spans.map((span, i) => ({
			id: '',
			start: span.start,
			end: span.end,
			text: texts[i] ?? ''
		})),
		evenCuts
	};
}

/** Where a draft's words came from: a speech-to-text service, its stand-in, or nowhere. */
export type DraftWords = 'recognised' | 'placeholder' | 'none';

/** A draft as the studio receives it (`GET /api/tracks/[id]/speech-draft`); never a saved version. */
export interface SpeechDraft {
	state: 'ready';
	cues: Cue[];
	words: DraftWords;
	/** `stored`: from the silences kept for segment suggestions; `measured`: detected for this draft. */
	timing: 'stored' | 'measured';
	/** The guideline the cue lengths follow, by its label. */
	guideline: string;
	/** Sentences for the clinician: where the times and words came from, and what to check. */
	notes: string[];
}

/** The answer while the sound is still being read: ask again. */
export interface SpeechDraftWorking {
	state: 'working';
}

export type SpeechDraftAnswer = SpeechDraft | SpeechDraftWorking;
