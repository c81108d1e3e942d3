/** Cue text without WebVTT markup, for counting, searching and transcripts. */

/** The named character references WebVTT defines. */
export const NAMED_REFERENCES: Record<string, string> = {
	amp: '&',
	lt: '<',
	gt: '>',
	nbsp: '\u00a0',
	lrm: '\u200e',
	rlm: '\u200f'
};

/** Removes tags (including timestamp tags) and decodes the character references WebVTT knows. */
export function plainText(text: string): string {
	// Most cue text has neither tags nor references; skipping the regexes keeps checks fast.
	if (!text.includes('<') && !text.includes('&')) return text;
	return text
		.replace(/<[^>]*>?/g, '')
		.replace(/&(#x[0-9a-f]+|#\d+|[a-z]+);/gi, (whole, name: string) => {
			if (name[0] === '#') {
				const code =
					name[1] === 'x' || name[1] === 'X' ? parseInt(name.slice(2), 16) : Number(name.slice(1));
				return Number.isFinite(code) && code > 0 && code <= 0x10ffff
					? String.fromCodePoint(code)
					: whole;
			}
			return NAMED_REFERENCES[name] ?? whole;
		});
}

const WORD = /[\p{L}\p{N}]+(?:['’-][\p{L}\p{N}]+)*/gu;

/** Words as a reader counts them: runs of letters or digits, with inner apostrophes and hyphens. */
export function countWords(text: string): number {
	return countPlainWords(plainText(text));
}

/** countWords for text whose tags are already removed. */
export function countPlainWords(plain: string): number {
	return plain.match(WORD)?.length ?? 0;
}

/** Lines as shown, without tags. */
export function visibleLines(text: string): string[] {
	return plainText(text).split('\n');
}
