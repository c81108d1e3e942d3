import Database from 'better-sqlite3';
import { drizzle, type BetterSQLite3Database } from 'drizzle-orm/better-sqlite3';
import { readMigrationFiles } from 'drizzle-orm/migrator';
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
	// First, so that a process opening a file another is creating or migrating waits (as long
	// as migrations may take) instead of failing: until WAL is on, another process's exclusive
	// migration blocks even these pragmas and the reads that check what is applied.
	sqlite.pragma(`busy_timeout = ${MIGRATION_WAIT_MS}`);
	whileBusy(() => sqlite.pragma('journal_mode = WAL'));
	sqlite.pragma('foreign_keys = ON');
	sqlite.pragma('synchronous = NORMAL');
	whileBusy(() => migrateExclusively(sqlite, migrationsFolder));
	sqlite.pragma(`busy_timeout = ${USUAL_WAIT_MS}`);
	return drizzle(sqlite, { schema }) as Db;
}

/**
 * Runs `step` again while SQLite answers SQLITE_BUSY, for as long as migrations may take. Some
 * busy answers skip the busy timeout (switching a new file to WAL while another process holds
 * it, a WAL being recovered), so processes started together still met "database is locked".
 */
function whileBusy<T>(step: () => T): T {
	const until = Date.now() + MIGRATION_WAIT_MS;
	const pause = new Int32Array(new SharedArrayBuffer(4));
	for (;;) {
		try {
			return step();
		} catch (error) {
			const code = (error as { code?: string }).code ?? '';
			if (!code.startsWith('SQLITE_BUSY') || Date.now() > until) throw error;
			Atomics.wait(pause, 0, 0, 50);
		}
	}
}

const MIGRATIONS_TABLE = '__drizzle_migrations';
/** How long a starting process waits for another one's migrations before giving up. */
const MIGRATION_WAIT_MS = 120_000;
/** How long a statement waits for another process's write once the database is open. */
const USUAL_WAIT_MS = 5000;

/** The newest applied migration's folder time, or null when none is (or no table yet). */
function lastApplied(sqlite: Database.Database): number | null {
	const table = sqlite
		.prepare("select 1 from sqlite_master where type = 'table' and name = ?")
		.get(MIGRATIONS_TABLE);
	if (!table) return null;
	const row = sqlite
		.prepare(`select created_at from "${MIGRATIONS_TABLE}" order by created_at desc limit 1`)
		.get() as { created_at: number | string } | undefined;
	return row ? Number(row.created_at) : null;
}

/**
 * Applies pending migrations from `drizzle/` with drizzle's own files, table and rule (a
 * migration runs when it is newer than the newest applied one), but decides what is pending
 * inside one exclusive transaction. drizzle's migrator reads the newest applied migration before
 * its BEGIN, so processes started together on a new database all ran the first migration and
 * all but one failed ("table … already exists"). Here the second process waits for the lock,
 * then finds everything applied.
 */
export function migrateExclusively(sqlite: Database.Database, migrationsFolder: string): void {
	const migrations = readMigrationFiles({ migrationsFolder });
	const newest = migrations.at(-1)?.folderMillis ?? 0;
	// Most starts have nothing to apply: answered without taking the write lock.
	if ((lastApplied(sqlite) ?? -1) >= newest) return;
	const usualWait = sqlite.pragma('busy_timeout', { simple: true }) as number;
	sqlite.pragma(`busy_timeout = ${MIGRATION_WAIT_MS}`);
	try {
		sqlite.exec('BEGIN EXCLUSIVE');
		try {
			sqlite.exec(
				`CREATE TABLE IF NOT EXISTS "${MIGRATIONS_TABLE}" (id SERIAL PRIMARY KEY, hash text NOT NULL, created_at numeric)`
			);
			const last = lastApplied(sqlite);
			const record = sqlite.prepare(
				`INSERT INTO "${MIGRATIONS_TABLE}" ("hash", "created_at") VALUES (?, ?)`
			);
			for (const migration of migrations) {
				if (last !== null && last >= migration.folderMillis) continue;
				for (const statement of migration.sql) sqlite.exec(statement);
				record.run(migration.hash, migration.folderMillis);
			}
			sqlite.exec('COMMIT');
		} catch (error) {
			if (sqlite.inTransaction) sqlite.exec('ROLLBACK');
			throw error;
		}
	} finally {
		sqlite.pragma(`busy_timeout = ${usualWait}`);
	}
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
