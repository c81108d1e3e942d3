/** Splits plain text into text and http(s) link parts, so links can be shown clickable safely. */
export type TextPart = { kind: 'text'; text: string } | { kind: 'link'; href: string };

const URL_PATTERN = /https?:\/\/[^\s<>"']+/g;

export function linkify(text: string): TextPart[] {
	const parts: TextPart[] = [];
	let last = 0;
	for (const match of text.matchAll(URL_PATTERN)) {
		// Trailing punctuation usually ends the sentence, not the address.
		const href = match[0].replace(/[.,;:!?)]+$/, '');
		const start = match.index;
		if (start > last) parts.push({ kind: 'text', text: text.slice(last, start) });
		parts.push({ kind: 'link', href });
		last = start + href.length;
	}
	if (last < text.length) parts.push({ kind: 'text', text: text.slice(last) });
	return parts;
}
