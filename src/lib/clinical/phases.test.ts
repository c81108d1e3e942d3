import { describe, expect, it } from 'vitest';
import {
	PHASE_CAUTION,
	PHASES,
	PROTOCOL_IDS,
	PROTOCOLS,
	laterPhaseFlag,
	phaseForWeek,
	phaseOnDate,
	protocolById
} from './phases';

const phaseAt = (protocol: string, week: number) => phaseForWeek(protocol, week)?.phase ?? null;

describe('rotator cuff repair phases (ASSET consensus, Thigpen et al. 2016, REFERENCES.md)', () => {
	it('protects for about 2 weeks, then passive motion to about week 6', () => {
		expect(phaseAt('rotator-cuff-repair', 0)).toBe('protection');
		expect(phaseAt('rotator-cuff-repair', 1)).toBe('protection');
		expect(phaseAt('rotator-cuff-repair', 2)).toBe('early-motion');
		expect(phaseAt('rotator-cuff-repair', 5)).toBe('early-motion');
	});

	it('restores active motion from about week 6 and strengthens from about week 12', () => {
		expect(phaseAt('rotator-cuff-repair', 6)).toBe('active-motion');
		expect(phaseAt('rotator-cuff-repair', 11)).toBe('active-motion');
		expect(phaseAt('rotator-cuff-repair', 12)).toBe('strengthening');
		expect(phaseAt('rotator-cuff-repair', 52)).toBe('strengthening');
	});

	it('carries its source, the next phase and the caution', () => {
		const hint = phaseForWeek('rotator-cuff-repair', 3);
		expect(hint).toMatchObject({
			protocolName: 'Rotator cuff repair',
			label: 'Early motion',
			fromWeek: 2,
			untilWeek: 6,
			next: { phase: 'active-motion', fromWeek: 6 },
			confidence: 'published',
			caution: PHASE_CAUTION
		});
		expect(hint?.basis).toMatch(/Thigpen et al\., J Shoulder Elbow Surg 2016/);
		expect(hint?.caution).toMatch(/surgeon's protocol and the treating clinician decide/);
		expect(phaseForWeek('rotator-cuff-repair', 20)?.next).toBeNull();
	});

	it('counts from the operation date: day 14 is the first day of week 2', () => {
		expect(phaseOnDate('rotator-cuff-repair', '2026-05-04', '2026-05-17')?.phase).toBe(
			'protection'
		);
		expect(phaseOnDate('rotator-cuff-repair', '2026-05-04', '2026-05-18')?.phase).toBe(
			'early-motion'
		);
	});
});

describe('knee replacement phases (common practice, from memory: no source in REFERENCES.md)', () => {
	it('says honestly that its weeks are not from a published source', () => {
		const hint = phaseForWeek('knee-replacement', 0);
		expect(hint?.confidence).toBe('common practice');
		expect(hint?.basis).toMatch(/Common practice, from memory/);
		expect(hint?.caution).toBe(PHASE_CAUTION);
	});

	it('moves early, since a new knee is moved from the first days', () => {
		expect(phaseAt('knee-replacement', 0)).toBe('early-motion');
		expect(phaseAt('knee-replacement', 2)).toBe('active-motion');
		expect(phaseAt('knee-replacement', 6)).toBe('strengthening');
		expect(phaseAt('knee-replacement', 12)).toBe('return-to-activity');
	});
});

describe('every table', () => {
	it('covers week 0 onward with no gaps, in phase order', () => {
		for (const id of PROTOCOL_IDS) {
			const phases = PROTOCOLS[id].phases;
			expect(phases[0].fromWeek).toBe(0);
			expect(phases.at(-1)?.untilWeek).toBeNull();
			for (let i = 1; i < phases.length; i++) {
				expect(phases[i].fromWeek).toBe(phases[i - 1].untilWeek);
				expect(PHASES.indexOf(phases[i].phase)).toBeGreaterThan(
					PHASES.indexOf(phases[i - 1].phase)
				);
			}
		}
	});

	it('gives no hint for an unknown protocol or before surgery', () => {
		expect(protocolById('')).toBeNull();
		expect(protocolById('toString')).toBeNull();
		expect(phaseForWeek('left total knee, Dr. own protocol', 3)).toBeNull();
		expect(phaseForWeek('rotator-cuff-repair', -1)).toBeNull();
		expect(phaseOnDate('knee-replacement', '2026-05-04', '2026-05-01')).toBeNull();
	});
});

describe('exercises from a later phase', () => {
	it('flags strengthening at week 4 after a rotator cuff repair', () => {
		const flag = laterPhaseFlag('strengthening', phaseForWeek('rotator-cuff-repair', 4));
		expect(flag?.message).toBe(
			'This exercise is marked strengthening, which the table starts at week 12. At week 4 after surgery the rotator cuff repair table suggests early motion.'
		);
		expect(flag?.caution).toBe(PHASE_CAUTION);
	});

	it('does not flag the same or an earlier phase, or an exercise without one', () => {
		const week4 = phaseForWeek('rotator-cuff-repair', 4);
		expect(laterPhaseFlag('early-motion', week4)).toBeNull();
		expect(laterPhaseFlag('protection', week4)).toBeNull();
		expect(laterPhaseFlag(null, week4)).toBeNull();
		expect(laterPhaseFlag('strengthening', null)).toBeNull();
		expect(laterPhaseFlag('active-motion', phaseForWeek('rotator-cuff-repair', 6))).toBeNull();
	});

	it('says so when the table has no such phase', () => {
		const flag = laterPhaseFlag('return-to-activity', phaseForWeek('rotator-cuff-repair', 30));
		expect(flag?.message).toMatch(/a phase the table does not reach/);
	});
});

describe('a surgeon’s earlier or later start', () => {
	it('moves every phase by the surgeon’s weeks (ASSET passive motion from about week 2 to 6, Thigpen 2016)', () => {
		// Two weeks later: week 6 is still passive motion, active motion starts at week 8.
		const later = phaseForWeek('rotator-cuff-repair', 6, 2);
		expect(later).toMatchObject({
			phase: 'early-motion',
			fromWeek: 4,
			untilWeek: 8,
			shiftWeeks: 2
		});
		expect(later?.next).toMatchObject({ phase: 'active-motion', fromWeek: 8 });
		// One week earlier: week 5 is already active motion.
		expect(phaseForWeek('rotator-cuff-repair', 5, -1)?.phase).toBe('active-motion');
		expect(phaseForWeek('rotator-cuff-repair', 6)?.phase).toBe('active-motion');
	});

	it('does not flag an exercise the surgeon’s timing allows, and names the move when it flags', () => {
		const later = phaseForWeek('rotator-cuff-repair', 6, 2);
		expect(laterPhaseFlag('early-motion', later)).toBeNull();
		expect(laterPhaseFlag('active-motion', later)?.message).toBe(
			'This exercise is marked active motion, which the table starts at week 8. At week 6 after surgery the rotator cuff repair table (moved 2 weeks later for the surgeon’s timing) suggests early motion.'
		);
	});

	it('says which repairs each table describes (ASSET: small and medium tears)', () => {
		expect(phaseForWeek('rotator-cuff-repair', 3)?.appliesTo).toMatch(/Small and medium tears/);
		expect(phaseForWeek('knee-replacement', 3)?.appliesTo).toMatch(/primary/);
	});
});
