/**
 * Pain on the 0–10 numeric rating scale: a single severe score, and the trend.
 *
 * - **Severe now.** A score of 7 or more is severe on the usual cut-points (mild 1–4, moderate
 *   5–6, severe 7–10: Serlin et al., Pain 1995;61:277–284, set in cancer pain and widely reused
 *   for other pain). Such a score — or the patient ticking "sharp or new pain" — raises a flag at
 *   once, whatever the trend says.
 * - **Trend, against a moving baseline.** The last 7 days are compared with the 7 days before
 *   them and with the best (lowest) 7 days so far, so a lone early score never blocks the
 *   comparison and a rebound after the usual early improvement is caught. A rise counts when it
 *   is 2 points or more, or 30% or more of the baseline (and at least one whole point, one step
 *   of the scale). Farrar et al. (Pain 2001;94:149–58) found about 2 points or about 30% to be a
 *   clinically important *reduction* in chronic pain; using the same sizes for a *rise* is our
 *   extrapolation, said wherever the threshold is shown.
 */
import { addDays, type LocalDate } from './calendar';

/** One pain score a patient logged, on the local date they logged it. */
export interface PainEntry {
	date: LocalDate;
	/** 0 = no pain … 10 = worst pain imaginable; whole numbers. */
	score: number;
	/** The patient ticked "sharp or new pain" on this log. */
	sharp?: boolean;
}

/** Farrar et al., Pain 2001;94:149–58: a change of about 2 points is clinically important. */
export const PAIN_IMPORTANT_CHANGE = 2;
/** Farrar et al., Pain 2001;94:149–58: … or of about 30%. */
export const PAIN_IMPORTANT_PERCENT = 30;
/** Serlin et al., Pain 1995;61:277–284: severe is 7–10 on the 0–10 scale. */
export const PAIN_SEVERE_FROM = 7;

/** Where the thresholds come from, to show beside a flag. */
export const PAIN_BASIS =
	'Farrar et al., Pain 2001;94:149–58: a change of about 2 points or about 30% on the 0–10 scale is clinically important (found for a fall in pain; we use the same sizes for a rise).';
export const SEVERE_PAIN_BASIS =
	'Serlin et al., Pain 1995;61:277–284: 7 to 10 is severe on the 0–10 scale (set in cancer pain, widely used for other pain).';

export type PainSeverity = 'none' | 'mild' | 'moderate' | 'severe';

/** Serlin et al. 1995's bands: 0 none, 1–4 mild, 5–6 moderate, 7–10 severe. */
export function painSeverity(score: number): PainSeverity {
	checkScore(score);
	if (score === 0) return 'none';
	if (score <= 4) return 'mild';
	if (score < PAIN_SEVERE_FROM) return 'moderate';
	return 'severe';
}

/** A log that calls for attention at once: a severe score, or "sharp or new pain" ticked. */
export function isPainAlert(entry: PainEntry): boolean {
	return painSeverity(entry.score) === 'severe' || entry.sharp === true;
}

/** The logs of the last `days` days (to `asOf`) that call for attention, newest first. */
export function painAlerts(entries: readonly PainEntry[], asOf: LocalDate, days = 7): PainEntry[] {
	const from = addDays(asOf, 1 - days);
	return entries
		.filter((e) => e.date >= from && e.date <= asOf && isPainAlert(e))
		.sort((a, b) => (a.date < b.date ? 1 : a.date > b.date ? -1 : b.score - a.score));
}

export interface PainTrendOptions {
	/** Days in each window (default 7). */
	windowDays?: number;
	/** Entries a window needs before it is compared (default 3). */
	minEntries?: number;
}

interface Window {
	from: LocalDate;
	to: LocalDate;
}

export interface PainTrend {
	/** Mean of the baseline the recent days are compared with, or null when there is none. */
	baseline: number | null;
	/** Which earlier 7 days set the baseline. */
	baselineKind: 'previous' | 'best' | null;
	/** Mean of the last 7 days, or null without enough entries. */
	recent: number | null;
	/** recent − baseline, when both exist. */
	change: number | null;
	/** change ÷ baseline × 100; null when either is missing or the baseline is 0. */
	percentChange: number | null;
	direction: 'worse' | 'better' | 'steady' | null;
	/** True for a rise that counts (2 points, or 30% and a whole point) against either baseline. */
	flagged: boolean;
	/** Why it is or is not flagged, in a sentence. */
	reason: string;
	baselineWindow: Window | null;
	recentWindow: Window;
	basis: string;
}

// Means of whole numbers can land a hair under a threshold (7/3 − 1/3); compare with a tolerance.
const TOLERANCE = 1e-9;

const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
const oneDecimal = (x: number) => x.toFixed(1);

function checkScore(score: number) {
	if (!Number.isInteger(score) || score < 0 || score > 10) {
		throw new RangeError(`A pain score is a whole number from 0 to 10, not ${score}.`);
	}
}

