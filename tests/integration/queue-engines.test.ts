/**
 * The queue's contract, run against both engines (src/lib/server/jobs/engine.ts): the embedded
 * SQLite queue and BullMQ on a redis-server this file starts. The same steps and the same
 * expectations: a job runs once and the app writes its result; a failed attempt waits its
 * back-off and is tried again, the last one fails for good; a cancel stops a waiting or a
 * running job; a stopped worker hands its job back; a killed worker's job is run by another.
 */
import { fakesDirectory } from './env';
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtemp, rm } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import { eq } from 'drizzle-orm';
import { Redis } from 'ioredis';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { waitFor } from './waiting';

// A database of this file's own, chosen before any app module reads the configuration.
process.env.DATABASE_PATH = join(fakesDirectory, `queue-engines-${process.pid}.db`);

const { db, schema } = await import('$lib/server/db');
const queue = await import('$lib/server/jobs/queue');
const { sqliteEngine } = await import('$lib/server/jobs/sqlite');
const { bullmqEngine } = await import('$lib/server/jobs/bullmq');
const { HANDLERS } = await import('$lib/server/jobs');
const { recordingKeys } = await import('$lib/server/storage/keys');
const { makeClinic, makeRecording } = await import('./factories');
const { CLIP_FIGURES, makeClip } = await import('./recordings-support');
const { storeMedia } = await import('./media-support');
const { noteHandler, startRedis } = await import('./queue-support');
type QueueEngine = import('$lib/server/jobs/engine').QueueEngine;
type Worker = import('$lib/server/jobs/engine').Worker;
type WorkerOptions = import('$lib/server/jobs/engine').WorkerOptions;
type NoteInput = import('./queue-support').NoteInput;

const CHILD = resolve('tests/integration/queue-worker-child.ts');

const clinic = makeClinic('Queue clinic');

/** A recording waiting for its processing job. */
const recording = (title: string) => makeRecording(clinic.id, { title, status: 'processing' });

function readRecording(id: string) {
	return db().select().from(schema.recordings).where(eq(schema.recordings.id, id)).get()!;
}

function readJob(id: string) {
	return db().select().from(schema.jobs).where(eq(schema.jobs.id, id)).get()!;
}

/** A worker in a process of its own (queue-worker-child.ts), its output kept as it comes. */
function spawnWorker(env: Record<string, string>) {
	// node itself with tsx's loader (not the tsx command, which runs the script in a child of
	// its own that a SIGKILL would leave running).
	const child = spawn(process.execPath, ['--import', 'tsx', CHILD], {
		env: {
			...process.env,
			...env,
			// A BullMQ worker has no database: any use of one would fail here.
			...(env.ENGINE === 'bullmq' ? { DATABASE_PATH: '/dev/null/no-database/kinelume.db' } : {})
		},
		stdio: ['ignore', 'pipe', 'pipe']
	});
	const seen = { output: '' };
	child.stdout!.on('data', (chunk: Buffer) => (seen.output += chunk.toString()));
	child.stderr!.on('data', (chunk: Buffer) => (seen.output += chunk.toString()));
	return { child, seen };
}

const finished = (id: string) =>
	waitFor(`job ${id} to finish`, () => {
		const job = readJob(id);
		return ['succeeded', 'failed', 'cancelled'].includes(job.status) && job;
	});

