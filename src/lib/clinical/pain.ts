/**
 * Pain trend on the 0–10 numeric rating scale: the average of the first week of logs (the
 * baseline) against the average of the last 7 days. A rise of 2 points or more is flagged, the
 * clinically important change reported by Farrar et al. (Pain 2001;94:149–58: about 2 points or
 * about 30%). The 2-point rule is the flag; the percentage is shown beside it, since 30% of a low
 * baseline (of 2, say) is well under a point.
 */
import { addDays, type LocalDate } from './calendar';

/** One pain score a patient logged, on the local date they logged it. */
export interface PainEntry {
	date: LocalDate;
	/** 0 = no pain … 10 = worst pain imaginable; whole numbers. */
	score: number;
}

/** Farrar et al., Pain 2001;94:149–58: a change of about 2 points is clinically important. */
export const PAIN_IMPORTANT_CHANGE = 2;

/** Where the threshold comes from, to show beside a flag. */
export const PAIN_BASIS =
	'Farrar et al., Pain 2001;94:149–58: a change of about 2 points (or about 30%) on the 0–10 scale is clinically important.';

export interface PainTrendOptions {
	/** The baseline week starts here; by default on the first logged date. */
	baselineStart?: LocalDate;
	/** Days in the baseline and in the recent window (default 7 each). */
	windowDays?: number;
	/** Entries each window needs before it is compared (default 3). */
	minEntries?: number;
}

export interface PainTrend {
	/** Mean of the baseline window, or null without enough entries. */
	baseline: number | null;
	/** Mean of the recent window, or null without enough entries. */
	recent: number | null;
	/** recent − baseline, when both exist. */
	change: number | null;
	/** change ÷ baseline × 100; null when either is missing or the baseline is 0. */
	percentChange: number | null;
	direction: 'worse' | 'better' | 'steady' | null;
	/** True only for a rise of at least PAIN_IMPORTANT_CHANGE points. */
	flagged: boolean;
	/** Why it is or is not flagged, in a sentence. */
	reason: string;
	baselineWindow: { from: LocalDate; to: LocalDate } | null;
	recentWindow: { from: LocalDate; to: LocalDate };
	basis: string;
}

// Means of whole numbers can land a hair under 2 (7/3 − 1/3); compare with a small tolerance.
const TOLERANCE = 1e-9;

const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
const oneDecimal = (x: number) => x.toFixed(1);

/** The pain trend as of `asOf` (its last 7 days included); never flags without enough entries. */
export function painTrend(
	entries: readonly PainEntry[],
	asOf: LocalDate,
	options: PainTrendOptions = {}
): PainTrend {
	const windowDays = options.windowDays ?? 7;
	const minEntries = options.minEntries ?? 3;
	for (const e of entries) {
		if (!Number.isInteger(e.score) || e.score < 0 || e.score > 10) {
			throw new RangeError(`A pain score is a whole number from 0 to 10, not ${e.score}.`);
		}
	}
	const recentWindow = { from: addDays(asOf, 1 - windowDays), to: asOf };
	const upToNow = entries.filter((e) => e.date <= asOf);
	const first = options.baselineStart ?? upToNow.map((e) => e.date).sort()[0];
	const baselineWindow = first ? { from: first, to: addDays(first, windowDays - 1) } : null;

	const within = (w: { from: LocalDate; to: LocalDate }) =>
		upToNow.filter((e) => e.date >= w.from && e.date <= w.to).map((e) => e.score);
	const baselineScores = baselineWindow ? within(baselineWindow) : [];
	const recentScores = within(recentWindow);
	const baseline = baselineScores.length >= minEntries ? mean(baselineScores) : null;
	const recent = recentScores.length >= minEntries ? mean(recentScores) : null;

	const quiet = (reason: string): PainTrend => ({
		baseline,
		recent,
		change: null,
		percentChange: null,
		direction: null,
		flagged: false,
		reason,
		baselineWindow,
		recentWindow,
		basis: PAIN_BASIS
	});
	const needs = `at least ${minEntries} scores`;
	if (baseline === null) {
		return quiet(
			`Not compared: the first ${windowDays} days have ${baselineScores.length} pain ${baselineScores.length === 1 ? 'score' : 'scores'}, and a baseline needs ${needs}.`
		);
	}
	if (baselineWindow && recentWindow.from <= baselineWindow.to) {
		return quiet(
			`Not compared yet: the last ${windowDays} days still overlap the first ${windowDays}, which set the baseline.`
		);
	}
	if (recent === null) {
		return quiet(
			`Not compared: the last ${windowDays} days have ${recentScores.length} pain ${recentScores.length === 1 ? 'score' : 'scores'}; a comparison needs ${needs}.`
		);
	}

	const change = recent - baseline;
	const direction =
		change >= PAIN_IMPORTANT_CHANGE - TOLERANCE
			? 'worse'
			: change <= -PAIN_IMPORTANT_CHANGE + TOLERANCE
				? 'better'
				: 'steady';
	const from = `from an average of ${oneDecimal(baseline)} in the first week to ${oneDecimal(recent)} in the last ${windowDays} days`;
	const reason =
		direction === 'worse'
			? `Pain up ${oneDecimal(change)} points, ${from}: a rise of ${PAIN_IMPORTANT_CHANGE} or more is clinically important.`
			: direction === 'better'
				? `Pain down ${oneDecimal(-change)} points, ${from}.`
				: `Pain changed by ${oneDecimal(change)} points, ${from}: under the ${PAIN_IMPORTANT_CHANGE} points that count as important.`;
	return {
		baseline,
		recent,
		change,
		percentChange: baseline === 0 ? null : (change / baseline) * 100,
		direction,
		flagged: direction === 'worse',
		reason,
		baselineWindow,
		recentWindow,
		basis: PAIN_BASIS
	};
}
