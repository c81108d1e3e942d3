/**
 * WCAG 2.x relative luminance and contrast ratio (WCAG 2.2, "relative luminance" and
 * "contrast ratio" definitions). Used for the palette and, later, for patients' caption colours.
 */

/** Parses #rgb or #rrggbb into 0–255 channels; throws on anything else. */
export function parseHex(hex: string): [number, number, number] {
	const m = /^#?([0-9a-f]{3}|[0-9a-f]{6})$/i.exec(hex.trim());
	if (!m) throw new Error(`Not a hex colour: ${hex}`);
	const digits = m[1].length === 3 ? [...m[1]].map((d) => d + d).join('') : m[1];
	return [0, 2, 4].map((i) => parseInt(digits.slice(i, i + 2), 16)) as [number, number, number];
}

function linearise(channel: number): number {
	const c = channel / 255;
	return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
}

export function relativeLuminance(hex: string): number {
	const [r, g, b] = parseHex(hex).map(linearise);
	return 0.2126 * r + 0.7152 * g + 0.0722 * b;
}

/** Contrast ratio between two colours, from 1 to 21, regardless of order. */
export function contrastRatio(a: string, b: string): number {
	const [light, dark] = [relativeLuminance(a), relativeLuminance(b)].sort((x, y) => y - x);
	return (light + 0.05) / (dark + 0.05);
}

/** WCAG 2.x success criterion 1.4.3 (AA): 4.5:1 for text, 3:1 for large text. */
export function meetsAA(foreground: string, background: string, largeText = false): boolean {
	return contrastRatio(foreground, background) >= (largeText ? 3 : 4.5);
}
