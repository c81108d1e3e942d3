import { describe, expect, it } from 'vitest';
import { addDays } from './calendar';
import { PAIN_BASIS, PAIN_IMPORTANT_CHANGE, painTrend, type PainEntry } from './pain';

// Scores logged on consecutive days from `start`.
const logs = (start: string, scores: number[]): PainEntry[] =>
	scores.map((score, i) => ({ date: addDays(start, i), score }));

const firstWeek = logs('2026-05-04', [2, 2, 2]); // baseline 2.0
const asOf = '2026-05-24'; // recent window: 18–24 May

describe('pain trend (Farrar et al., Pain 2001;94:149–58: about 2 points is clinically important)', () => {
	it('uses 2 points as the threshold and names its source', () => {
		expect(PAIN_IMPORTANT_CHANGE).toBe(2);
		expect(PAIN_BASIS).toMatch(/Farrar et al\., Pain 2001;94:149–58/);
	});

	it('does not flag a rise of 1.9', () => {
		// Ten scores adding to 39 over 18–24 May (two a day on three of the days): a mean of 3.9.
		const recent = [...logs('2026-05-18', [4, 4, 4, 4, 4, 4, 4]), ...logs('2026-05-18', [4, 4, 3])];
		const t = painTrend([...firstWeek, ...recent], asOf);
		expect(t.baseline).toBe(2);
		expect(t.recent).toBeCloseTo(3.9, 10);
		expect(t.flagged).toBe(false);
		expect(t.direction).toBe('steady');
		expect(t.reason).toBe(
			'Pain changed by 1.9 points, from an average of 2.0 in the first week to 3.9 in the last 7 days: under the 2 points that count as important.'
		);
	});

	it('flags a rise of exactly 2.0', () => {
		const t = painTrend([...firstWeek, ...logs('2026-05-20', [4, 4, 4])], asOf);
		expect(t.change).toBe(2);
		expect(t.flagged).toBe(true);
		expect(t.direction).toBe('worse');
		expect(t.percentChange).toBe(100);
		expect(t.reason).toBe(
			'Pain up 2.0 points, from an average of 2.0 in the first week to 4.0 in the last 7 days: a rise of 2 or more is clinically important.'
		);
	});

	it('flags 2.0 even when the means are thirds that do not subtract exactly in floating point', () => {
		// Baseline 7/3, recent 13/3: 13/3 − 7/3 is 2 only to within rounding.
		const t = painTrend([...logs('2026-05-04', [2, 2, 3]), ...logs('2026-05-20', [4, 4, 5])], asOf);
		expect(t.change).toBeCloseTo(2, 10);
		expect(t.flagged).toBe(true);
	});

	it('reports a fall of 2 or more as better, without a flag', () => {
		const t = painTrend([...logs('2026-05-04', [6, 6, 6]), ...logs('2026-05-20', [3, 3, 4])], asOf);
		expect(t.direction).toBe('better');
		expect(t.flagged).toBe(false);
		expect(t.reason).toMatch(/^Pain down 2\.7 points/);
	});

	it('says why it does not compare with too few entries', () => {
		const fewFirst = painTrend(
			[...logs('2026-05-04', [2, 2]), ...logs('2026-05-20', [8, 8, 8])],
			asOf
		);
		expect(fewFirst.flagged).toBe(false);
		expect(fewFirst.baseline).toBeNull();
		expect(fewFirst.reason).toBe(
			'Not compared: the first 7 days have 2 pain scores, and a baseline needs at least 3 scores.'
		);
		const fewRecent = painTrend([...firstWeek, ...logs('2026-05-23', [9, 9])], asOf);
		expect(fewRecent.flagged).toBe(false);
		expect(fewRecent.recent).toBeNull();
		expect(fewRecent.reason).toBe(
			'Not compared: the last 7 days have 2 pain scores; a comparison needs at least 3 scores.'
		);
		expect(painTrend([], asOf).reason).toMatch(/have 0 pain scores/);
	});

	it('waits until the recent week no longer overlaps the baseline week', () => {
		const t = painTrend(logs('2026-05-04', [1, 1, 1, 6, 6, 6, 6, 6, 6, 6]), '2026-05-13');
		expect(t.flagged).toBe(false);
		expect(t.reason).toMatch(/still overlap/);
	});

	it('can start the baseline at the programme start and ignores logs after the date asked', () => {
		const entries = [
			...logs('2026-05-01', [7, 7, 7]),
			...firstWeek,
			...logs('2026-05-20', [4, 4, 4])
		];
		expect(painTrend(entries, asOf).flagged).toBe(false); // baseline from 1 May: mean 4.5
		expect(painTrend(entries, asOf, { baselineStart: '2026-05-04' }).flagged).toBe(true);
		const later = [
			...firstWeek,
			...logs('2026-05-20', [2, 2, 2]),
			...logs('2026-05-25', [9, 9, 9])
		];
		expect(painTrend(later, asOf).flagged).toBe(false);
	});

	it('refuses a score off the 0–10 scale', () => {
		expect(() => painTrend([{ date: '2026-05-04', score: 11 }], asOf)).toThrow('0 to 10');
		expect(() => painTrend([{ date: '2026-05-04', score: 2.5 }], asOf)).toThrow('whole number');
	});
});
