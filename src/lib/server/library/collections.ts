/**
 * Collections: ordered sets of public exercises an educator puts together, with an
 * introduction (Markdown, rendered on the public page with the safety-notes allow-list) and a
 * cover taken from one of its exercises' posters. Only published exercises can be added, and a
 * collection can be published only while it holds at least one.
 */
import { and, asc, desc, eq, max } from 'drizzle-orm';
import { slugify, uniqueSlug } from '$lib/library/slug';
import { db } from '../db';
import {
	libraryCollectionItems,
	libraryCollections,
	libraryExercises,
	libraryVersions,
	type LibraryCollection
} from '../db/schema';
import { LibraryError } from './submissions';

function slugTaken(slug: string): boolean {
	return (
		db()
			.select({ id: libraryCollections.id })
			.from(libraryCollections)
			.where(eq(libraryCollections.slug, slug))
			.get() !== undefined
	);
}

export interface CollectionRow {
	id: string;
	slug: string;
	title: string;
	status: LibraryCollection['status'];
	count: number;
	updatedAt: Date;
}

/** Every collection, newest change first, with how many exercises each holds. */
export function listCollections(): CollectionRow[] {
	const collections = db()
		.select()
		.from(libraryCollections)
		.orderBy(desc(libraryCollections.updatedAt))
		.all();
	const counts = new Map<string, number>();
	for (const item of db().select().from(libraryCollectionItems).all()) {
		counts.set(item.collectionId, (counts.get(item.collectionId) ?? 0) + 1);
	}
	return collections.map((c) => ({
		id: c.id,
		slug: c.slug,
		title: c.title,
		status: c.status,
		count: counts.get(c.id) ?? 0,
		updatedAt: c.updatedAt
	}));
}

export function createCollection(
	educatorId: string,
	input: { title: string; introduction: string }
): LibraryCollection {
	const title = input.title.trim();
	return db()
		.insert(libraryCollections)
		.values({
			slug: uniqueSlug(slugify(title, 'collection'), slugTaken),
			title,
			introduction: input.introduction.trim(),
			createdBy: educatorId
		})
		.returning()
		.get();
}

export function findCollection(id: string): LibraryCollection | null {
	return db().select().from(libraryCollections).where(eq(libraryCollections.id, id)).get() ?? null;
}

export interface CollectionItemView {
	entryId: string;
	slug: string;
	title: string;
	status: string;
	position: number;
	versionId: string | null;
	posterCount: number;
}

/** The collection's exercises in order, each with its current state (retired ones are removed). */
export function collectionItems(collectionId: string): CollectionItemView[] {
	return db()
		.select({
			entryId: libraryExercises.id,
			slug: libraryExercises.slug,
			status: libraryExercises.status,
			position: libraryCollectionItems.position,
			title: libraryVersions.title,
			versionId: libraryVersions.id,
			posterCount: libraryVersions.posterCount
		})
		.from(libraryCollectionItems)
		.innerJoin(libraryExercises, eq(libraryExercises.id, libraryCollectionItems.libraryExerciseId))
		.leftJoin(libraryVersions, eq(libraryVersions.id, libraryExercises.currentVersionId))
		.where(eq(libraryCollectionItems.collectionId, collectionId))
		.orderBy(asc(libraryCollectionItems.position))
		.all()
		.map((r) => ({ ...r, title: r.title ?? r.slug, posterCount: r.posterCount ?? 0 }));
}

/** Published exercises not yet in the collection, by title, for the "add" menu. */
export function addableExercises(collectionId: string): { id: string; title: string }[] {
	const inside = new Set(collectionItems(collectionId).map((i) => i.entryId));
	return db()
		.select({ id: libraryExercises.id, title: libraryVersions.title })
		.from(libraryExercises)
		.innerJoin(libraryVersions, eq(libraryVersions.id, libraryExercises.currentVersionId))
		.where(eq(libraryExercises.status, 'published'))
		.orderBy(asc(libraryVersions.title))
		.all()
		.filter((e) => !inside.has(e.id));
}

function touch(collectionId: string, changes: Partial<LibraryCollection> = {}): LibraryCollection {
	const updated = db()
		.update(libraryCollections)
		.set({ ...changes, updatedAt: new Date() })
		.where(eq(libraryCollections.id, collectionId))
		.returning()
		.get();
	if (!updated) throw new LibraryError(404, 'Not found.');
	return updated;
}

