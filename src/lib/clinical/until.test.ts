import { describe, expect, it } from 'vitest';
import { holdsOn, lastDay, parseUntil, untilText } from './until';
import { weeksSince } from './calendar';

const none = { untilWeek: null, untilDate: null };

describe('the end of a restriction', () => {
	it('counts "until week 6" in completed weeks, as phase tables do (ends on day 42)', () => {
		const op = '2026-11-02';
		const until = { untilWeek: 6, untilDate: null };
		expect(lastDay(until, op)).toBe('2026-12-13');
		// The last day is still week 5; the next day starts week 6.
		expect(weeksSince(op, '2026-12-13').weeks).toBe(5);
		expect(weeksSince(op, '2026-12-14').weeks).toBe(6);
		expect(holdsOn(until, op, '2026-12-13')).toBe(true);
		expect(holdsOn(until, op, '2026-12-14')).toBe(false);
	});

	it('holds on when the week is known but the operation date is not', () => {
		expect(lastDay({ untilWeek: 6, untilDate: null }, null)).toBeNull();
		expect(holdsOn({ untilWeek: 6, untilDate: null }, null, '2030-01-01')).toBe(true);
	});

	it('takes a date as the last day, and no end as always', () => {
		expect(holdsOn({ untilWeek: null, untilDate: '2026-12-20' }, null, '2026-12-20')).toBe(true);
		expect(holdsOn({ untilWeek: null, untilDate: '2026-12-20' }, null, '2026-12-21')).toBe(false);
		expect(holdsOn(none, '2026-11-02', '2099-01-01')).toBe(true);
	});

	it('reads what a clinician types, and refuses the rest in words', () => {
		expect(parseUntil('')).toEqual({ ok: true, until: none });
		expect(parseUntil('6')).toEqual({ ok: true, until: { untilWeek: 6, untilDate: null } });
		expect(parseUntil(' Week 12 ')).toEqual({
			ok: true,
			until: { untilWeek: 12, untilDate: null }
		});
		expect(parseUntil('2026-12-20')).toEqual({
			ok: true,
			until: { untilWeek: null, untilDate: '2026-12-20' }
		});
		expect(parseUntil('0')).toMatchObject({ ok: false, message: 'Write a week from 1.' });
		expect(parseUntil('2026-02-30')).toMatchObject({ ok: false });
		expect(parseUntil('soon')).toMatchObject({
			ok: false,
			message: expect.stringMatching(/neither a week/)
		});
		expect(untilText({ untilWeek: 6, untilDate: null })).toBe('6');
		expect(untilText(none)).toBe('');
	});
});
