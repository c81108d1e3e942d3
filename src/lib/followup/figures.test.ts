import { describe, expect, it } from 'vitest';
import { addDays, datesFrom } from '../clinical/calendar';
import {
	dailyPain,
	patientFigures,
	weeklyAdherence,
	type FigureInput,
	type FigureLog
} from './figures';

// Monday 30 November 2026 at noon in London; the programme starts Monday 2 November.
const now = new Date('2026-11-30T12:00:00Z');

let n = 0;
function log(localDate: string, pain: number, item = 'item-a'): FigureLog {
	n += 1;
	return {
		id: `log-${n}`,
		programmeItemId: item,
		exerciseTitle: item === 'item-a' ? 'Heel slides' : 'Quad sets',
		doneAt: new Date(`${localDate}T09:00:00Z`),
		localDate,
		setsDone: 1,
		repsDone: 10,
		pain,
		sharpPain: false,
		note: ''
	};
}

function input(logs: FigureLog[], changes: Partial<FigureInput> = {}): FigureInput {
	return {
		timeZone: 'Europe/London',
		operationDate: '2026-10-19',
		protocol: 'knee-replacement',
		protocolShiftWeeks: 0,
		affectedSide: 'left',
		birthYear: null,
		sex: null,
		programmes: [
			{
				id: 'p1',
				title: 'Home programme',
				status: 'published',
				startDate: '2026-11-02',
				endDate: null,
				items: [
					{
						id: 'item-a',
						exerciseTitle: 'Heel slides',
						sessionsPerDay: 1,
						daysPerWeek: 7,
						weekdays: null,
						rangeGuides: []
					}
				],
				pauses: []
			}
		],
		logs,
		rom: [],
		...changes
	};
}

