import { fakesDirectory } from './env';
import { spawn } from 'node:child_process';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

/*
 * Several app processes (or an app and its workers) started together on a new database each
 * migrate at start. Real OS processes, each through the app's own database module
 * (migrate-race-child.ts), released at the same moment on a fresh file, round after round.
 */

const PROCESSES = 4;
const ROUNDS = 10;
const TSX = resolve('node_modules/.bin/tsx');
const CHILD = resolve('tests/integration/migrate-race-child.ts');
let dir: string;

interface Exit {
	code: number | null;
	stderr: string;
}

function startChild(databasePath: string, startAt: number): Promise<Exit> {
	return new Promise((done, fail) => {
		const child = spawn(TSX, [CHILD], {
			env: { ...process.env, DATABASE_PATH: databasePath, START_AT: String(startAt) },
			stdio: ['ignore', 'ignore', 'pipe']
		});
		let stderr = '';
		child.stderr.on('data', (chunk: Buffer) => (stderr += chunk.toString()));
		child.on('error', fail);
		child.on('close', (code) => done({ code, stderr }));
	});
}

/** Tables and indexes the migrations make, as a fresh single-process migration leaves them. */
function schemaOf(path: string): { objects: string[]; migrations: number } {
	const sqlite = new Database(path, { readonly: true });
	try {
		const objects = sqlite
			.prepare(
				"select type || ' ' || name as o from sqlite_master where name not like 'sqlite_%' order by o"
			)
			.all()
			.map((row) => (row as { o: string }).o);
		const { n } = sqlite.prepare('select count(*) as n from __drizzle_migrations').get() as {
			n: number;
		};
		return { objects, migrations: n };
	} finally {
		sqlite.close();
	}
}

let expected: { objects: string[]; migrations: number };

beforeAll(async () => {
	dir = await mkdtemp(join(fakesDirectory, 'migrate-race-'));
	const journal = JSON.parse(await readFile('drizzle/meta/_journal.json', 'utf8')) as {
		entries: unknown[];
	};
	// The reference: one process alone on a new file.
	const alone = join(dir, 'alone.db');
	const exit = await startChild(alone, 0);
	expect(exit).toEqual({ code: 0, stderr: '' });
	expected = schemaOf(alone);
	expect(expected.migrations).toBe(journal.entries.length);
	expect(expected.objects).toContain('table job');
}, 60_000);

afterAll(async () => {
	if (dir) await rm(dir, { recursive: true, force: true });
});

describe('processes started together on a new database', () => {
	it(`all migrate it, ${PROCESSES} at a time for ${ROUNDS} rounds, and leave the whole schema once`, async () => {
		const failures: string[] = [];
		for (let round = 1; round <= ROUNDS; round++) {
			const path = join(dir, `round-${round}.db`);
			// Far enough ahead for every process to have loaded its modules (tsx takes about a second).
			const startAt = Date.now() + 4000;
			const exits = await Promise.all(
				Array.from({ length: PROCESSES }, () => startChild(path, startAt))
			);
			exits.forEach((exit, i) => {
				if (exit.code !== 0) {
					const said =
						exit.stderr.match(/SqliteError: .*|already exists.*|database is locked.*/)?.[0] ??
						exit.stderr.trim().split('\n').at(-1) ??
						'';
					failures.push(`round ${round}, process ${i + 1}: exit ${exit.code} ${said.trim()}`);
				}
			});
			expect(schemaOf(path), `round ${round}`).toEqual(expected);
		}
		expect(failures).toEqual([]);
	}, 300_000);
});
