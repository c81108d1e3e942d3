/**
 * What the public may read. Every query here starts from a public exercise whose status is
 * `published` and reads its current version only: an unpublished exercise, a submission under
 * review and an older version are invisible, and a retired exercise is known only as "gone".
 */
import type { Statement } from 'better-sqlite3';
import { and, asc, desc, eq, inArray, sql } from 'drizzle-orm';
import {
	anyWordExpression,
	hasFilters,
	matchesFilters,
	matchExpression,
	PAGE_SIZE,
	RANK_WEIGHTS,
	searchTerms,
	type LibraryQuery
} from '$lib/library/search';
import { catalogue, type ExerciseCard, type FilterOptions } from './catalogue';
import { db } from '../db';
import {
	libraryCollectionItems,
	libraryCollections,
	libraryExercises,
	libraryVersions,
	type LibraryCollection,
	type LibraryExercise,
	type LibraryVersion
} from '../db/schema';

export type PublicLookup<T> = { kind: 'published'; value: T } | { kind: 'retired' } | null;

export interface PublicExercise {
	entry: LibraryExercise;
	version: LibraryVersion;
}

// The public pages and files ask these on every visit: prepared once per connection rather than
// built and prepared by the query builder each time (which took a tenth of a page's time).
function preparedOnce<T>(make: () => T): () => T {
	let made: { client: unknown; value: T } | null = null;
	return () => {
		const client = db().$client;
		if (made?.client !== client) made = { client, value: make() };
		return made.value;
	};
}

const exerciseBySlug = preparedOnce(() =>
	db()
		.select({ entry: libraryExercises, version: libraryVersions })
		.from(libraryExercises)
		.leftJoin(libraryVersions, eq(libraryVersions.id, libraryExercises.currentVersionId))
		.where(eq(libraryExercises.slug, sql.placeholder('slug')))
		.prepare()
);

const versionById = preparedOnce(() =>
	db()
		.select({ version: libraryVersions, entry: libraryExercises })
		.from(libraryVersions)
		.innerJoin(libraryExercises, eq(libraryExercises.id, libraryVersions.libraryExerciseId))
		.where(eq(libraryVersions.id, sql.placeholder('id')))
		.prepare()
);

/** The exercise at a public address; `retired` for one withdrawn (410), null otherwise (404). */
export function findPublicExercise(slug: string): PublicLookup<PublicExercise> {
	const row = exerciseBySlug().get({ slug });
	if (!row) return null;
	if (row.entry.status === 'retired') return { kind: 'retired' };
	if (row.entry.status !== 'published' || !row.version) return null;
	return { kind: 'published', value: { entry: row.entry, version: row.version } };
}

/**
 * A version whose files the public may fetch: the current version of a published exercise.
 * Any version of a retired exercise is `retired`; everything else (an older version, an
 * unpublished exercise, an id that is no version) is null.
 */
export function findPublicVersion(versionId: string): PublicLookup<LibraryVersion> {
	const row = versionById().get({ id: versionId });
	if (!row) return null;
	if (row.entry.status === 'retired') return { kind: 'retired' };
	if (row.entry.status !== 'published' || row.entry.currentVersionId !== row.version.id)
		return null;
	return { kind: 'published', value: row.version };
}

export type { ExerciseCard, FilterOption, FilterOptions } from './catalogue';
export { forgetCatalogue } from './catalogue';

// The filters of the search being run, read by the SQL function `library_listed(rowid)`: the
// database then ranks only the exercises the filters keep, and sends back only one page.
// better-sqlite3 runs a statement to its end before anything else runs, so this cannot leak
// from one search into another.
let listing: { bySearchRow: Map<number, ExerciseCard>; filters: LibraryQuery['filters'] } | null =
	null;

function listed(rowid: unknown): number {
	const card = listing?.bySearchRow.get(Number(rowid));
	return card && listing && matchesFilters(card, listing.filters) ? 1 : 0;
}

// Prepared once per statement text (a handful), for the connection they were made on.
const statements = new Map<string, Statement<unknown[]>>();
let preparedOn: unknown = null;
function prepared(sql: string): Statement<unknown[]> {
	const client = db().$client;
	// A reopened database (scripts, tests) needs statements and the function of its own.
	if (preparedOn !== client) {
		statements.clear();
		client.function('library_listed', { deterministic: false }, listed);
		preparedOn = client;
	}
	let statement = statements.get(sql);
	if (!statement) {
		statement = client.prepare<unknown[]>(sql);
		statements.set(sql, statement);
	}
	return statement;
}

