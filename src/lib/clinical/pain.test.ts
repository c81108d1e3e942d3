import { describe, expect, it } from 'vitest';
import { addDays } from './calendar';
import {
	PAIN_BASIS,
	PAIN_IMPORTANT_CHANGE,
	PAIN_IMPORTANT_PERCENT,
	PAIN_SEVERE_FROM,
	painAlerts,
	painSeverity,
	painTrend,
	SEVERE_PAIN_BASIS,
	type PainEntry
} from './pain';

// Scores logged on consecutive days from `start`.
const logs = (start: string, scores: number[]): PainEntry[] =>
	scores.map((score, i) => ({ date: addDays(start, i), score }));

const asOf = '2026-05-24'; // recent window 18–24 May; the 7 days before: 11–17 May
const previousWeek = (scores: number[]) => logs('2026-05-11', scores);
const recentWeek = (scores: number[]) => logs('2026-05-18', scores);

describe('severity (Serlin et al., Pain 1995;61:277–284: mild 1–4, moderate 5–6, severe 7–10)', () => {
	it('puts each score in its band, severe from 7', () => {
		expect(PAIN_SEVERE_FROM).toBe(7);
		expect(SEVERE_PAIN_BASIS).toMatch(/Serlin et al\., Pain 1995;61:277–284/);
		expect([0, 1, 4, 5, 6, 7, 10].map(painSeverity)).toEqual([
			'none',
			'mild',
			'mild',
			'moderate',
			'moderate',
			'severe',
			'severe'
		]);
	});

	it('raises an alert for one severe score or a ticked "sharp or new pain", in the last 7 days', () => {
		const entries: PainEntry[] = [
			{ date: '2026-05-24', score: 6 },
			{ date: '2026-05-23', score: 7 },
			{ date: '2026-05-20', score: 3, sharp: true },
			// Eight days ago: outside the window.
			{ date: '2026-05-16', score: 9 }
		];
		expect(painAlerts(entries, asOf)).toEqual([
			{ date: '2026-05-23', score: 7 },
			{ date: '2026-05-20', score: 3, sharp: true }
		]);
	});
});

