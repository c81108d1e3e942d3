import { describe, expect, it } from 'vitest';
import { romLosses, romRows, type RomReading } from './rom-table';

let n = 0;
function reading(
	partial: Partial<RomReading> & Pick<RomReading, 'degrees' | 'measuredOn'>
): RomReading {
	n += 1;
	return {
		id: `r${n}`,
		motion: 'knee-flexion',
		side: 'left',
		mode: 'active',
		note: '',
		instrument: 'goniometer',
		armPosition: null,
		...partial
	};
}

describe('range-of-motion rows', () => {
	it('shows a reading against the AAOS normal and the other side', () => {
		const rows = romRows(
			[
				reading({ degrees: 95, measuredOn: '2026-11-20' }),
				reading({ side: 'right', degrees: 117, measuredOn: '2026-11-20' })
			],
			{ source: 'aaos', affectedSide: 'left' }
		);
		const left = rows.find((r) => r.side === 'left')!;
		// AAOS knee flexion 135° is from memory (REFERENCES.md); the screen names the table only.
		expect(left.normal?.text).toBe('Knee flexion 95° = 70% of the AAOS normal 135°');
		expect(left.otherSide?.text).toBe('81% of the right side (117°)');
		expect(left.affected).toBe(true);
		// The unaffected side is the reference, not compared with the affected one.
		expect(rows.find((r) => r.side === 'right')!.otherSide).toBeNull();
	});

	it('compares extension with the other side in degrees, never as a percentage', () => {
		// Common practice (REFERENCES.md): a ratio means nothing for readings near zero that change sign.
		const rows = romRows(
			[
				reading({ motion: 'knee-extension', degrees: -10, measuredOn: '2026-11-20' }),
				reading({ motion: 'knee-extension', side: 'right', degrees: 3, measuredOn: '2026-11-20' })
			],
			{ source: 'aaos', affectedSide: 'left' }
		);
		const left = rows.find((r) => r.side === 'left')!;
		expect(left.otherSide).toMatchObject({ percent: null, difference: -13 });
		expect(left.otherSide?.text).toBe('13° less than the right side (3°)');
	});

	it('counts a change only beyond the measurement error', () => {
		// Knee goniometry needs 10° to be sure of a change (lib/clinical/rom, J Exp Orthop 2018).
		const rows = romRows(
			[
				reading({ degrees: 90, measuredOn: '2026-11-06' }),
				reading({ degrees: 96, measuredOn: '2026-11-13' }),
				reading({ degrees: 110, measuredOn: '2026-11-20' }),
				reading({ degrees: 97, measuredOn: '2026-11-27' })
			],
			{ source: 'aaos', affectedSide: 'left' }
		);
		expect(rows[0].change).toBeNull();
		expect(rows[1].change?.text).toBe(
			'Change of 6° since 6 Nov 2026 (90°) is within the measurement error (±10°) — not counted as a change.'
		);
		expect(rows[2].change?.text).toBe(
			'Gain of 14° since 13 Nov 2026 (96°): more than the measurement error (±10°).'
		);
		expect(rows[3].change?.direction).toBe('loss');
		expect(romLosses(rows).map((r) => r.id)).toEqual([rows[3].id]);
	});

	it('keeps active and passive, and each side, as separate series', () => {
		const rows = romRows(
			[
				reading({ degrees: 90, measuredOn: '2026-11-06', mode: 'passive' }),
				reading({ degrees: 70, measuredOn: '2026-11-13', mode: 'active' })
			],
			{ source: 'aaos', affectedSide: 'left' }
		);
		expect(rows.map((r) => r.change)).toEqual([null, null]);
		expect(romLosses(rows)).toEqual([]);
	});

	it('writes knee extension in degrees short of straight, never as a percentage of 0', () => {
		const [row] = romRows(
			[reading({ motion: 'knee-extension', degrees: -5, measuredOn: '2026-11-06' })],
			{
				source: 'aaos',
				affectedSide: 'left'
			}
		);
		expect(row.normal?.percent).toBeNull();
		expect(row.normal?.text).toBe('Knee extension −5° = 5° short of the AAOS normal 0°');
	});

	it('says when the chosen table has no value, and compares both sides when neither is marked', () => {
		const rows = romRows(
			[
				reading({ degrees: 100, measuredOn: '2026-11-06' }),
				reading({ side: 'right', degrees: 120, measuredOn: '2026-11-06' })
			],
			{ source: 'ama', affectedSide: 'both' }
		);
		expect(rows[0].normal).toBeNull();
		expect(rows[0].normalMissing).toBe(
			'The AMA Guides table has no value for knee flexion for this patient.'
		);
		expect(rows.map((r) => r.otherSide?.percent && Math.round(r.otherSide.percent))).toEqual([
			83, 120
		]);
		expect(rows[0].affected).toBeNull();
	});
});

