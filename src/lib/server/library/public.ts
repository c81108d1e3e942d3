/**
 * What the public may read. Every query here starts from a public exercise whose status is
 * `published` and reads its current version only: an unpublished exercise, a submission under
 * review and an older version are invisible, and a retired exercise is known only as "gone".
 */
import type { Statement } from 'better-sqlite3';
import { and, asc, desc, eq, inArray } from 'drizzle-orm';
import {
	anyWordExpression,
	matchExpression,
	PAGE_SIZE,
	RANK_WEIGHTS,
	searchTerms,
	type LibraryQuery
} from '$lib/library/search';
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

export interface ExerciseCard {
	entryId: string;
	slug: string;
	versionId: string;
	title: string;
	bodyRegion: string;
	position: string;
	movementType: string;
	phase: number;
	equipment: string[];
	posterCount: number;
	durationSeconds: number | null;
	/** A matched excerpt (MARK_OPEN/MARK_CLOSE of lib/library/search around the words) or the description's start. */
	excerpt: string;
}

interface CardRow {
	entryId: string;
	slug: string;
	versionId: string;
	title: string;
	bodyRegion: string;
	position: string;
	movementType: string;
	phase: number;
	equipment: string;
	posterCount: number;
	durationSeconds: number | null;
	excerpt: string;
}

const CARD_COLUMNS = `e.id AS entryId, e.slug AS slug, v.id AS versionId, v.title AS title, v.body_region AS bodyRegion,
	v.position AS position, v.movement_type AS movementType, v.phase AS phase,
	v.equipment AS equipment, v.poster_count AS posterCount,
	v.clip_duration_seconds AS durationSeconds`;

function toCard(row: CardRow): ExerciseCard {
	return { ...row, equipment: JSON.parse(row.equipment) as string[] };
}

const DESCRIPTION_EXCERPT = `substr(json_extract(v.snapshot, '$.description'), 1, 180)`;

function filterSql(query: LibraryQuery): { where: string[]; params: (string | number)[] } {
	const where = [`e.status = 'published'`];
	const params: (string | number)[] = [];
	const f = query.filters;
	if (f.region) {
		where.push('v.body_region = ?');
		params.push(f.region);
	}
	if (f.position) {
		where.push('v.position = ?');
		params.push(f.position);
	}
	if (f.movement) {
		where.push('v.movement_type = ?');
		params.push(f.movement);
	}
	if (f.phase !== null) {
		where.push('v.phase = ?');
		params.push(f.phase);
	}
	if (f.equipment) {
		where.push('EXISTS (SELECT 1 FROM json_each(v.equipment) WHERE json_each.value = ?)');
		params.push(f.equipment);
	}
	return { where, params };
}

// Prepared once per distinct statement text (a handful: one per combination of filters used).
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
		if (statements.size > 200) statements.clear();
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

const WEIGHTS = [
	RANK_WEIGHTS.title,
	RANK_WEIGHTS.description,
	RANK_WEIGHTS.coachingCues,
	RANK_WEIGHTS.captions,
	0
].join(', ');

function runTextSearch(
	match: string,
	query: LibraryQuery,
	limit: number
): { total: number; results: ExerciseCard[] } {
	const { where, params } = filterSql(query);
	const from = `FROM library_search s
		JOIN library_exercise e ON e.id = s.library_exercise_id
		JOIN library_version v ON v.id = e.current_version_id
		WHERE library_search MATCH ? AND ${where.join(' AND ')}`;
	const total = (prepared(`SELECT count(*) AS n ${from}`).get(match, ...params) as { n: number }).n;
	if (total === 0) return { total, results: [] };
	const rows = prepared(
		`SELECT ${CARD_COLUMNS},
			snippet(library_search, -1, char(2), char(3), '…', 16) AS excerpt
		${from}
		ORDER BY bm25(library_search, ${WEIGHTS}), v.title
		LIMIT ? OFFSET ?`
	).all(match, ...params, limit, (query.page - 1) * limit) as CardRow[];
	return { total, results: rows.map(toCard) };
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
		const all = runTextSearch(match, query, limit);
		if (all.total > 0 || query.page > 1) return { ...all, terms, anyWord: false };
		const any = anyWordExpression(terms);
		if (any) return { ...runTextSearch(any, query, limit), terms, anyWord: true };
		return { ...all, terms, anyWord: false };
	}
	const { where, params } = filterSql(query);
	const from = `FROM library_exercise e
		JOIN library_version v ON v.id = e.current_version_id
		WHERE ${where.join(' AND ')}`;
	const total = (prepared(`SELECT count(*) AS n ${from}`).get(...params) as { n: number }).n;
	const rows = prepared(
		`SELECT ${CARD_COLUMNS}, ${DESCRIPTION_EXCERPT} AS excerpt ${from}
		ORDER BY v.title COLLATE NOCASE, e.slug LIMIT ? OFFSET ?`
	).all(...params, limit, (query.page - 1) * limit) as CardRow[];
	return { total, results: rows.map(toCard), terms: [], anyWord: false };
}

export interface FilterOption<T extends string | number = string> {
	value: T;
	count: number;
}

export interface FilterOptions {
	regions: FilterOption[];
	positions: FilterOption[];
	movements: FilterOption[];
	phases: FilterOption<number>[];
	equipment: FilterOption[];
}

let optionsCache: { at: number; value: FilterOptions } | null = null;
const OPTIONS_TTL_MS = 30_000;

/** Forgets cached filter options; publishing calls it so a new exercise's values show at once. */
export function forgetFilterOptions(): void {
	optionsCache = null;
}

/** The values the published library actually has, for the filter menus, with their counts. */
export function filterOptions(): FilterOptions {
	if (optionsCache && Date.now() - optionsCache.at < OPTIONS_TTL_MS) return optionsCache.value;
	const base = `FROM library_exercise e JOIN library_version v ON v.id = e.current_version_id
		WHERE e.status = 'published'`;
	const grouped = (column: string) =>
		prepared(
			`SELECT ${column} AS value, count(*) AS count ${base} GROUP BY ${column} ORDER BY ${column}`
		).all() as FilterOption[];
	const value: FilterOptions = {
		regions: grouped('v.body_region'),
		positions: grouped('v.position'),
		movements: grouped('v.movement_type'),
		phases: grouped('v.phase') as unknown as FilterOption<number>[],
		equipment: prepared(
			`SELECT j.value AS value, count(*) AS count ${base.replace('WHERE', ', json_each(v.equipment) j WHERE')}
			GROUP BY j.value ORDER BY j.value COLLATE NOCASE`
		).all() as FilterOption[]
	};
	optionsCache = { at: Date.now(), value };
	return value;
}

/** The most recently published exercises, for the front page. */
export function recentExercises(limit = 6): ExerciseCard[] {
	const rows = prepared(
		`SELECT ${CARD_COLUMNS}, ${DESCRIPTION_EXCERPT} AS excerpt
		FROM library_exercise e JOIN library_version v ON v.id = e.current_version_id
		WHERE e.status = 'published' ORDER BY v.published_at DESC LIMIT ?`
	).all(limit) as CardRow[];
	return rows.map(toCard);
}

/** How many exercises the public can see. */
export function publishedCount(): number {
	return (
		prepared(`SELECT count(*) AS n FROM library_exercise WHERE status = 'published'`).get() as {
			n: number;
		}
	).n;
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
