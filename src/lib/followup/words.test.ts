import { describe, expect, it } from 'vitest';
import { adherence } from '../clinical/adherence';
import { painTrend } from '../clinical/pain';
import {
	painAlertSentence,
	adherenceBasis,
	adherenceSentence,
	daysAgo,
	formatDate,
	formatDateRange,
	formatDegrees,
	painBasis,
	painNotComparedBasis,
	painSentence,
	painTrendWord,
	percentText,
	weekAfterSentence
} from './words';

describe('dates and degrees in words', () => {
	it('writes dates and runs of days the British way', () => {
		expect(formatDate('2026-11-24')).toBe('24 Nov 2026');
		expect(formatDateRange('2026-11-24', '2026-11-30')).toBe('24–30 Nov 2026');
		expect(formatDateRange('2026-11-28', '2026-12-04')).toBe('28 Nov – 4 Dec 2026');
		expect(formatDateRange('2026-12-29', '2027-01-04')).toBe('29 Dec 2026 – 4 Jan 2027');
		expect(formatDateRange('2026-11-24', '2026-11-24')).toBe('24 Nov 2026');
		expect(formatDateRange('2026-11-28', '2026-12-04', { year: false })).toBe('28 Nov – 4 Dec');
		expect(formatDateRange('2026-12-29', '2027-01-04', { year: false })).toBe(
			'29 Dec 2026 – 4 Jan 2027'
		);
	});

	it('says how long ago a session was, from the patient’s today', () => {
		expect(daysAgo('2026-11-30', '2026-11-30')).toBe('Today');
		expect(daysAgo('2026-11-29', '2026-11-30')).toBe('Yesterday');
		expect(daysAgo('2026-11-25', '2026-11-30')).toBe('5 days ago');
	});

	it('writes degrees with a true minus sign and half degrees', () => {
		expect(formatDegrees(95)).toBe('95°');
		expect(formatDegrees(-5)).toBe('−5°');
		expect(formatDegrees(92.5)).toBe('92.5°');
	});
});

describe('figures with their basis', () => {
	const daily = { startDate: '2026-11-23', endDate: null, sessionsPerDay: 1, daysPerWeek: 7 };

	it('says what adherence counted and over which days', () => {
		const logs = ['2026-11-24', '2026-11-25', '2026-11-26', '2026-11-27', '2026-11-28'];
		const w = adherence(daily, logs, '2026-11-30', 7);
		expect(adherenceSentence(w)).toBe('5 of 7 sessions (71%) over 24–30 Nov 2026');
		expect(adherenceBasis(w)).toBe('5 of 7 sessions, 24–30 Nov');
		expect(adherenceBasis(adherence(daily, ['2026-11-01'], '2026-11-01', 7))).toBe(
			'None due, 26 Oct – 1 Nov, 1 extra'
		);
	});

	it('states a pain flag with both averages and the rule (Farrar et al., Pain 2001)', () => {
		const before = ['2026-11-17', '2026-11-18', '2026-11-19', '2026-11-20'].map((date) => ({
			date,
			score: 3
		}));
		const recent = [5, 6, 5, 6].map((score, i) => ({ date: `2026-11-2${i + 4}`, score }));
		const trend = painTrend([...before, ...recent], '2026-11-30');
		expect(trend.flagged).toBe(true);
		expect(painBasis(trend)).toBe('last 7 days 5.5 vs 7 days before 3.0');
		expect(painSentence(trend)).toBe(
			'Pain flag: recent average 5.5 is 2.5 above the 7 days before (3.0) (a rise of 2 points or 30% is clinically important — Farrar et al. 2001, found for a fall in pain).'
		);
	});

	it('says why a small rise is no flag, and why too few scores are not compared', () => {
		const before = ['2026-11-20', '2026-11-21', '2026-11-22'].map((date) => ({ date, score: 6 }));
		const recent = ['2026-11-26', '2026-11-27', '2026-11-28'].map((date) => ({ date, score: 7 }));
		const small = painTrend([...before, ...recent], '2026-11-30');
		expect(painSentence(small)).toBe(
			'No pain flag: recent average 7.0 is 1.0 above the 7 days before (6.0), under the 2 points or 30% that count (Farrar et al. 2001, found for a fall in pain).'
		);
		const few = painTrend([{ date: '2026-11-29', score: 3 }], '2026-11-30');
		expect(painSentence(few)).toMatch(/^Not compared/);
		expect(painNotComparedBasis(few)).toBe('fewer than 3 scores in the last 7 days');
		expect(painNotComparedBasis(painTrend(recent, '2026-11-30'))).toBe(
			'no earlier 7 days with 3 scores'
		);
	});

	it('lists severe or sharp pain with its dates and names the severity source', () => {
		expect(
			painAlertSentence([
				{ date: '2026-12-03', score: 8, sharp: true },
				{ date: '2026-12-01', score: 7 }
			])
		).toBe(
			'8/10 on 3 Dec 2026, with sharp or new pain; 7/10 on 1 Dec 2026 (7 to 10 is severe — Serlin et al. 1995).'
		);
		expect(painAlertSentence([{ date: '2026-12-03', score: 2, sharp: true }])).toBe(
			'2/10 on 3 Dec 2026, with sharp or new pain.'
		);
	});

	it('gives time since an operation in completed weeks and days', () => {
		expect(weekAfterSentence('2026-10-12', '2026-11-26')).toBe(
			'6 weeks 3 days after the operation on 12 Oct 2026'
		);
		expect(weekAfterSentence('2026-12-03', '2026-11-30')).toBe(
			'Operation planned for 3 Dec 2026 (in 3 days)'
		);
	});

	it('heads the pain card with one word, a flagged rise first', () => {
		expect(painTrendWord({ flagged: true, direction: 'better' })).toBe('Rising');
		expect(painTrendWord({ flagged: false, direction: 'worse' })).toBe('Not compared');
		expect(painTrendWord({ flagged: false, direction: 'better' })).toBe('Easing');
		expect(painTrendWord({ flagged: false, direction: 'steady' })).toBe('Steady');
		expect(painTrendWord({ flagged: false, direction: null })).toBe('Not compared');
	});

	it('writes a percentage, or a dash when there is none', () => {
		expect(percentText(71)).toBe('71%');
		expect(percentText(0)).toBe('0%');
		expect(percentText(null)).toBe('—');
	});
});
