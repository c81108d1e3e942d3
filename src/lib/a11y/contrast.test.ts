import { describe, expect, it } from 'vitest';
import { palette } from '../../../tailwind.config';
import { contrastRatio, meetsAA, parseHex, relativeLuminance } from './contrast';

describe('WCAG contrast ratio', () => {
	it('spans 1 to 21 (WCAG 2.2 definition of contrast ratio)', () => {
		expect(contrastRatio('#000000', '#ffffff')).toBeCloseTo(21, 5);
		expect(contrastRatio('#777', '#777')).toBeCloseTo(1, 5);
		expect(relativeLuminance('#ffffff')).toBeCloseTo(1, 10);
	});

	it("matches W3C technique G207's worked value: #E3660E on white is 3.4:1", () => {
		expect(contrastRatio('#E3660E', '#ffffff')).toBeCloseTo(3.4, 1);
	});

	it("matches W3C technique G183's worked value: #3366CC on black is 3.9:1", () => {
		expect(contrastRatio('#3366CC', '#000000')).toBeCloseTo(3.9, 1);
	});

	it('puts the AA line between #767676 and #777777 on white (computed from the formula)', () => {
		expect(contrastRatio('#767676', '#ffffff')).toBeCloseTo(4.54, 2);
		expect(meetsAA('#767676', '#ffffff')).toBe(true);
		expect(contrastRatio('#777777', '#ffffff')).toBeCloseTo(4.48, 2);
		expect(meetsAA('#777777', '#ffffff')).toBe(false);
		expect(contrastRatio('#595959', '#ffffff')).toBeCloseTo(7.0, 1);
	});

	it('gives large text the 3:1 threshold of SC 1.4.3', () => {
		expect(meetsAA('#E3660E', '#ffffff', true)).toBe(true);
		expect(meetsAA('#E3660E', '#ffffff')).toBe(false);
	});

	it('rejects what is not a hex colour', () => {
		expect(parseHex('#abc')).toEqual([170, 187, 204]);
		expect(() => parseHex('red')).toThrow('Not a hex colour');
	});
});

describe("Kinelume's palette (DESIGN.md §6)", () => {
	// Every pair the app puts text on; each must keep 4.5:1 (WCAG 2.2 SC 1.4.3, AA).
	const textPairs: [string, string, string, string][] = [
		['ink', palette.ink, 'paper', palette.paper],
		['ink', palette.ink, 'mist', palette.mist],
		['slate', palette.slate, 'paper', palette.paper],
		['slate', palette.slate, 'mist', palette.mist],
		['dusk', palette.dusk, 'paper', palette.paper],
		['dusk', palette.dusk, 'mist', palette.mist],
		['berry', palette.berry, 'white', '#ffffff'],
		['ochre', palette.ochre, 'white', '#ffffff'],
		['lichen-deep', palette['lichen-deep'], 'white', '#ffffff'],
		['white', '#ffffff', 'lichen-deep', palette['lichen-deep']],
		['white', '#ffffff', 'lichen', palette.lichen],
		['white', '#ffffff', 'ember', palette.ember]
	];
	for (const [fgName, fg, bgName, bg] of textPairs) {
		it(`${fgName} on ${bgName} keeps at least 4.5:1`, () => {
			expect(contrastRatio(fg, bg)).toBeGreaterThanOrEqual(4.5);
		});
	}

	it('reproduces the ratios DESIGN.md lists for ink and lichen on paper', () => {
		expect(contrastRatio(palette.ink, palette.paper)).toBeCloseTo(15.0, 0);
		expect(contrastRatio(palette.lichen, palette.paper)).toBeCloseTo(6.0, 0);
	});
});
