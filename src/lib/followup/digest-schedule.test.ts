import { describe, expect, it } from 'vitest';
import { digestWeek } from './digest-schedule';

const monday7 = { weekday: 1, hour: 7, timeZone: 'Europe/London' } as const;

describe('when the weekly digest is due', () => {
	it('falls due at 07:00 on Monday, London time, and stays due all week', () => {
		// 30 Nov 2026 is a Monday; London is on GMT in winter (common practice: UK clock rules).
		expect(digestWeek(new Date('2026-11-30T06:59:00Z'), monday7)).toMatchObject({
			weekStart: '2026-11-30',
			due: false
		});
		const due = digestWeek(new Date('2026-11-30T07:00:00Z'), monday7);
		expect(due).toMatchObject({ weekStart: '2026-11-30', due: true });
		expect(due.dueAt.toISOString()).toBe('2026-11-30T07:00:00.000Z');
		expect(digestWeek(new Date('2026-12-06T23:59:00Z'), monday7)).toMatchObject({
			weekStart: '2026-11-30',
			due: true
		});
	});

	it('follows summer time and other weekdays and zones', () => {
		// 1 June 2026 is a Monday; London is on BST (UTC+1), so 07:00 local is 06:00 UTC.
		expect(digestWeek(new Date('2026-06-01T06:30:00Z'), monday7).due).toBe(true);
		const friday = { weekday: 5, hour: 16, timeZone: 'America/New_York' } as const;
		const week = digestWeek(new Date('2026-06-05T19:00:00Z'), friday);
		expect(week).toMatchObject({ weekStart: '2026-06-01', due: false });
		expect(week.dueAt.toISOString()).toBe('2026-06-05T20:00:00.000Z');
	});
});
