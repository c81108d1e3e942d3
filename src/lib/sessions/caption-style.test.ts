import { describe, expect, it } from 'vitest';
import {
	BACKGROUND_COLOURS,
	captionStyleSchema,
	DEFAULT_CAPTION_STYLE,
	effectiveCaptionStyle,
	judgeContrast,
	normaliseHex,
	TEXT_COLOURS
} from './caption-style';

describe('caption colour contrast, as the patient sees it', () => {
	it('calls white on black easy to read at 21.0 : 1 (WCAG 2.2 contrast ratio range 1–21)', () => {
		expect(judgeContrast('#ffffff', '#000000')).toMatchObject({
			ratioText: '21.0 : 1',
			ok: true,
			words: 'easy to read'
		});
	});

	it('refuses #777777 on white: 4.48 : 1 is under SC 1.4.3 AA (computed from the formula)', () => {
		const verdict = judgeContrast('#777777', '#ffffff');
		expect(verdict.ok).toBe(false);
		// Rounded down, so a failing pair never reads as "4.5 : 1".
		expect(verdict.ratioText).toBe('4.4 : 1');
		expect(verdict.words).toBe('too faint, choose another');
	});

	it('accepts #767676 on white at 4.54 : 1, as readable but not easy (AA, not AAA 7 : 1)', () => {
		expect(judgeContrast('#767676', '#ffffff')).toMatchObject({
			ratioText: '4.5 : 1',
			ok: true,
			words: 'readable'
		});
	});

	it("matches W3C technique G207's worked value: #E3660E on white is 3.4 : 1, refused", () => {
		expect(judgeContrast('#E3660E', '#ffffff')).toMatchObject({ ratioText: '3.4 : 1', ok: false });
	});

	it('calls #595959 on white easy to read at 7.0 : 1 (computed; the AAA line of SC 1.4.6)', () => {
		expect(judgeContrast('#595959', '#ffffff').words).toBe('easy to read');
	});

	it('offers every text choice on some background it passes on, and the default is the best', () => {
		for (const text of TEXT_COLOURS) {
			expect(
				BACKGROUND_COLOURS.some((bg) => judgeContrast(text.hex, bg.hex).ok),
				text.name
			).toBe(true);
		}
		expect(judgeContrast(DEFAULT_CAPTION_STYLE.color, DEFAULT_CAPTION_STYLE.background).ratio).toBe(
			21
		);
	});
});

describe('the caption style schema (client and server)', () => {
	it('takes a valid style and writes colours as lower-case #rrggbb', () => {
		expect(
			captionStyleSchema.parse({ sizePercent: 200, color: '#FFE14D', background: '#000' })
		).toEqual({ sizePercent: 200, color: '#ffe14d', background: '#000000' });
	});

	it('refuses low contrast with the ratio in the message', () => {
		const result = captionStyleSchema.safeParse({
			sizePercent: 150,
			color: '#ffe14d',
			background: '#ffffff'
		});
		expect(result.success).toBe(false);
		expect(result.error?.issues[0].message).toContain('1.3 : 1');
		expect(result.error?.issues[0].path).toEqual(['color']);
	});

	it('refuses sizes outside 100–300 %, fractions, and what is not a colour', () => {
		const base = { color: '#ffffff', background: '#000000' };
		expect(captionStyleSchema.safeParse({ ...base, sizePercent: 90 }).success).toBe(false);
		expect(captionStyleSchema.safeParse({ ...base, sizePercent: 301 }).success).toBe(false);
		expect(captionStyleSchema.safeParse({ ...base, sizePercent: 150.5 }).success).toBe(false);
		const notColour = captionStyleSchema.safeParse({ ...base, sizePercent: 150, color: 'red' });
		expect(notColour.error?.issues[0].message).toBe(
			'The text colour must be a colour like #1a2b3c.'
		);
	});

	it('falls back to the default for a missing or no longer valid stored style', () => {
		expect(effectiveCaptionStyle(null)).toEqual(DEFAULT_CAPTION_STYLE);
		expect(
			effectiveCaptionStyle({ sizePercent: 150, color: '#777777', background: '#ffffff' })
		).toEqual(DEFAULT_CAPTION_STYLE);
		expect(
			effectiveCaptionStyle({ sizePercent: 250, color: '#000000', background: '#fbf3d5' })
		).toEqual({ sizePercent: 250, color: '#000000', background: '#fbf3d5' });
	});

	it('reads #rgb and #rrggbb in any case, and nothing else', () => {
		expect(normaliseHex(' #ABC ')).toBe('#aabbcc');
		expect(normaliseHex('#A1B2C3')).toBe('#a1b2c3');
		expect(normaliseHex('a1b2c3')).toBeNull();
		expect(normaliseHex('#12345')).toBeNull();
	});
});