export interface SearchResults {
	total: number;
	results: ExerciseCard[];
	/** The words that were searched for (after cleaning); empty for a filters-only list. */
	terms: string[];
	/** True when no exercise had every word and results with any of them are shown instead. */
	anyWord: boolean;
}

const BM25 = `bm25(library_search, ${[
	RANK_WEIGHTS.title,
	RANK_WEIGHTS.description,
	RANK_WEIGHTS.coachingCues,
	RANK_WEIGHTS.captions,
	0
].join(', ')})`;

function textSearch(
	match: string,
	query: LibraryQuery,
	limit: number
): { total: number; results: ExerciseCard[] } {
	const { bySearchRow } = catalogue();
	const filtered = hasFilters(query.filters);
	// The index holds published exercises only; with filters, the cards decide which count.
	const where = `library_search MATCH ?${filtered ? ' AND library_listed(rowid)' : ''}`;
	listing = filtered ? { bySearchRow, filters: query.filters } : null;
	try {
		const total = (
			prepared(`SELECT count(*) AS n FROM library_search WHERE ${where}`).get(match) as {
				n: number;
			}
		).n;
		if (total === 0) return { total, results: [] };
		const page = prepared(
			`SELECT rowid FROM library_search WHERE ${where} ORDER BY ${BM25}, rowid LIMIT ? OFFSET ?`
		).all(match, limit, (query.page - 1) * limit) as { rowid: number }[];
		// Excerpts for the page's rows only: in the ranked query they would be made for every
		// match. (A list of rowids, not `rowid = ?`: with MATCH, FTS5 reads that as every row.)
		const rowids = page.map((r) => r.rowid);
		const marked = new Map(
			(
				prepared(
					`SELECT rowid, snippet(library_search, -1, char(2), char(3), '…', 16) AS text
					FROM library_search WHERE library_search MATCH ?
					AND rowid IN (${rowids.map(() => '?').join(', ')})`
				).all(match, ...rowids) as { rowid: number; text: string }[]
			).map((r) => [r.rowid, r.text])
		);
		const results = page.flatMap(({ rowid }) => {
			const card = bySearchRow.get(rowid);
			return card ? [{ ...card, excerpt: marked.get(rowid) ?? card.excerpt }] : [];
		});
		return { total, results };
	} finally {
		listing = null;
	}
}

/**
 * Searches the published library: every word must appear (each may start a longer word), ranked
 * by bm25 with titles weighing most; if no exercise has every word, those with any are shown
 * and `anyWord` says so. Without words, the filters alone list exercises by title.
 */
export function searchLibrary(query: LibraryQuery, limit = PAGE_SIZE): SearchResults {
	const terms = searchTerms(query.q);
	const match = matchExpression(terms);
	if (match) {
		const all = textSearch(match, query, limit);
		if (all.total > 0 || query.page > 1) return { ...all, terms, anyWord: false };
		const any = anyWordExpression(terms);
		if (any) return { ...textSearch(any, query, limit), terms, anyWord: true };
		return { ...all, terms, anyWord: false };
	}
	const listed = catalogue().byTitle.filter((card) => matchesFilters(card, query.filters));
	const offset = (query.page - 1) * limit;
	return {
		total: listed.length,
		results: listed.slice(offset, offset + limit),
		terms: [],
		anyWord: false
	};
}

/** The values the published library actually has, for the filter menus, with their counts. */
export function filterOptions(): FilterOptions {
	return catalogue().options;
}

/** The most recently published exercises, for the front page. */
export function recentExercises(limit = 6): ExerciseCard[] {
	return catalogue().recent.slice(0, limit);
}

/** How many exercises the public can see. */
export function publishedCount(): number {
	return catalogue().recent.length;
}

export interface CollectionCard {
	slug: string;
	title: string;
	introduction: string;
	count: number;
	cover: { versionId: string; poster: number } | null;
}