export function updateCollection(
	collectionId: string,
	input: { title: string; introduction: string }
): LibraryCollection {
	return touch(collectionId, {
		title: input.title.trim(),
		introduction: input.introduction.trim()
	});
}

export function addToCollection(collectionId: string, entryId: string): void {
	db().transaction(
		(tx) => {
			const entry = tx
				.select({ status: libraryExercises.status })
				.from(libraryExercises)
				.where(eq(libraryExercises.id, entryId))
				.get();
			if (!entry || entry.status !== 'published') {
				throw new LibraryError(400, 'Only published exercises can join a collection.');
			}
			const last =
				tx
					.select({ n: max(libraryCollectionItems.position) })
					.from(libraryCollectionItems)
					.where(eq(libraryCollectionItems.collectionId, collectionId))
					.get()?.n ?? -1;
			tx.insert(libraryCollectionItems)
				.values({ collectionId, libraryExerciseId: entryId, position: last + 1 })
				.onConflictDoNothing()
				.run();
		},
		{ behavior: 'immediate' }
	);
	touch(collectionId);
}

/** Rewrites the positions 0, 1, 2… in the given order. */
function renumber(collectionId: string, entryIds: string[]): void {
	entryIds.forEach((entryId, position) => {
		db()
			.update(libraryCollectionItems)
			.set({ position })
			.where(
				and(
					eq(libraryCollectionItems.collectionId, collectionId),
					eq(libraryCollectionItems.libraryExerciseId, entryId)
				)
			)
			.run();
	});
}

/** Moves one exercise a place up (-1) or down (+1); at either end nothing moves. */
export function moveInCollection(collectionId: string, entryId: string, by: -1 | 1): void {
	db().transaction(
		() => {
			const ids = collectionItems(collectionId).map((i) => i.entryId);
			const at = ids.indexOf(entryId);
			if (at === -1) throw new LibraryError(404, 'That exercise is not in this collection.');
			const to = at + by;
			if (to < 0 || to >= ids.length) return;
			[ids[at], ids[to]] = [ids[to], ids[at]];
			renumber(collectionId, ids);
		},
		{ behavior: 'immediate' }
	);
	touch(collectionId);
}

export function removeFromCollection(collectionId: string, entryId: string): void {
	db().transaction(
		() => {
			db()
				.delete(libraryCollectionItems)
				.where(
					and(
						eq(libraryCollectionItems.collectionId, collectionId),
						eq(libraryCollectionItems.libraryExerciseId, entryId)
					)
				)
				.run();
			renumber(
				collectionId,
				collectionItems(collectionId).map((i) => i.entryId)
			);
		},
		{ behavior: 'immediate' }
	);
	const collection = findCollection(collectionId);
	if (collection?.coverLibraryExerciseId === entryId) {
		touch(collectionId, { coverLibraryExerciseId: null, coverPoster: 0 });
	} else touch(collectionId);
}

/** Picks the cover: poster `poster` of one of the collection's exercises. */
export function setCover(collectionId: string, entryId: string, poster: number): void {
	const item = collectionItems(collectionId).find((i) => i.entryId === entryId);
	if (!item) throw new LibraryError(400, 'The cover must come from an exercise in the collection.');
	if (!Number.isInteger(poster) || poster < 0 || poster >= item.posterCount) {
		throw new LibraryError(400, 'That exercise has no such still picture.');
	}
	touch(collectionId, { coverLibraryExerciseId: entryId, coverPoster: poster });
}

export function publishCollection(collectionId: string): LibraryCollection {
	const published = collectionItems(collectionId).filter((i) => i.status === 'published');
	if (published.length === 0) {
		throw new LibraryError(
			400,
			'Add at least one published exercise before publishing the collection.'
		);
	}
	const collection = findCollection(collectionId);
	if (!collection) throw new LibraryError(404, 'Not found.');
	return touch(collectionId, {
		status: 'published',
		publishedAt: collection.publishedAt ?? new Date()
	});
}

export function unpublishCollection(collectionId: string): LibraryCollection {
	const collection = findCollection(collectionId);
	if (!collection) throw new LibraryError(404, 'Not found.');
	if (collection.status !== 'published') {
		throw new LibraryError(409, 'This collection is not published.');
	}
	return touch(collectionId, { status: 'unpublished' });
}