describe('a patient’s follow-up figures', () => {
	it('counts adherence over 7 and 28 days with today only for what is done', () => {
		// Every day of the first three weeks, then 4 of the 7 days of 23–29 Nov, nothing yet today.
		const logs = [
			...datesFrom('2026-11-02', '2026-11-22').map((d) => log(d, 3)),
			...['2026-11-23', '2026-11-25', '2026-11-26', '2026-11-28'].map((d) => log(d, 3))
		];
		const f = patientFigures(input(logs), now);
		expect(f.today).toBe('2026-11-30');
		expect(f.adherence7).toMatchObject({ from: '2026-11-24', prescribed: 6, counted: 3 });
		expect(f.adherence7?.text).toBe('3 of 6 sessions (50%) over 24–30 Nov 2026');
		expect(f.adherence28).toMatchObject({ from: '2026-11-03', prescribed: 27, counted: 24 });
		expect(f.lastSession?.localDate).toBe('2026-11-28');
		expect(f.flags).toEqual([]);
	});

	it('flags a pain rise of 2 points or more over the 7 days before (Farrar et al., Pain 2001)', () => {
		const logs = [
			...datesFrom('2026-11-02', '2026-11-08').map((d) => log(d, 2)),
			...datesFrom('2026-11-09', '2026-11-23').map((d) => log(d, 3)),
			...datesFrom('2026-11-24', '2026-11-30').map((d) => log(d, 5))
		];
		const f = patientFigures(input(logs), now);
		expect(f.pain).toMatchObject({
			baseline: 3,
			baselineKind: 'previous',
			recent: 5,
			flagged: true
		});
		expect(f.flags.map((x) => x.kind)).toEqual(['pain-rise']);
		expect(f.flags[0].detail).toContain('Farrar et al. 2001');
	});

	it('flags one severe score or "sharp or new pain" at once (Serlin et al., Pain 1995: 7–10 severe)', () => {
		const steady = datesFrom('2026-11-02', '2026-11-28').map((d) => log(d, 2));
		expect(patientFigures(input(steady), now).flags).toEqual([]);
		const severe = [...steady, log('2026-11-29', 8)];
		const f = patientFigures(input(severe), now);
		// The one score also lifts the week's average by a point and more: both flags, severe first.
		expect(f.flags.map((x) => x.kind)).toEqual(['pain-severe', 'pain-rise']);
		expect(f.flags[0].detail).toBe('8/10 on 29 Nov 2026 (7 to 10 is severe — Serlin et al. 1995).');
		const sharp = [...steady, { ...log('2026-11-30', 4), sharpPain: true }];
		expect(patientFigures(input(sharp), now).flags[0]).toMatchObject({
			kind: 'pain-severe',
			detail: '4/10 on 30 Nov 2026, with sharp or new pain.'
		});
		// Eight days ago is no longer "now".
		const old = [...steady.filter((l) => l.localDate !== '2026-11-22'), log('2026-11-22', 9)];
		expect(patientFigures(input(old), now).flags.map((x) => x.kind)).not.toContain('pain-severe');
	});

	it('flags a week of prescribed sessions with nothing logged, not a quiet day', () => {
		const early = datesFrom('2026-11-02', '2026-11-20').map((d) => log(d, 2));
		expect(patientFigures(input(early), now).flags.map((x) => x.kind)).toEqual(['no-sessions']);
		expect(patientFigures(input(early), now).flags[0].detail).toBe(
			'None of the 7 sessions prescribed over 23–29 Nov 2026 was logged.'
		);
		const yesterday = [...early, log('2026-11-29', 2)];
		expect(patientFigures(input(yesterday), now).flags).toEqual([]);
	});

	it('gives time since the operation with the phase hint and its caution', () => {
		const f = patientFigures(input([]), now);
		expect(f.sinceOperation).toMatchObject({ weeks: 6, days: 42 });
		expect(f.sinceOperation?.text).toBe('6 weeks after the operation on 19 Oct 2026');
		expect(f.phase?.label).toBe('Strengthening');
		expect(f.phase?.caution).toMatch(/surgeon/);
		expect(patientFigures(input([], { operationDate: null }), now).sinceOperation).toBeNull();
	});

	it('prescribes nothing from a draft, and says so rather than 0%', () => {
		const draft = input([], {
			programmes: input([]).programmes.map((p) => ({ ...p, status: 'draft' as const }))
		});
		const f = patientFigures(draft, now);
		expect(f.prescribed).toBe(false);
		expect(f.adherence7).toBeNull();
		expect(f.flags).toEqual([]);
	});

	it('flags a range-of-motion loss beyond the measurement error', () => {
		const rom = [
			{
				id: 'a',
				motion: 'knee-flexion',
				side: 'left' as const,
				mode: 'active' as const,
				degrees: 100,
				measuredOn: '2026-11-16',
				note: '',
				instrument: 'goniometer' as const,
				armPosition: null
			},
			{
				id: 'b',
				motion: 'knee-flexion',
				side: 'left' as const,
				mode: 'active' as const,
				degrees: 85,
				measuredOn: '2026-11-27',
				note: '',
				instrument: 'goniometer' as const,
				armPosition: null
			}
		];
		const f = patientFigures(input([log('2026-11-30', 2)], { rom }), now);
		expect(f.flags.map((x) => x.kind)).toEqual(['rom-loss']);
		expect(f.flags[0].detail).toMatch(/^Knee flexion, left \(active\): Loss of 15°/);
	});
});

describe('charts’ numbers', () => {
	it('adds up each calendar week, this week to date', () => {
		const logs = datesFrom('2026-11-02', '2026-11-29')
			.filter((_, i) => i % 2 === 0)
			.map((d) => log(d, 3));
		const weeks = weeklyAdherence(input(logs), now);
		expect(weeks.map((w) => w.weekStart)).toEqual([
			'2026-11-02',
			'2026-11-09',
			'2026-11-16',
			'2026-11-23',
			'2026-11-30'
		]);
		expect(weeks[0].window).toMatchObject({ prescribed: 7, counted: 4 });
		expect(weeks[1].window).toMatchObject({ prescribed: 7, counted: 3 });
		// Monday 30 Nov, nothing logged yet: nothing counted against the patient.
		expect(weeks[4].window).toMatchObject({ prescribed: 0, counted: 0, percent: null });
		expect(weeks[4].weekEnd).toBe('2026-11-30');
	});

	it('averages each day’s pain scores', () => {
		const days = dailyPain(
			input([
				log('2026-11-02', 2),
				log('2026-11-02', 5, 'item-b'),
				log(addDays('2026-11-02', 1), 4)
			])
		);
		expect(days).toEqual([
			{ date: '2026-11-02', average: 3.5, highest: 5, count: 2 },
			{ date: '2026-11-03', average: 4, highest: 4, count: 1 }
		]);
	});
});