describe.each(['sqlite', 'bullmq'] as const)('the %s queue', (name) => {
	let engine: QueueEngine;
	let redisUrl = '';
	let stopRedis = async () => {};
	const running: Worker[] = [];
	const children: ChildProcess[] = [];
	const runs: NoteInput[] = [];

	beforeAll(async () => {
		if (name === 'bullmq') {
			const redis = await startRedis();
			redisUrl = redis.url;
			stopRedis = redis.stop;
			engine = bullmqEngine(redisUrl);
		} else {
			engine = sqliteEngine;
		}
	});

	afterEach(async () => {
		for (const child of children.splice(0)) child.kill('SIGKILL');
		await Promise.all(running.splice(0).map((worker) => worker.stop()));
		// Nothing one test queued may reach the next one's workers.
		db().delete(schema.jobs).run();
		if (redisUrl) {
			const redis = new Redis(redisUrl);
			await redis.flushall();
			redis.disconnect();
		}
		runs.length = 0;
	});

	afterAll(() => stopRedis());

	const options = (extra: Partial<WorkerOptions> = {}): WorkerOptions => ({
		handlers: { 'process-recording': noteHandler((input) => runs.push(input)) },
		heartbeatSeconds: 0.1,
		staleSeconds: 1,
		retryBaseSeconds: 3600,
		pollMs: 50,
		log: () => {},
		...extra
	});

	/** The app's side (BullMQ's dispatcher; nothing for SQLite, whose workers use the file). */
	function startApp(extra?: Partial<WorkerOptions>) {
		const dispatcher = engine.startDispatcher(options(extra));
		if (dispatcher) running.push(dispatcher);
		return dispatcher;
	}

	function startWorker(extra?: Partial<WorkerOptions>) {
		const worker = engine.startWorker(options(extra));
		running.push(worker);
		return worker;
	}

	/** Lets the app and the workers see a row whose run-after was moved by hand. */
	function wake() {
		for (const worker of running) worker.nudge();
	}

	it('runs a queued job once, and the app writes its result', async () => {
		const r = recording('ok heel slides');
		const job = queue.enqueue({ kind: 'process-recording', recordingId: r.id });
		startApp();
		startWorker();
		expect(await finished(job.id)).toMatchObject({
			status: 'succeeded',
			attempts: 1,
			progress: 1,
			lockedBy: null
		});
		expect(readRecording(r.id).title).toBe('OK HEEL SLIDES');
		expect(runs).toEqual([{ recordingId: r.id, title: 'ok heel slides', attempt: 1 }]);
	});

	it('queues a failed attempt again after its back-off, and runs it when that is over', async () => {
		const r = recording('fail 1 then fine');
		const job = queue.enqueue({ kind: 'process-recording', recordingId: r.id });
		startApp();
		startWorker();
		const waiting = await waitFor('the first attempt to fail', () => {
			const row = readJob(job.id);
			return row.status === 'queued' && row.lastError !== null && row;
		});
		expect(waiting).toMatchObject({
			attempts: 1,
			stage: 'waiting to retry',
			lastError: 'storage unavailable (attempt 1)'
		});
		// The back-off (an hour from the first attempt) has not passed: nothing runs meanwhile.
		expect(waiting.runAfter.getTime()).toBeGreaterThan(Date.now() + 3_500_000);
		expect(runs).toHaveLength(1);

		db().update(schema.jobs).set({ runAfter: new Date() }).where(eq(schema.jobs.id, job.id)).run();
		wake();
		expect(await finished(job.id)).toMatchObject({ status: 'succeeded', attempts: 2 });
		expect(readRecording(r.id).title).toBe('FAIL 1 THEN FINE');
		expect(runs.map((run) => run.attempt)).toEqual([1, 2]);
	});

	it('fails for good after the last attempt, with the reason', async () => {
		const r = recording('fail 9 always');
		const job = queue.enqueue({ kind: 'process-recording', recordingId: r.id, maxAttempts: 1 });
		startApp();
		startWorker();
		expect(await finished(job.id)).toMatchObject({
			status: 'failed',
			attempts: 1,
			lastError: 'storage unavailable (attempt 1)'
		});
		expect(readRecording(r.id)).toMatchObject({
			status: 'failed',
			failureReason: 'storage unavailable (attempt 1)',
			title: 'fail 9 always'
		});
	});

	it('cancels a waiting job before it runs, and a running one mid-run', async () => {
		const waiting = recording('ok never run');
		const waitingJob = queue.enqueue({ kind: 'process-recording', recordingId: waiting.id });
		expect(queue.cancel(waitingJob.id)).toBe(true);

		const r = recording('hang until cancelled');
		const job = queue.enqueue({ kind: 'process-recording', recordingId: r.id });
		startApp();
		startWorker();
		await waitFor('the job to run', () => runs.length > 0);
		expect(queue.cancel(job.id)).toBe(true);
		expect(await finished(job.id)).toMatchObject({ status: 'cancelled', stage: 'cancelled' });
		expect(readRecording(r.id)).toMatchObject({ failureReason: 'cancelled' });
		expect(readJob(waitingJob.id).status).toBe('cancelled');
		expect(runs.map((run) => run.recordingId)).toEqual([r.id]);
	});

	it('hands a running job back when its worker stops; another runs it, the attempt not counted', async () => {
		const r = recording('hang until stopped');
		const job = queue.enqueue({ kind: 'process-recording', recordingId: r.id });
		startApp();
		const first = startWorker();
		await waitFor('the job to run', () => runs.length > 0);
		// What the next run reads: the handed-back job is prepared again from the database.
		db()
			.update(schema.recordings)
			.set({ title: 'ok after the stop' })
			.where(eq(schema.recordings.id, r.id))
			.run();
		await first.stop();
		startWorker();
		expect(await finished(job.id)).toMatchObject({ status: 'succeeded', attempts: 1 });
		expect(readRecording(r.id).title).toBe('OK AFTER THE STOP');
	});

	it('runs again the job of a worker killed mid-run, once its heartbeat is stale', async () => {
		const r = recording('hang until killed');
		const job = queue.enqueue({ kind: 'process-recording', recordingId: r.id });
		startApp();
		const { child, seen } = spawnWorker({ ENGINE: name, REDIS_URL: redisUrl });
		children.push(child);
		await waitFor(
			() => `the child worker to run the job (it said: ${seen.output})`,
			() => seen.output.includes(`running ${r.id}`)
		);
		child.kill('SIGKILL');
		await new Promise((done) => child.once('exit', done));
		expect(readJob(job.id).status).toBe('running');

		// A live worker, whose jobs do not hang.
		startWorker({
			handlers: { 'process-recording': noteHandler((input) => runs.push(input), { hangs: false }) }
		});
		expect(await finished(job.id)).toMatchObject({ status: 'succeeded', attempts: 1 });
		expect(readRecording(r.id).title).toBe('HANG UNTIL KILLED');
		expect(runs).toEqual([{ recordingId: r.id, title: 'hang until killed', attempt: 1 }]);
	});
});

