/**
 * Keeps the FTS5 table `library_search` (drizzle/0005_library_search.sql) in step with what is
 * public: one row per published exercise, holding its current version's words. Called inside
 * the same transaction as every change of an exercise's status or version, so the index never
 * shows what the public may not see. better-sqlite3 runs a transaction on the one connection,
 * so statements made here inside a caller's transaction belong to it.
 */
import { eq } from 'drizzle-orm';
import { plainText } from '$lib/captions/text';
import type { ExerciseSnapshot } from '$lib/library/types';
import { db } from '../db';
import { libraryExercises, libraryVersions } from '../db/schema';

/** The words of a snapshot, column by column, as the index stores them. */
export function indexedText(snapshot: ExerciseSnapshot) {
	return {
		title: snapshot.title,
		description: snapshot.description,
		coachingCues: snapshot.coachingCues.map((c) => c.text).join('\n'),
		captions: snapshot.cues.map((c) => plainText(c.text)).join('\n')
	};
}

/** Writes (or removes) the index row of one public exercise from its current state. */
export function reindexEntry(entryId: string): void {
	const store = db();
	const sqlite = store.$client;
	sqlite.prepare('DELETE FROM library_search WHERE library_exercise_id = ?').run(entryId);
	const row = store
		.select({ status: libraryExercises.status, snapshot: libraryVersions.snapshot })
		.from(libraryExercises)
		.innerJoin(libraryVersions, eq(libraryVersions.id, libraryExercises.currentVersionId))
		.where(eq(libraryExercises.id, entryId))
		.get();
	if (!row || row.status !== 'published') return;
	const text = indexedText(row.snapshot);
	sqlite
		.prepare(
			'INSERT INTO library_search (title, description, coaching_cues, captions, library_exercise_id) VALUES (?, ?, ?, ?, ?)'
		)
		.run(text.title, text.description, text.coachingCues, text.captions, entryId);
}

/** Empties the index and fills it again from every published exercise (tests, the benchmark). */
export function rebuildSearchIndex(): number {
	const store = db();
	const sqlite = store.$client;
	const rows = store
		.select({ id: libraryExercises.id, snapshot: libraryVersions.snapshot })
		.from(libraryExercises)
		.innerJoin(libraryVersions, eq(libraryVersions.id, libraryExercises.currentVersionId))
		.where(eq(libraryExercises.status, 'published'))
		.all();
	const insert = sqlite.prepare(
		'INSERT INTO library_search (title, description, coaching_cues, captions, library_exercise_id) VALUES (?, ?, ?, ?, ?)'
	);
	sqlite.transaction(() => {
		sqlite.prepare('DELETE FROM library_search').run();
		for (const { id, snapshot } of rows) {
			const text = indexedText(snapshot);
			insert.run(text.title, text.description, text.coachingCues, text.captions, id);
		}
	})();
	return rows.length;
}
