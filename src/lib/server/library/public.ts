/**
 * What the public may read. Every query here starts from a public exercise whose status is
 * `published` and reads its current version only: an unpublished exercise, a submission under
 * review and an older version are invisible, and a retired exercise is known only as "gone".
 */
import type { Statement } from 'better-sqlite3';
import { and, asc, desc, eq, inArray } from 'drizzle-orm';
import {
	anyWordExpression,
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

/** The exercise at a public address; `retired` for one withdrawn (410), null otherwise (404). */
export function findPublicExercise(slug: string): PublicLookup<PublicExercise> {
	const row = db()
		.select({ entry: libraryExercises, version: libraryVersions })
		.from(libraryExercises)
		.leftJoin(libraryVersions, eq(libraryVersions.id, libraryExercises.currentVersionId))
		.where(eq(libraryExercises.slug, slug))
		.get();
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
	const row = db()
		.select({ version: libraryVersions, entry: libraryExercises })
		.from(libraryVersions)
		.innerJoin(libraryExercises, eq(libraryExercises.id, libraryVersions.libraryExerciseId))
		.where(eq(libraryVersions.id, versionId))
		.get();
	if (!row) return null;
	if (row.entry.status === 'retired') return { kind: 'retired' };
	if (row.entry.status !== 'published' || row.entry.currentVersionId !== row.version.id)
		return null;
	return { kind: 'published', value: row.version };
}

export type { ExerciseCard, FilterOption, FilterOptions } from './catalogue';
export { forgetCatalogue } from './catalogue';

// Prepared once per statement text (a handful), for the connection they were made on.
const statements = new Map<string, Statement<unknown[]>>();
let preparedOn: unknown = null;
function prepared(sql: string): Statement<unknown[]> {
	// A reopened database (scripts, tests) needs statements of its own.
	if (preparedOn !== db().$client) {
		statements.clear();
		preparedOn = db().$client;
	}
	let statement = statements.get(sql);
	if (!statement) {
		statement = db().$client.prepare<unknown[]>(sql);
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

interface Hit {
	rowid: number;
	score: number;
}

/** Excerpts with the matched words marked, for the few rows a page shows. */
function excerpts(match: string, rowids: number[]): Map<number, string> {
	if (rowids.length === 0) return new Map();
	const rows = prepared(
		`SELECT rowid, snippet(library_search, -1, char(2), char(3), '…', 16) AS excerpt
		FROM library_search WHERE library_search MATCH ? AND rowid IN (SELECT value FROM json_each(?))`
	).all(match, JSON.stringify(rowids)) as { rowid: number; excerpt: string }[];
	return new Map(rows.map((r) => [r.rowid, r.excerpt]));
}

function textSearch(
	match: string,
	query: LibraryQuery,
	limit: number
): { total: number; results: ExerciseCard[] } {
	const { bySearchRow } = catalogue();
	const offset = (query.page - 1) * limit;
	// One pass over the matches reading only their rank (no stored text), ranked and filtered
	// here on the cards; a row the catalogue does not know is not public and is left out.
	const hits = (
		prepared(`SELECT rowid, ${BM25} AS score FROM library_search WHERE library_search MATCH ?`).all(
			match
		) as Hit[]
	).filter((h) => {
		const card = bySearchRow.get(h.rowid);
		return card !== undefined && matchesFilters(card, query.filters);
	});
	hits.sort((a, b) => a.score - b.score || a.rowid - b.rowid);
	const page = hits.slice(offset, offset + limit);
	const marked = excerpts(
		match,
		page.map((h) => h.rowid)
	);
	return {
		total: hits.length,
		results: page.map((h) => ({ ...bySearchRow.get(h.rowid)!, excerpt: marked.get(h.rowid) ?? '' }))
	};
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

/** Published collections that hold a given public exercise, for its page. */
export function collectionsWith(entryId: string): { slug: string; title: string }[] {
	return db()
		.select({ slug: libraryCollections.slug, title: libraryCollections.title })
		.from(libraryCollectionItems)
		.innerJoin(libraryCollections, eq(libraryCollections.id, libraryCollectionItems.collectionId))
		.where(
			and(
				eq(libraryCollectionItems.libraryExerciseId, entryId),
				eq(libraryCollections.status, 'published')
			)
		)
		.orderBy(asc(libraryCollections.title))
		.all();
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