describe('pain trend against a moving baseline (Farrar et al., Pain 2001;94:149–58: about 2 points or about 30%)', () => {
	it('uses 2 points and 30%, and names the source and the extrapolation to a rise', () => {
		expect(PAIN_IMPORTANT_CHANGE).toBe(2);
		expect(PAIN_IMPORTANT_PERCENT).toBe(30);
		expect(PAIN_BASIS).toMatch(/Farrar et al\., Pain 2001;94:149–58/);
		expect(PAIN_BASIS).toMatch(/for a fall in pain; we use the same sizes for a rise/);
	});

	it('does not flag a rise of 1.9 that is also under 30%', () => {
		// Previous 7.0; recent ten scores adding to 89: 8.9 (+1.9, 27%).
		const recent = [...recentWeek([9, 9, 9, 9, 9, 9, 9]), ...recentWeek([9, 9, 8])];
		const t = painTrend([...previousWeek([7, 7, 7]), ...recent], asOf);
		expect(t.baseline).toBe(7);
		expect(t.recent).toBeCloseTo(8.9, 10);
		expect(t.flagged).toBe(false);
		expect(t.direction).toBe('steady');
		expect(t.reason).toBe(
			'Pain changed by 1.9 points, from an average of 7.0 in the 7 days before to 8.9 in the last 7 days: under the 2 points or 30% that count as important.'
		);
	});

	it('flags a rise of exactly 2.0', () => {
		const t = painTrend([...previousWeek([2, 2, 2]), ...recentWeek([4, 4, 4])], asOf);
		expect(t.change).toBe(2);
		expect(t.flagged).toBe(true);
		expect(t.baselineKind).toBe('previous');
		expect(t.percentChange).toBe(100);
		expect(t.reason).toBe(
			'Pain up 2.0 points (100%), from an average of 2.0 in the 7 days before to 4.0 in the last 7 days: a rise of 2 points or 30% counts as important.'
		);
	});

	it('flags 2.0 even when the means are thirds that do not subtract exactly in floating point', () => {
		const t = painTrend([...previousWeek([2, 2, 3]), ...recentWeek([4, 4, 5])], asOf);
		expect(t.change).toBeCloseTo(2, 10);
		expect(t.flagged).toBe(true);
	});

	it('flags a rise of 30% or more of at least one whole point', () => {
		// 5.0 → 6.5: +1.5 points, 30%.
		expect(painTrend([...previousWeek([5, 5, 5]), ...recentWeek([6, 7, 6, 7])], asOf).flagged).toBe(
			true
		);
		// 3.0 → 4.0: +1 point, 33%.
		expect(painTrend([...previousWeek([3, 3, 3]), ...recentWeek([4, 4, 4])], asOf).flagged).toBe(
			true
		);
		// 2.0 → 2.7: 33%, but under one step of the scale.
		const small = painTrend([...previousWeek([2, 2, 2]), ...recentWeek([3, 3, 2])], asOf);
		expect(small.percentChange).toBeCloseTo(33.3, 1);
		expect(small.flagged).toBe(false);
	});

	it('is not blocked for good by a lone score in the first week', () => {
		const entries = [
			{ date: '2026-05-04', score: 2 },
			...previousWeek([2, 2, 2]),
			...recentWeek([5, 4, 5])
		];
		const t = painTrend(entries, asOf);
		expect(t.flagged).toBe(true);
		expect(t.baseline).toBe(2);
	});

	it('catches a rebound after the usual early improvement', () => {
		const entries = [
			...logs('2026-05-04', [6, 6, 6]),
			...previousWeek([3, 3, 3]),
			...recentWeek([5, 5, 5])
		];
		const t = painTrend(entries, asOf);
		expect(t.flagged).toBe(true);
		expect(t.baselineKind).toBe('previous');
	});

	it('catches a slow climb against the best 7 days so far', () => {
		// 2.0, then 3.0, then 3.7: never 2 points in a week, yet 1.7 points (83%) above the best.
		const entries = [
			...logs('2026-05-04', [2, 2, 2]),
			...previousWeek([3, 3, 3]),
			...recentWeek([3, 4, 4])
		];
		const t = painTrend(entries, asOf);
		expect(t.flagged).toBe(true);
		expect(t.baselineKind).toBe('best');
		expect(t.baselineWindow).toEqual({ from: '2026-05-04', to: '2026-05-10' });
		expect(t.reason).toMatch(/in the best 7 days so far/);
	});

	it('reports a fall of 2 or more as better, without a flag', () => {
		const t = painTrend([...previousWeek([6, 6, 6]), ...recentWeek([3, 3, 4])], asOf);
		expect(t.direction).toBe('better');
		expect(t.flagged).toBe(false);
		expect(t.reason).toMatch(/^Pain down 2\.7 points/);
	});

	it('says why it does not compare with too few entries', () => {
		const fewRecent = painTrend([...previousWeek([2, 2, 2]), ...recentWeek([9, 9])], asOf);
		expect(fewRecent.flagged).toBe(false);
		expect(fewRecent.recent).toBeNull();
		expect(fewRecent.reason).toBe(
			'Not compared: the last 7 days have 2 pain scores; a comparison needs at least 3 scores.'
		);
		const nothingEarlier = painTrend([...previousWeek([2, 2]), ...recentWeek([8, 8, 8])], asOf);
		expect(nothingEarlier.flagged).toBe(false);
		expect(nothingEarlier.reason).toBe(
			'Not compared yet: no earlier 7 days have at least 3 scores to compare the last 7 days with.'
		);
		expect(painTrend([], asOf).reason).toMatch(/have 0 pain scores/);
	});

	it('ignores logs after the date asked', () => {
		const later = [
			...previousWeek([2, 2, 2]),
			...recentWeek([2, 2, 2]),
			...logs('2026-05-25', [9, 9, 9])
		];
		expect(painTrend(later, asOf).flagged).toBe(false);
	});

	it('refuses a score off the 0–10 scale', () => {
		expect(() => painTrend([{ date: '2026-05-04', score: 11 }], asOf)).toThrow('0 to 10');
		expect(() => painTrend([{ date: '2026-05-04', score: 2.5 }], asOf)).toThrow('whole number');
	});
});
