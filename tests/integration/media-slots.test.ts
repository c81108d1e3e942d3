import { fakesDirectory } from './env';
import { spawn } from 'node:child_process';
import { chmod, mkdir, mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { hostname } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

// A database of this file's own, chosen before any app module reads the configuration.
process.env.DATABASE_PATH = join(fakesDirectory, `media-slots-${process.pid}.db`);

const { db, schema } = await import('$lib/server/db');
const { withMediaSlot, mediaSlotsHeld } = await import('$lib/server/media/slots');

/*
 * The per-machine limit on ffmpeg runs, with fake ffmpeg work: a shell script standing in for
 * ffmpeg (FFMPEG_PATH) marks itself running in a folder, writes down how many runs it sees
 * there, waits a second and leaves. Real OS processes share one database, as the app and its
 * workers do. The most runs seen at once is the most that ever ran at once: each run counts
 * after marking itself, so the last of any group to start sees the whole group.
 */

const TSX = resolve('node_modules/.bin/tsx');
const CHILD = resolve('tests/integration/media-slots-child.ts');
const FAKE_FFMPEG = `#!/bin/sh
touch "$FAKE_FFMPEG_DIR/running/$$"
ls "$FAKE_FFMPEG_DIR/running" | wc -l >> "$FAKE_FFMPEG_DIR/seen"
sleep 1
rm "$FAKE_FFMPEG_DIR/running/$$"
`;
let dir: string;
let fake: string;

beforeAll(async () => {
	dir = await mkdtemp(join(fakesDirectory, 'media-slots-'));
	fake = join(dir, 'ffmpeg');
	await writeFile(fake, FAKE_FFMPEG);
	await chmod(fake, 0o755);
});

afterAll(async () => {
	if (dir) await rm(dir, { recursive: true, force: true });
});

function runChild(env: Record<string, string>): Promise<{ code: number | null; stderr: string }> {
	return new Promise((done, fail) => {
		const child = spawn(TSX, [CHILD], {
			env: { ...process.env, FFMPEG_PATH: fake, ...env },
			stdio: ['ignore', 'ignore', 'pipe']
		});
		let stderr = '';
		child.stderr.on('data', (chunk: Buffer) => (stderr += chunk.toString()));
		child.on('error', fail);
		child.on('close', (code) => done({ code, stderr }));
	});
}

/** Starts `processes` processes of `runs` fake ffmpeg runs each at once; the counts seen. */
async function fakeWork(name: string, processes: number, runs: number, limit: string) {
	const work = join(dir, name);
	await mkdir(join(work, 'running'), { recursive: true });
	const startAt = Date.now() + 4000;
	const exits = await Promise.all(
		Array.from({ length: processes }, () =>
			runChild({
				DATABASE_PATH: join(work, 'kinelume.db'),
				FAKE_FFMPEG_DIR: work,
				FFMPEG_MAX_CONCURRENT: limit,
				START_AT: String(startAt),
				RUNS: String(runs)
			})
		)
	);
	const seen = (await readFile(join(work, 'seen'), 'utf8'))
		.split('\n')
		.filter((line) => line.trim() !== '')
		.map(Number);
	return { exits, seen };
}

describe('ffmpeg runs on one machine', () => {
	it('never run more at once than FFMPEG_MAX_CONCURRENT, across processes, and all of them run', async () => {
		const { exits, seen } = await fakeWork('limited', 3, 3, '2');
		expect(exits).toEqual(Array.from({ length: 3 }, () => ({ code: 0, stderr: '' })));
		expect(seen).toHaveLength(9);
		expect(Math.max(...seen)).toBe(2);
	}, 120_000);

	it('run side by side when the limit allows it (the fake does see overlapping runs)', async () => {
		const { exits, seen } = await fakeWork('unlimited', 3, 3, '16');
		expect(exits.every((e) => e.code === 0)).toBe(true);
		expect(seen).toHaveLength(9);
		expect(Math.max(...seen)).toBeGreaterThan(2);
	}, 120_000);
});

describe('a slot', () => {
	it('is given up by a run that stops waiting, and freed when its work fails', async () => {
		let release!: () => void;
		const holding = withMediaSlot(() => new Promise<void>((r) => (release = r)), { limit: 1 });
		await expect.poll(() => mediaSlotsHeld()).toBe(1);
		const controller = new AbortController();
		const waiting = withMediaSlot(async () => 'ran', {
			limit: 1,
			pollMs: 20,
			signal: controller.signal
		});
		controller.abort();
		await expect(waiting).rejects.toMatchObject({ kind: 'aborted' });
		expect(mediaSlotsHeld()).toBe(1);
		release();
		await holding;
		expect(mediaSlotsHeld()).toBe(0);
		await expect(
			withMediaSlot(() => Promise.reject(new Error('ffmpeg failed')), { limit: 1 })
		).rejects.toThrow('ffmpeg failed');
		expect(mediaSlotsHeld()).toBe(0);
	});

	it('left by a process that died is taken at once on this host, and one that lapsed anywhere', async () => {
		const gone = await new Promise<number>((done) => {
			const child = spawn('true');
			child.on('close', () => done(child.pid!));
		});
		db()
			.insert(schema.mediaSlots)
			.values([
				{ holder: `${hostname()}:${gone}`, expiresAt: new Date(Date.now() + 60_000) },
				{ holder: 'another-host:1', expiresAt: new Date(Date.now() - 1) }
			])
			.run();
		expect(await withMediaSlot(async () => mediaSlotsHeld(), { limit: 1 })).toBe(1);
		expect(db().select().from(schema.mediaSlots).all()).toEqual([]);
	});
});
