/**
 * Follow-up figures in words. Each sentence carries its basis (what was counted, over which days,
 * against which source) so that a number never stands alone on a clinician's screen.
 */
import { describeAdherence, type AdherenceWindow } from '../clinical/adherence';
import { describeTimeSince, weeksSince, type LocalDate } from '../clinical/calendar';
import {
	PAIN_IMPORTANT_CHANGE,
	PAIN_IMPORTANT_PERCENT,
	PAIN_SEVERE_FROM,
	type PainEntry,
	type PainTrend
} from '../clinical/pain';

// Dates are written as on every other screen (format/dates).
import { formatDate, formatDateRange } from '../format/dates';
export { formatDate, formatDateRange, formatShortDate } from '../format/dates';

/** A number with at most one decimal, trailing '.0' kept for averages: 5.5, 3.0. */
export const oneDecimal = (x: number): string => x.toFixed(1);

/** Degrees as written on a measurement form: 95°, 92.5°, −5°. */
export function formatDegrees(x: number): string {
	const text = Number.isInteger(x) ? String(Math.abs(x)) : Math.abs(x).toFixed(1);
	return `${x < 0 ? '−' : ''}${text}°`;
}

/** "5 of 7 sessions (71%) over 24–30 Nov 2026", or why there is no ratio. */
export function adherenceSentence(window: AdherenceWindow): string {
	return `${describeAdherence(window)} over ${formatDateRange(window.from, window.to)}`;
}

/** What a table cell says under the percentage: "5 of 7 sessions, 24–30 Nov" (", 2 extra"). */
export function adherenceBasis(window: AdherenceWindow): string {
	const range = formatDateRange(window.from, window.to, { year: false });
	const extra = window.extra > 0 ? `, ${window.extra} extra` : '';
	if (window.prescribed === 0) return `None due, ${range}${extra}`;
	return `${window.counted} of ${window.prescribed} ${window.prescribed === 1 ? 'session' : 'sessions'}, ${range}${extra}`;
}

/** Why a pain trend is not compared yet, in a few words for a table cell. */
export function painNotComparedBasis(trend: Pick<PainTrend, 'baseline' | 'recent'>): string {
	if (trend.recent === null) return 'fewer than 3 scores in the last 7 days';
	return 'no earlier 7 days with 3 scores';
}

/** Which earlier days a trend is measured from, in words: "the 7 days before", "the best 7 days". */
function baselineWords(trend: Pick<PainTrend, 'baselineKind'>): string {
	return trend.baselineKind === 'best' ? 'best 7 days' : '7 days before';
}

/** What a table cell says under the pain trend: "last 7 days 6.0 vs 7 days before 2.5". */
export function painBasis(
	trend: Pick<PainTrend, 'baseline' | 'recent' | 'baselineKind'>
): string | null {
	if (trend.baseline === null || trend.recent === null) return null;
	return `last 7 days ${oneDecimal(trend.recent)} vs ${baselineWords(trend)} ${oneDecimal(trend.baseline)}`;
}

/**
 * The pain trend in one sentence with its numbers and the threshold's source, e.g. "Pain flag:
 * recent average 5.5 is 2.5 above the 7 days before (3.0) (a rise of 2 points or 30% is
 * clinically important — Farrar et al. 2001, found for a fall in pain)".
 */
export function painSentence(trend: PainTrend): string {
	const cite = 'Farrar et al. 2001, found for a fall in pain';
	if (trend.baseline === null || trend.recent === null || trend.change === null) {
		return trend.reason;
	}
	const baseline = `the ${baselineWords(trend)} (${oneDecimal(trend.baseline)})`;
	const recent = oneDecimal(trend.recent);
	const size = oneDecimal(Math.abs(trend.change));
	const rule = `a rise of ${PAIN_IMPORTANT_CHANGE} points or ${PAIN_IMPORTANT_PERCENT}% is clinically important — ${cite}`;
	if (trend.flagged) {
		return `Pain flag: recent average ${recent} is ${size} above ${baseline} (${rule}).`;
	}
	if (trend.direction === 'better') {
		return `Pain easing: recent average ${recent} is ${size} below ${baseline}.`;
	}
	const relation = trend.change >= 0 ? 'above' : 'below';
	return `No pain flag: recent average ${recent} is ${size} ${relation} ${baseline}, under the ${PAIN_IMPORTANT_CHANGE} points or ${PAIN_IMPORTANT_PERCENT}% that count (${cite}).`;
}

/**
 * The severe or sharp pain of the last 7 days in one sentence, newest first: "8/10 on 3 Dec 2026,
 * with sharp or new pain; 7/10 on 1 Dec 2026 (7 to 10 is severe — Serlin et al. 1995)".
 */
export function painAlertSentence(alerts: readonly PainEntry[]): string {
	const each = alerts.map(
		(a) => `${a.score}/10 on ${formatDate(a.date)}${a.sharp ? ', with sharp or new pain' : ''}`
	);
	const severe = alerts.some((a) => a.score >= PAIN_SEVERE_FROM);
	return `${each.join('; ')}${severe ? ` (${PAIN_SEVERE_FROM} to 10 is severe — Serlin et al. 1995)` : ''}.`;
}

/** "6 weeks 3 days after the operation on 12 Oct 2026", or how far ahead a planned one is. */
export function weekAfterSentence(operationDate: LocalDate, today: LocalDate): string {
	const since = weeksSince(operationDate, today);
	if (since.days < 0) {
		return `Operation planned for ${formatDate(operationDate)} (${describeTimeSince(since)})`;
	}
	return `${describeTimeSince(since)} after the operation on ${formatDate(operationDate)}`;
}

/** "today", "yesterday", "5 days ago" — a date seen from the patient's today. */
export function daysAgo(date: LocalDate, today: LocalDate): string {
	const days = weeksSince(date, today).days;
	if (days === 0) return 'Today';
	if (days === 1) return 'Yesterday';
	if (days < 0) return formatDate(date);
	return `${days} days ago`;
}

/** The pain trend in a word, as the follow-up card heads it: a flagged rise is "Rising". */
export function painTrendWord(trend: Pick<PainTrend, 'flagged' | 'direction'>): string {
	if (trend.flagged) return 'Rising';
	if (trend.direction === 'better') return 'Easing';
	if (trend.direction === 'steady') return 'Steady';
	return 'Not compared';
}

/** A percentage figure, or a dash when there is nothing to divide by. */
export function percentText(percent: number | null): string {
	return percent === null ? '—' : `${percent}%`;
}
