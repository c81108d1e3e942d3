import { Marked, type Token } from 'marked';
import sanitizeHtml from 'sanitize-html';
import escapeHtml from 'escape-html';

/** Elements whose content is code or styling, never words: dropped with everything inside. */
const NON_TEXT = [
	'script',
	'style',
	'iframe',
	'object',
	'embed',
	'noscript',
	'textarea',
	'template'
];

const SAFE_LINK = /^(https?:|mailto:)/i;

const parser = new Marked({
	gfm: true,
	breaks: true,
	async: false,
	renderer: {
		// No raw HTML in safety notes: a tag typed into a note is dropped, never rendered.
		html() {
			return '';
		},
		// Nor images: keep their words.
		image({ text }) {
			return escapeHtml(text);
		},
		// A link of any kind but http(s) or mailto keeps its words and loses the link.
		link({ href, tokens }) {
			const words = this.parser.parseInline(tokens);
			if (!SAFE_LINK.test(href.trim())) return words;
			return `<a href="${escapeHtml(href.trim())}">${words}</a>`;
		}
	}
});

function openedNonTextTag(raw: string): string | null {
	const name = /^<([a-z]+)/i.exec(raw.trim())?.[1]?.toLowerCase();
	if (!name || !NON_TEXT.includes(name)) return null;
	// A block that opens and closes the element in one token needs nothing more skipped.
	return new RegExp(`</${name}\\s*>\\s*$`, 'i').test(raw) ? null : name;
}

/**
 * Inline raw HTML arrives as separate tokens for the opening tag, the words and the closing tag;
 * the words between `<script>` and `</script>` must go with the tags.
 */
function dropNonTextContent(tokens: Token[]): Token[] {
	const kept: Token[] = [];
	let skipping: string | null = null;
	for (const token of tokens) {
		if (skipping) {
			if (token.type === 'html' && new RegExp(`^</${skipping}\\s*>`, 'i').test(token.raw.trim()))
				skipping = null;
			continue;
		}
		if (token.type === 'html') {
			skipping = openedNonTextTag(token.raw);
			continue;
		}
		if ('tokens' in token && Array.isArray(token.tokens))
			token.tokens = dropNonTextContent(token.tokens);
		if (token.type === 'list')
			for (const item of token.items) item.tokens = dropNonTextContent(item.tokens);
		kept.push(token);
	}
	return kept;
}

const OPTIONS: sanitizeHtml.IOptions = {
	allowedTags: ['p', 'ul', 'ol', 'li', 'strong', 'em', 'a', 'h3', 'h4', 'blockquote', 'code', 'br'],
	allowedAttributes: { a: ['href', 'rel'] },
	allowedSchemes: ['http', 'https', 'mailto'],
	allowedSchemesAppliedToAttributes: ['href'],
	allowProtocolRelative: false,
	disallowedTagsMode: 'discard',
	nonTextTags: NON_TEXT,
	transformTags: {
		// Headings in a note sit under the page's own; anything larger becomes a level 3.
		h1: 'h3',
		h2: 'h3',
		h5: 'h4',
		h6: 'h4',
		// sanitize-html then drops any href whose scheme is not allowed.
		a: (tagName, attribs) => {
			const kept: sanitizeHtml.Attributes = {};
			if (attribs.href) Object.assign(kept, { href: attribs.href, rel: 'noopener noreferrer' });
			return { tagName, attribs: kept };
		}
	}
};

/**
 * Safety notes (Markdown) as HTML safe to place in a page or an e-mail: marked renders, then
 * sanitize-html keeps only paragraphs, lists, emphasis, level 3–4 headings, quotes, code, line
 * breaks and http(s)/mailto links (with rel="noopener"). No images, no raw HTML.
 */
export function renderSafetyNotes(md: string): string {
	if (!md.trim()) return '';
	const tokens = dropNonTextContent(parser.lexer(md));
	const html = parser.parser(tokens);
	return sanitizeHtml(html, OPTIONS).trim();
}