/** The published exercises of collections, in order, keyed by collection id. */
function publishedItems(collectionIds: string[]): Map<string, ExerciseCard[]> {
	const byCollection = new Map<string, ExerciseCard[]>();
	if (collectionIds.length === 0) return byCollection;
	const rows = db()
		.select({
			collectionId: libraryCollectionItems.collectionId,
			entryId: libraryExercises.id,
			slug: libraryExercises.slug,
			version: libraryVersions
		})
		.from(libraryCollectionItems)
		.innerJoin(libraryExercises, eq(libraryExercises.id, libraryCollectionItems.libraryExerciseId))
		.innerJoin(libraryVersions, eq(libraryVersions.id, libraryExercises.currentVersionId))
		.where(
			and(
				inArray(libraryCollectionItems.collectionId, collectionIds),
				eq(libraryExercises.status, 'published')
			)
		)
		.orderBy(asc(libraryCollectionItems.position))
		.all();
	for (const { collectionId, entryId, slug, version: v } of rows) {
		const list = byCollection.get(collectionId) ?? [];
		list.push({
			entryId,
			slug,
			versionId: v.id,
			title: v.title,
			bodyRegion: v.bodyRegion,
			position: v.position,
			movementType: v.movementType,
			phase: v.phase,
			equipment: v.equipment,
			posterCount: v.posterCount,
			durationSeconds: v.clipDurationSeconds,
			excerpt: v.snapshot.description.slice(0, 180)
		});
		byCollection.set(collectionId, list);
	}
	return byCollection;
}

function coverOf(
	collection: LibraryCollection,
	items: ExerciseCard[]
): { versionId: string; poster: number } | null {
	const chosen = items.find(
		(i) => i.entryId === collection.coverLibraryExerciseId && i.posterCount > 0
	);
	if (chosen) {
		return {
			versionId: chosen.versionId,
			poster: Math.min(collection.coverPoster, chosen.posterCount - 1)
		};
	}
	const first = items.find((i) => i.posterCount > 0);
	return first ? { versionId: first.versionId, poster: 0 } : null;
}

/** Published collections with at least one published exercise, newest first. */
export function publishedCollections(limit = 12): CollectionCard[] {
	const collections = db()
		.select()
		.from(libraryCollections)
		.where(eq(libraryCollections.status, 'published'))
		.orderBy(desc(libraryCollections.publishedAt))
		.limit(limit)
		.all();
	const items = publishedItems(collections.map((c) => c.id));
	return collections
		.map((c) => {
			const list = items.get(c.id) ?? [];
			return {
				slug: c.slug,
				title: c.title,
				introduction: c.introduction,
				count: list.length,
				cover: coverOf(c, list)
			};
		})
		.filter((c) => c.count > 0);
}

export interface PublicCollection {
	collection: LibraryCollection;
	items: ExerciseCard[];
	cover: { versionId: string; poster: number } | null;
}

/** A published collection with its published exercises in order; null for anything else. */
export function findPublicCollection(slug: string): PublicCollection | null {
	const collection = db()
		.select()
		.from(libraryCollections)
		.where(and(eq(libraryCollections.slug, slug), eq(libraryCollections.status, 'published')))
		.get();
	if (!collection) return null;
	const items = publishedItems([collection.id]).get(collection.id) ?? [];
	return { collection, items, cover: coverOf(collection, items) };
}

const collectionsOfEntry = preparedOnce(() =>
	db()
		.select({ slug: libraryCollections.slug, title: libraryCollections.title })
		.from(libraryCollectionItems)
		.innerJoin(libraryCollections, eq(libraryCollections.id, libraryCollectionItems.collectionId))
		.where(
			and(
				eq(libraryCollectionItems.libraryExerciseId, sql.placeholder('entryId')),
				eq(libraryCollections.status, 'published')
			)
		)
		.orderBy(asc(libraryCollections.title))
		.prepare()
);

/** Published collections that hold a given public exercise, for its page. */
export function collectionsWith(entryId: string): { slug: string; title: string }[] {
	return collectionsOfEntry().all({ entryId });
}

/** Every public address with its last change, for sitemap.xml. */
export function sitemapEntries(): { path: string; updatedAt: Date }[] {
	const exercises = db()
		.select({ slug: libraryExercises.slug, updatedAt: libraryExercises.updatedAt })
		.from(libraryExercises)
		.where(eq(libraryExercises.status, 'published'))
		.orderBy(asc(libraryExercises.slug))
		.all()
		.map((e) => ({ path: `/library/exercises/${e.slug}`, updatedAt: e.updatedAt }));
	const collections = publishedCollections(1000).map((c) => c.slug);
	const collectionRows = collections.length
		? db()
				.select({ slug: libraryCollections.slug, updatedAt: libraryCollections.updatedAt })
				.from(libraryCollections)
				.where(inArray(libraryCollections.slug, collections))
				.all()
		: [];
	return [
		...exercises,
		...collectionRows.map((c) => ({
			path: `/library/collections/${c.slug}`,
			updatedAt: c.updatedAt
		}))
	];
}
