/**
 * A patient's caption look on the replay screen: size, text colour and background. The same
 * rules run live in the browser (the style panel) and again on the server (PUT
 * /api/me/caption-style), so a choice under 4.5 : 1 is refused in both places.
 */
import { z } from 'zod';
import { contrastRatio } from '$lib/a11y/contrast';
import type { CaptionStyle } from '$lib/server/db/schema/patients';

export type { CaptionStyle };

/** WCAG 2.2 SC 1.4.3 (AA): 4.5 : 1 for text; caption text is never assumed to be "large". */
export const MIN_CAPTION_CONTRAST = 4.5;
/** WCAG 2.2 SC 1.4.6 (AAA): 7 : 1, which we call "easy to read". */
export const EASY_CAPTION_CONTRAST = 7;

export const CAPTION_SIZES = [100, 125, 150, 175, 200, 250, 300] as const;
export const MIN_CAPTION_SIZE = 100;
export const MAX_CAPTION_SIZE = 300;

/** Large white text on black: the most contrast there is (21 : 1), and a size older eyes read. */
export const DEFAULT_CAPTION_STYLE: CaptionStyle = {
	sizePercent: 150,
	color: '#ffffff',
	background: '#000000'
};

export interface ColourChoice {
	name: string;
	hex: string;
}

/** A few plain choices; every text choice passes 4.5 : 1 on at least one background choice. */
export const TEXT_COLOURS: readonly ColourChoice[] = [
	{ name: 'White', hex: '#ffffff' },
	{ name: 'Yellow', hex: '#ffe14d' },
	{ name: 'Black', hex: '#000000' },
	{ name: 'Dark blue', hex: '#0b1f4d' }
];

export const BACKGROUND_COLOURS: readonly ColourChoice[] = [
	{ name: 'Black', hex: '#000000' },
	{ name: 'Dark grey', hex: '#333333' },
	{ name: 'White', hex: '#ffffff' },
	{ name: 'Cream', hex: '#fbf3d5' }
];

const HEX = /^#[0-9a-f]{6}$/;

/** #RGB or #RRGGBB (any case) as lower-case #rrggbb, or null when it is not a colour. */
export function normaliseHex(text: string): string | null {
	const trimmed = text.trim().toLowerCase();
	const short = /^#([0-9a-f])([0-9a-f])([0-9a-f])$/.exec(trimmed);
	if (short) return `#${short[1]}${short[1]}${short[2]}${short[2]}${short[3]}${short[3]}`;
	return HEX.test(trimmed) ? trimmed : null;
}

export interface ContrastVerdict {
	/** The ratio, e.g. 7.43. */
	ratio: number;
	/** The ratio as people read it, rounded down to one decimal: "7.4 : 1". */
	ratioText: string;
	ok: boolean;
	/** "easy to read", "readable" or "too faint, choose another". */
	words: string;
}

/**
 * Rounds down, so a ratio shown as "4.5 : 1" has really reached 4.5 (4.48 shows as 4.4, never as
 * a passing-looking 4.5).
 */
function floorToTenth(ratio: number): number {
	return Math.floor(ratio * 10 + 1e-9) / 10;
}

/** How readable caption text of `color` is on `background`, in figures and words. */
export function judgeContrast(color: string, background: string): ContrastVerdict {
	const ratio = contrastRatio(color, background);
	const ok = ratio >= MIN_CAPTION_CONTRAST;
	const words = !ok
		? 'too faint, choose another'
		: ratio >= EASY_CAPTION_CONTRAST
			? 'easy to read'
			: 'readable';
	return { ratio, ratioText: `${floorToTenth(ratio).toFixed(1)} : 1`, ok, words };
}

const colour = (what: string) =>
	z.string({ error: `Choose a ${what}.` }).transform((text, ctx) => {
		const hex = normaliseHex(text);
		if (!hex) {
			ctx.addIssue({ code: 'custom', message: `The ${what} must be a colour like #1a2b3c.` });
			return z.NEVER;
		}
		return hex;
	});

/** A caption style from the browser: sizes 100–300 %, colours as hex, contrast at least 4.5 : 1. */
export const captionStyleSchema = z
	.object({
		sizePercent: z
			.number({ error: 'Choose a caption size.' })
			.int('Choose a caption size from the list.')
			.min(MIN_CAPTION_SIZE, `Captions can be from ${MIN_CAPTION_SIZE}% to ${MAX_CAPTION_SIZE}%.`)
			.max(MAX_CAPTION_SIZE, `Captions can be from ${MIN_CAPTION_SIZE}% to ${MAX_CAPTION_SIZE}%.`),
		color: colour('text colour'),
		background: colour('background colour')
	})
	.superRefine((style, ctx) => {
		const verdict = judgeContrast(style.color, style.background);
		if (!verdict.ok) {
			ctx.addIssue({
				code: 'custom',
				path: ['color'],
				message: `These colours are ${verdict.ratioText} — too faint to read. Choose a pair of at least ${MIN_CAPTION_CONTRAST} : 1.`
			});
		}
	}) satisfies z.ZodType<CaptionStyle, unknown>;

/** The stored style when it is still valid, else the default (a stored value is never trusted). */
export function effectiveCaptionStyle(stored: CaptionStyle | null | undefined): CaptionStyle {
	if (!stored) return { ...DEFAULT_CAPTION_STYLE };
	const parsed = captionStyleSchema.safeParse(stored);
	return parsed.success ? parsed.data : { ...DEFAULT_CAPTION_STYLE };
}

/** The name of a colour when it is one of the choices, else its hex. */
export function colourName(hex: string, choices: readonly ColourChoice[]): string {
	return choices.find((c) => c.hex === hex)?.name ?? hex;
}
