import { describe, expect, it } from 'vitest';
import { calendarFile, reminderDays, reminderEvents, type CalendarInput } from './calendar';

const input: CalendarInput = {
	programmeId: 'p-1',
	title: 'Knee programme',
	timeZone: 'Europe/London',
	startDate: '2026-03-23',
	endDate: '2026-04-05',
	pauses: [{ fromDate: '2026-03-31', toDate: '2026-04-01' }],
	today: '2026-03-27',
	origin: 'http://localhost:3000',
	items: [
		{
			title: 'Heel slides',
			dosage: {
				sets: 1,
				reps: 8,
				holdSeconds: 0,
				restSeconds: 0,
				sessionsPerDay: 3,
				daysPerWeek: 7
			},
			progression: { kind: 'reps', addPerWeek: 2, ceiling: 15 },
			weekdays: null
		},
		{
			title: 'Ankle pumps',
			dosage: {
				sets: 2,
				reps: 10,
				holdSeconds: 0,
				restSeconds: 30,
				sessionsPerDay: 2,
				daysPerWeek: 7
			},
			progression: { kind: 'none' },
			weekdays: null
		}
	]
};

/** The lines of a VEVENT property, unfolded (RFC 5545 §3.1: a fold is CRLF then one space). */
function unfold(ics: string): string[] {
	return ics.replace(/\r\n[ \t]/g, '').split('\r\n');
}

describe('reminder days', () => {
	it('run from today to the end date, skipping pauses', () => {
		const days = reminderDays(input).map((d) => d.date);
		expect(days[0]).toBe('2026-03-27');
		expect(days.at(-1)).toBe('2026-04-05');
		expect(days).not.toContain('2026-03-31');
		expect(days).not.toContain('2026-04-01');
		expect(days).toHaveLength(10 - 2);
	});

	it("use the most sessions any exercise asks for, and that week's dosage", () => {
		const [first] = reminderDays(input);
		expect(first.sessions).toBe(3);
		expect(first.lines[0]).toBe('- Heel slides: 1 set of 8 reps; 3 times a day, every day.');
		// Week 2 starts on 2026-03-30: two more reps.
		const week2 = reminderDays(input).find((d) => d.date === '2026-04-02')!;
		expect(week2.lines[0]).toContain('1 set of 10 reps');
		// 8 × 4 s + 20 × 4 s + 30 s rest = 142 s, rounded up to 5 minutes.
		expect(first.minutesLong).toBe(5);
	});

	it('start at the programme start when that is later, and stop after 8 weeks without an end', () => {
		const open = reminderDays({ ...input, endDate: null, pauses: [], today: '2026-03-01' });
		expect(open[0].date).toBe('2026-03-23');
		expect(open).toHaveLength(56);
	});

	it('list an exercise on the weekdays the clinician chose, naming them', () => {
		const three = {
			...input,
			items: [
				input.items[0],
				{
					...input.items[1],
					dosage: { ...input.items[1].dosage, daysPerWeek: 3, sessionsPerDay: 4 },
					weekdays: [1, 3, 5] as (1 | 3 | 5)[]
				}
			]
		};
		const days = reminderDays(three);
		// 2026-03-27 is a Friday, 2026-03-28 a Saturday.
		const friday = days.find((d) => d.date === '2026-03-27')!;
		const saturday = days.find((d) => d.date === '2026-03-28')!;
		expect(friday.lines).toHaveLength(2);
		expect(friday.lines[1]).toMatch(/on Monday, Wednesday and Friday\.$/);
		expect(friday.sessions).toBe(4);
		expect(saturday.lines).toHaveLength(1);
		expect(saturday.sessions).toBe(3);
	});

	it('remind every programme day of an any-3-days exercise, inventing no weekday', () => {
		const any = {
			...input,
			items: [{ ...input.items[1], dosage: { ...input.items[1].dosage, daysPerWeek: 3 } }]
		};
		const days = reminderDays(any);
		expect(days.map((d) => d.date)).toContain('2026-03-28');
		expect(days[0].lines[0]).toBe(
			"- Ankle pumps: 2 sets of 10 reps, rest 30 seconds between sets; twice a day, 3 days a week. Leave it out once this week's 3 days are done."
		);
	});

	it('are none before a programme with no exercises', () => {
		expect(reminderDays({ ...input, items: [] })).toEqual([]);
	});
});

describe('the .ics file', () => {
	it('has one event per session per day at 09:00, 14:00 and 19:00 local, in UTC', () => {
		const events = reminderEvents(input);
		expect(events).toHaveLength(8 * 3);
		const file = unfold(calendarFile(input));
		// 27 March is GMT (UTC+0); the clocks go forward on 29 March, so 09:00 is 08:00 UTC then
		// (the UK's rule, last Sunday of March — from memory).
		const starts = file.filter((l) => l.startsWith('DTSTART'));
		expect(starts.slice(0, 3)).toEqual([
			'DTSTART:20260327T090000Z',
			'DTSTART:20260327T140000Z',
			'DTSTART:20260327T190000Z'
		]);
		expect(starts).toContain('DTSTART:20260330T080000Z');
	});

	it('is an RFC 5545 calendar with CRLF line ends, stable UIDs and a display alarm', () => {
		const raw = calendarFile(input);
		expect(raw.startsWith('BEGIN:VCALENDAR\r\nVERSION:2.0\r\n')).toBe(true);
		expect(raw.trimEnd().endsWith('END:VCALENDAR')).toBe(true);
		expect(raw.replace(/\r\n/g, '')).not.toContain('\n');
		const lines = unfold(raw);
		expect(lines).toContain('METHOD:PUBLISH');
		expect(lines).toContain('UID:p-1-2026-03-27-1@kinelume');
		expect(lines.filter((l) => l === 'BEGIN:VALARM')).toHaveLength(24);
		expect(lines.filter((l) => l === 'ACTION:DISPLAY')).toHaveLength(24);
		expect(lines).toContain('TRIGGER:-PT5M');
		expect(lines).toContain('SUMMARY:Home exercises: session 2 of 3');
		// Text values escape commas and semicolons (RFC 5545 §3.3.11).
		const description = lines.find((l) => l.startsWith('DESCRIPTION:Knee programme'))!;
		expect(description).toContain('Knee programme\\, session 1 of 3 today.');
		expect(description).toContain('1 set of 8 reps\\; 3 times a day');
		expect(description).toContain('http://localhost:3000/today');
		expect(description).toContain('Stop and contact your clinician if pain is sharp');
		// RFC 5545 §3.1: lines are at most 75 octets before folding.
		for (const line of raw.split('\r\n')) {
			expect(new TextEncoder().encode(line).length).toBeLessThanOrEqual(75);
		}
	});

	it('names one session a day plainly', () => {
		const once = {
			...input,
			items: [{ ...input.items[0], dosage: { ...input.items[0].dosage, sessionsPerDay: 1 } }]
		};
		const lines = unfold(calendarFile(once));
		expect(lines).toContain('SUMMARY:Home exercises: your session');
		expect(lines.filter((l) => l.startsWith('DTSTART'))[0]).toBe('DTSTART:20260327T090000Z');
	});
});