describe('BullMQ workers with the media handlers', () => {
	it('process a recording in a process without the database; the app writes it ready and queues its detection', async () => {
		const redis = await startRedis();
		const dir = await mkdtemp(join(fakesDirectory, 'queue-media-'));
		const { child, seen } = spawnWorker({
			ENGINE: 'bullmq',
			REDIS_URL: redis.url,
			HANDLERS: 'media'
		});
		const app = bullmqEngine(redis.url).startDispatcher({
			handlers: HANDLERS,
			pollMs: 50,
			log: () => {}
		})!;
		try {
			await makeClip(join(dir, 'clip.mp4'));
			const r = makeRecording(clinic.id, { ...CLIP_FIGURES, status: 'processing' });
			await storeMedia(r, join(dir, 'clip.mp4'), 'original');
			const keys = recordingKeys(clinic.id, r.id);
			const job = queue.enqueue({ kind: 'process-recording', recordingId: r.id });
			expect(
				await waitFor(
					() =>
						`processing (the worker said: ${seen.output}; the job: ${JSON.stringify(readJob(job.id))})`,
					() => {
						const row = readJob(job.id);
						return ['succeeded', 'failed', 'cancelled'].includes(row.status) && row;
					},
					120_000
				)
			).toMatchObject({ status: 'succeeded', lastError: null });
			const ready = readRecording(r.id);
			expect(ready).toMatchObject({ status: 'ready', posterCount: 3, waveformKey: keys.waveform });
			expect(ready.renditionSize).toBeGreaterThan(0);
			const detection = queue.latestJobFor(r.id, 'detect-signals')!;
			expect(await finished(detection.id)).toMatchObject({ status: 'succeeded' });
			const signals = db()
				.select()
				.from(schema.recordingSignals)
				.where(eq(schema.recordingSignals.recordingId, r.id))
				.get();
			expect(signals?.renditionReadyAt.getTime()).toBe(ready.readyAt?.getTime());
		} finally {
			child.kill('SIGKILL');
			await app.stop();
			await redis.stop();
			await rm(dir, { recursive: true, force: true });
		}
	}, 180_000);
});