/** Whether `change` from `baseline` is clinically important (see the module comment). */
function important(change: number, baseline: number): boolean {
	const size = Math.abs(change);
	if (size >= PAIN_IMPORTANT_CHANGE - TOLERANCE) return true;
	return (
		baseline > 0 &&
		size >= 1 - TOLERANCE &&
		(size / baseline) * 100 >= PAIN_IMPORTANT_PERCENT - TOLERANCE
	);
}

/** The pain trend as of `asOf` (its last 7 days included); never flags without enough entries. */
export function painTrend(
	entries: readonly PainEntry[],
	asOf: LocalDate,
	options: PainTrendOptions = {}
): PainTrend {
	const windowDays = options.windowDays ?? 7;
	const minEntries = options.minEntries ?? 3;
	for (const e of entries) checkScore(e.score);
	const upToNow = entries.filter((e) => e.date <= asOf);
	const within = (w: Window) =>
		upToNow.filter((e) => e.date >= w.from && e.date <= w.to).map((e) => e.score);

	const recentWindow = { from: addDays(asOf, 1 - windowDays), to: asOf };
	const recentScores = within(recentWindow);
	const recent = recentScores.length >= minEntries ? mean(recentScores) : null;

	// Earlier 7-day blocks, back from the one just before the recent days to the first log.
	const first = upToNow.map((e) => e.date).sort()[0];
	const blocks: { window: Window; mean: number }[] = [];
	for (let k = 1; first !== undefined; k++) {
		const window = {
			from: addDays(asOf, 1 - windowDays * (k + 1)),
			to: addDays(asOf, -windowDays * k)
		};
		if (window.to < first) break;
		const scores = within(window);
		if (scores.length >= minEntries) blocks.push({ window, mean: mean(scores) });
	}
	const previousTo = addDays(asOf, -windowDays);
	const previous = blocks.find((b) => b.window.to === previousTo) ?? null;
	const best = blocks.reduce<(typeof blocks)[number] | null>(
		(lowest, b) => (lowest === null || b.mean < lowest.mean - TOLERANCE ? b : lowest),
		null
	);

	const quiet = (reason: string): PainTrend => ({
		baseline: previous?.mean ?? best?.mean ?? null,
		baselineKind: previous ? 'previous' : best ? 'best' : null,
		recent,
		change: null,
		percentChange: null,
		direction: null,
		flagged: false,
		reason,
		baselineWindow: (previous ?? best)?.window ?? null,
		recentWindow,
		basis: PAIN_BASIS
	});
	const needs = `at least ${minEntries} scores`;
	if (recent === null) {
		return quiet(
			`Not compared: the last ${windowDays} days have ${recentScores.length} pain ${recentScores.length === 1 ? 'score' : 'scores'}; a comparison needs ${needs}.`
		);
	}
	if (!previous && !best) {
		return quiet(
			`Not compared yet: no earlier ${windowDays} days have ${needs} to compare the last ${windowDays} days with.`
		);
	}

	// Against the previous days first (what changed lately); the best days catch a slow climb.
	const candidates = [
		...(previous ? [{ kind: 'previous' as const, ...previous }] : []),
		...(best && best !== previous ? [{ kind: 'best' as const, ...best }] : [])
	];
	const rising = candidates.find((c) => recent - c.mean > 0 && important(recent - c.mean, c.mean));
	const chosen = rising ?? candidates[0];
	const change = recent - chosen.mean;
	const direction = rising
		? 'worse'
		: change < 0 && important(change, chosen.mean)
			? 'better'
			: 'steady';
	const label =
		chosen.kind === 'previous'
			? `the ${windowDays} days before`
			: `the best ${windowDays} days so far`;
	const from = `from an average of ${oneDecimal(chosen.mean)} in ${label} to ${oneDecimal(recent)} in the last ${windowDays} days`;
	const percent = chosen.mean === 0 ? null : (change / chosen.mean) * 100;
	const reason =
		direction === 'worse'
			? `Pain up ${oneDecimal(change)} points${percent === null ? '' : ` (${Math.round(percent)}%)`}, ${from}: a rise of ${PAIN_IMPORTANT_CHANGE} points or ${PAIN_IMPORTANT_PERCENT}% counts as important.`
			: direction === 'better'
				? `Pain down ${oneDecimal(-change)} points, ${from}.`
				: `Pain changed by ${oneDecimal(change)} points, ${from}: under the ${PAIN_IMPORTANT_CHANGE} points or ${PAIN_IMPORTANT_PERCENT}% that count as important.`;
	return {
		baseline: chosen.mean,
		baselineKind: chosen.kind,
		recent,
		change,
		percentChange: percent,
		direction,
		flagged: direction === 'worse',
		reason,
		baselineWindow: chosen.window,
		recentWindow,
		basis: PAIN_BASIS
	};
}
