/**
 * What the library's search box and filters mean, without the database: the words become an
 * FTS5 query (every word must appear, each may be the start of a longer word), the address's
 * parameters become filters, and search results carry marked excerpts split for display.
 */

export const MAX_TERMS = 8;
export const MAX_TERM_LENGTH = 40;
export const PAGE_SIZE = 20;

/**
 * bm25 weights per indexed column, in the table's column order (drizzle/*_library_search.sql):
 * a word in the title counts most, one in a caption least. Chosen by us (common practice in
 * site search: titles outweigh body text), not taken from a source.
 */
export const RANK_WEIGHTS = { title: 10, description: 4, coachingCues: 3, captions: 1 } as const;

/** The words of a query as the index's tokenizer sees them: letters and digits, lowercased. */
export function searchTerms(query: string): string[] {
	const words = query
		.normalize('NFKC')
		.toLowerCase()
		.split(/[^\p{L}\p{N}]+/u)
		.filter(Boolean)
		.map((w) => w.slice(0, MAX_TERM_LENGTH));
	return [...new Set(words)].slice(0, MAX_TERMS);
}

/**
 * An FTS5 MATCH expression for the words: each quoted (so no word can be read as an operator
 * such as NOT or NEAR) and marked as a prefix, all of them required. Null when there are none.
 */
export function matchExpression(terms: readonly string[]): string | null {
	if (terms.length === 0) return null;
	return terms.map((t) => `"${t.replaceAll('"', '')}"*`).join(' AND ');
}

/** The same words, any one of them enough: the fallback when no exercise has every word. */
export function anyWordExpression(terms: readonly string[]): string | null {
	if (terms.length < 2) return null;
	return terms.map((t) => `"${t.replaceAll('"', '')}"*`).join(' OR ');
}

export interface LibraryFilters {
	region: string;
	position: string;
	movement: string;
	phase: number | null;
	equipment: string;
}

export interface LibraryQuery {
	q: string;
	filters: LibraryFilters;
	page: number;
}

export const NO_FILTERS: LibraryFilters = {
	region: '',
	position: '',
	movement: '',
	phase: null,
	equipment: ''
};

const clean = (value: string | null, max = 60) => (value ?? '').trim().slice(0, max);

/** The query in an address; anything unreadable falls back to "any" rather than failing. */
export function parseLibraryQuery(params: URLSearchParams): LibraryQuery {
	const phase = Number(params.get('phase'));
	const page = Number(params.get('page'));
	return {
		q: clean(params.get('q'), 200),
		filters: {
			region: clean(params.get('region')),
			position: clean(params.get('position')),
			movement: clean(params.get('movement')),
			phase: Number.isInteger(phase) && phase >= 1 && phase <= 9 ? phase : null,
			equipment: clean(params.get('equipment'))
		},
		page: Number.isInteger(page) && page >= 1 && page <= 500 ? page : 1
	};
}

/** The address of a query, leaving out what is empty so links stay short and shareable. */
export function libraryQueryString(query: LibraryQuery): string {
	const params = new URLSearchParams();
	if (query.q) params.set('q', query.q);
	const f = query.filters;
	if (f.region) params.set('region', f.region);
	if (f.position) params.set('position', f.position);
	if (f.movement) params.set('movement', f.movement);
	if (f.phase !== null) params.set('phase', String(f.phase));
	if (f.equipment) params.set('equipment', f.equipment);
	if (query.page > 1) params.set('page', String(query.page));
	const text = params.toString();
	return text ? `?${text}` : '';
}

export function hasFilters(filters: LibraryFilters): boolean {
	return Object.values(filters).some((v) => v !== '' && v !== null);
}

/** Characters FTS5's snippet() puts around matched words; no typed text contains them. */
export const MARK_OPEN = '\u0002';
export const MARK_CLOSE = '\u0003';

export interface ExcerptPart {
	text: string;
	marked: boolean;
}

/** Splits a snippet into plain and matched parts, so a page can mark words without raw HTML. */
export function excerptParts(snippet: string): ExcerptPart[] {
	const parts: ExcerptPart[] = [];
	let rest = snippet;
	while (rest) {
		const open = rest.indexOf(MARK_OPEN);
		if (open === -1) {
			parts.push({ text: rest, marked: false });
			break;
		}
		if (open > 0) parts.push({ text: rest.slice(0, open), marked: false });
		const close = rest.indexOf(MARK_CLOSE, open + 1);
		const end = close === -1 ? rest.length : close;
		parts.push({ text: rest.slice(open + 1, end), marked: true });
		rest = close === -1 ? '' : rest.slice(close + 1);
	}
	return parts.filter((p) => p.text !== '');
}

/** What a listed exercise carries that the filters and the title order look at. */
export interface FilterableCard {
	title: string;
	slug: string;
	bodyRegion: string;
	position: string;
	movementType: string;
	phase: number;
	equipment: readonly string[];
}

/** Whether an exercise meets every filter that is set. */
export function matchesFilters(card: FilterableCard, filters: LibraryFilters): boolean {
	return (
		(!filters.region || card.bodyRegion === filters.region) &&
		(!filters.position || card.position === filters.position) &&
		(!filters.movement || card.movementType === filters.movement) &&
		(filters.phase === null || card.phase === filters.phase) &&
		(!filters.equipment || card.equipment.includes(filters.equipment))
	);
}

const titleOrder = new Intl.Collator('en', { sensitivity: 'base', numeric: true });

/** Alphabetical by title (case and accents aside, "Step 2" before "Step 10"), then by address. */
export function byTitle(a: FilterableCard, b: FilterableCard): number {
	return titleOrder.compare(a.title, b.title) || (a.slug < b.slug ? -1 : a.slug > b.slug ? 1 : 0);
}