describe('readings compared like with like', () => {
	it('gives no 90°-abduction normal to an external rotation read with the arm at the side (REFERENCES.md: AAOS ER is measured in 90° abduction)', () => {
		const [row] = romRows(
			[
				reading({
					motion: 'shoulder-external-rotation',
					degrees: 25,
					measuredOn: '2026-11-20',
					armPosition: 'side'
				})
			],
			{ source: 'aaos', affectedSide: 'left' }
		);
		expect(row.normal).toBeNull();
		expect(row.normalMissing).toMatch(/arm raised to 90°.*arm at the side/);
		expect(row.howMeasured).toBe('Goniometer, arm at the side');
	});

	it('uses the patient’s sex and age for the CDC table (Soucie et al. 2011, secondary: female flexion 172.0 at 20–44)', () => {
		const flexion = reading({ motion: 'shoulder-flexion', degrees: 86, measuredOn: '2026-11-20' });
		const [known] = romRows([flexion], {
			source: 'cdc',
			affectedSide: 'left',
			birthYear: 1990,
			sex: 'female'
		});
		expect(known.normal?.percent).toBeCloseTo(50, 5);
		const [unknown] = romRows([flexion], { source: 'cdc', affectedSide: 'left' });
		expect(unknown.normalMissing).toMatch(/record the patient's birth year and sex/);
		// Born 1981, measured 2026: 44 or 45, at the band's edge, so no guess.
		const [edge] = romRows([flexion], {
			source: 'cdc',
			affectedSide: 'left',
			birthYear: 1981,
			sex: 'female'
		});
		expect(edge.normal).toBeNull();
	});

	it('does not call a change of instrument a change of range', () => {
		const rows = romRows(
			[
				reading({ degrees: 90, measuredOn: '2026-11-02', instrument: 'inclinometer' }),
				reading({ degrees: 70, measuredOn: '2026-11-20', instrument: 'goniometer' })
			],
			{ source: 'aaos', affectedSide: 'left' }
		);
		expect(rows[1].change).toBeNull();
		expect(romLosses(rows)).toEqual([]);
	});

	it('judges each reading against the clinician’s limit that held on its date', () => {
		const [row] = romRows(
			[
				reading({
					motion: 'shoulder-external-rotation',
					degrees: 30,
					measuredOn: '2026-11-20',
					armPosition: 'side'
				})
			],
			{
				source: 'aaos',
				affectedSide: 'left',
				operationDate: '2026-11-02',
				rangeGuides: [
					{
						guide: {
							motion: 'shoulder-external-rotation',
							kind: 'limit',
							degrees: 20,
							untilWeek: 6,
							untilDate: null
						},
						from: '2026-11-16',
						to: null
					}
				]
			}
		);
		expect(row.guides.map((g) => g.text)).toEqual(['10° beyond the limit of 20° set for now.']);
	});
});

describe('guides judge only what they were set for (review cases)', () => {
	const limit = {
		guide: {
			motion: 'shoulder-external-rotation' as const,
			kind: 'limit' as const,
			degrees: 20,
			untilWeek: null,
			untilDate: null
		},
		from: '2026-11-16',
		to: '2026-12-20'
	};
	const rotation = (side: 'left' | 'right', measuredOn: string) =>
		reading({
			motion: 'shoulder-external-rotation',
			side,
			degrees: 85,
			measuredOn,
			armPosition: 'abducted-90'
		});

	it('judges the affected side only, within the programme’s days', () => {
		const rows = romRows(
			[
				rotation('left', '2026-11-20'),
				rotation('right', '2026-11-20'),
				rotation('right', '2026-11-10')
			],
			{ source: 'aaos', affectedSide: 'right', rangeGuides: [limit] }
		);
		const byKey = (side: string, date: string) =>
			rows.find((r) => r.side === side && r.measuredOn === date)!;
		expect(byKey('left', '2026-11-20').guides).toEqual([]);
		expect(byKey('right', '2026-11-20').guides[0].verdict).toBe('beyond-limit');
		// Before the programme that set the limit started.
		expect(byKey('right', '2026-11-10').guides).toEqual([]);
	});
});
