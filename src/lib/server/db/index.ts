import Database from 'better-sqlite3';
import { drizzle, type BetterSQLite3Database } from 'drizzle-orm/better-sqlite3';
import { migrate } from 'drizzle-orm/better-sqlite3/migrator';
import { mkdirSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { config } from '../config';
import * as schema from './schema';

export type Db = BetterSQLite3Database<typeof schema> & { $client: Database.Database };

let opened: Db | undefined;

/** Opens a SQLite file with the pragmas Kinelume relies on and applies pending migrations. */
export function openDatabase(path: string, migrationsFolder = resolve('drizzle')): Db {
	if (path !== ':memory:') mkdirSync(dirname(resolve(path)), { recursive: true });
	const sqlite = new Database(path);
	sqlite.pragma('journal_mode = WAL');
	sqlite.pragma('foreign_keys = ON');
	sqlite.pragma('busy_timeout = 5000');
	sqlite.pragma('synchronous = NORMAL');
	const db = drizzle(sqlite, { schema }) as Db;
	migrate(db, { migrationsFolder });
	return db;
}

/**
 * The process's database, opened on first use rather than at import, so that `vite build`
 * (which imports server modules) never creates a file.
 */
export function db(): Db {
	opened ??= openDatabase(config().DATABASE_PATH);
	return opened;
}

/** Closes the process's database (tests and scripts). */
export function closeDatabase(): void {
	opened?.$client.close();
	opened = undefined;
}

/**
 * For queries that every request runs: `build` makes the prepared query (placeholders for the
 * values, `.prepare()` at the end) once per open database, instead of drizzle building the SQL and
 * SQLite compiling it on each call. Returns a function giving the current database's query.
 */
export function prepared<T>(build: (store: Db) => T): () => T {
	const byDatabase = new WeakMap<Db, T>();
	return () => {
		const store = db();
		let query = byDatabase.get(store);
		if (query === undefined) byDatabase.set(store, (query = build(store)));
		return query;
	};
}

export { schema };
