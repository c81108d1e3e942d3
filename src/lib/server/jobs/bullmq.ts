/**
 * The several-machine engine: BullMQ on Redis carries jobs between the app, which alone opens
 * SQLite, and workers on any machine, which need only Redis and the storage.
 *
 * The app's dispatcher claims due rows of the job table under a fresh lock (`bullmq:<id>`),
 * prepares each handler's input from the database and adds a BullMQ job with that id. A worker
 * runs it and returns the attempt's `Outcome` as the BullMQ job's value (it never throws, so
 * BullMQ's own retries stay unused: back-off is the job table's). The dispatcher polls the jobs
 * it handed out: it copies their progress into the table (their heartbeat), passes cancel
 * requests on in the job's data, and writes each outcome with `settle` — the SQLite engine's own
 * code — once, even with several app processes. A worker that dies leaves its job active
 * until BullMQ's stalled-job check hands it to another worker; a job Redis lost goes stale in
 * the table and is queued again.
 */
import { hostname } from 'node:os';
import { Queue, Worker as BullWorker } from 'bullmq';
import { Redis } from 'ioredis';
import { and, eq, like } from 'drizzle-orm';
import { config } from '../config';
import { db } from '../db';
import { jobs, type Job, type JobKind } from '../db/schema';
import {
	attempt,
	describeError,
	prepare,
	settle,
	type Outcome,
	type QueueEngine,
	type Worker,
	type WorkerOptions
} from './engine';
import * as queue from './queue';

const QUEUE_NAME = 'media';
const PREFIX = 'kinelume';
const LOCK = 'bullmq:';

interface Carried {
	/** The job table's row. */
	jobId: string;
	kind: JobKind;
	input: unknown;
	/** Set by the app when the job is to be cancelled; its worker looks at each heartbeat. */
	cancel?: boolean;
}

type Report = { stage: string; progress: number };

function connect(url: string): Redis {
	if (!url) throw new Error('QUEUE_ENGINE=bullmq needs REDIS_URL, the Redis server of the queue.');
	// BullMQ's blocking reads need commands that wait for as long as they take.
	return new Redis(url, { maxRetriesPerRequest: null });
}

function settings(options: WorkerOptions) {
	const c = config();
	const id = options.workerId ?? `${hostname()}:${process.pid}:${crypto.randomUUID().slice(0, 8)}`;
	return {
		id,
		concurrency: options.concurrency ?? c.MEDIA_JOB_CONCURRENCY,
		heartbeatMs: (options.heartbeatSeconds ?? c.JOB_HEARTBEAT_SECONDS) * 1000,
		staleSeconds: options.staleSeconds ?? c.JOB_STALE_SECONDS,
		retryBaseSeconds: options.retryBaseSeconds ?? c.JOB_RETRY_BASE_SECONDS,
		pollMs: options.pollMs ?? 1000,
		log: options.log ?? ((m: string) => console.log(`[queue ${id}] ${m}`))
	};
}

function isReport(value: unknown): value is Report {
	return (
		typeof value === 'object' &&
		value !== null &&
		typeof (value as Report).stage === 'string' &&
		typeof (value as Report).progress === 'number'
	);
}

/**
 * A worker: runs BullMQ jobs with the handlers' `run`, sending progress every heartbeat and
 * stopping a job whose data asks for its cancel. Opens no database.
 */
function startWorker(redisUrl: string, options: WorkerOptions): Worker {
	const s = settings(options);
	const connection = connect(redisUrl);
	const reader = new Queue<Carried>(QUEUE_NAME, { connection, prefix: PREFIX });
	let stopping = false;
	const running = new Set<AbortController>();

	const worker = new BullWorker<Carried, Outcome>(
		QUEUE_NAME,
		async (job) => {
			const { kind, input } = job.data;
			const controller = new AbortController();
			running.add(controller);
			let cancelled = false;
			let report: Report = { stage: 'starting', progress: 0 };
			const beat = setInterval(() => {
				void (async () => {
					await job.updateProgress(report);
					const fresh = await reader.getJob(job.id!);
					if (fresh?.data.cancel && !controller.signal.aborted) {
						cancelled = true;
						controller.abort(new Error('The job was cancelled.'));
					}
				})().catch((error: unknown) => s.log(`heartbeat for ${job.id}: ${describeError(error)}`));
			}, s.heartbeatMs);
			try {
				if (stopping) return { status: 'released' };
				return await attempt(
					options.handlers[kind],
					kind,
					input,
					{
						signal: controller.signal,
						report: (stage, progress) => (report = { stage, progress })
					},
					() => (cancelled ? 'cancelled' : 'stopped')
				);
			} finally {
				clearInterval(beat);
				running.delete(controller);
			}
		},
		{
			connection,
			prefix: PREFIX,
			concurrency: s.concurrency,
			// A job whose worker stops renewing its lock (the process died) goes back to waiting
			// after this long, at the next stalled-job check of any worker. An interrupted run does
			// not count as an attempt, here as in the job table.
			lockDuration: s.staleSeconds * 1000,
			stalledInterval: s.staleSeconds * 1000,
			maxStalledCount: 1000
		}
	);
	worker.on('error', (error) => s.log(`queue: ${describeError(error)}`));
	s.log(`started on BullMQ, at most ${s.concurrency} job(s) at once`);

	return {
		id: s.id,
		nudge: () => {},
		async stop() {
			stopping = true;
			for (const controller of running) controller.abort(new Error('The worker stopped.'));
			await worker.close();
			await reader.close();
			connection.disconnect();
		}
	};
}

/**
 * The app's side: hands due rows of the job table to BullMQ and writes back what comes of them.
 * Several app processes may run one each: claims and the writing of an outcome are single
 * UPDATEs, so each happens once.
 */
function startDispatcher(redisUrl: string, options: WorkerOptions): Worker {
	const s = settings(options);
	const connection = connect(redisUrl);
	const media = new Queue<Carried, Outcome>(QUEUE_NAME, { connection, prefix: PREFIX });
	media.on('error', (error) => s.log(`queue: ${describeError(error)}`));
	let stopping = false;
	let timer: ReturnType<typeof setTimeout> | undefined;
	let ticking: Promise<void> | undefined;
	let again = false;
	let lastRecovery = 0;

	/** Writes an outcome unless another app process already is: it moves the lock first. */
	async function finish(row: Job, outcome: Outcome) {
		const writing = `applying:${s.id}:${row.id}`;
		const taken = db()
			.update(jobs)
			.set({ lockedBy: writing, heartbeatAt: new Date() })
			.where(and(eq(jobs.id, row.id), eq(jobs.lockedBy, row.lockedBy!), eq(jobs.status, 'running')))
			.run();
		if (taken.changes === 0) return;
		await settle({ ...row, lockedBy: writing }, writing, outcome, {
			handlers: options.handlers,
			retryBaseSeconds: s.retryBaseSeconds,
			log: s.log
		});
	}

	/** Follows every job handed to BullMQ: progress, cancel requests and outcomes. */
	async function follow() {
		const handedOut = db()
			.select()
			.from(jobs)
			.where(and(eq(jobs.status, 'running'), like(jobs.lockedBy, `${LOCK}%`)))
			.all();
		for (const row of handedOut) {
			const id = row.lockedBy!.slice(LOCK.length);
			// The state first: a job read before it is known to be finished may lack its outcome.
			const state = await media.getJobState(id);
			const carried = await media.getJob(id);
			// Lost with Redis, or never added (the app stopped in between): once its heartbeat
			// goes stale the row is queued again.
			if (state === 'unknown' || !carried) continue;
			if (state === 'completed' || state === 'failed') {
				const outcome: Outcome =
					state === 'completed' && carried.returnvalue
						? carried.returnvalue
						: { status: 'failed', message: carried.failedReason || 'The worker sent no outcome.' };
				await finish(row, outcome);
				await carried.remove();
				continue;
			}
			const report =
				state === 'active' && isReport(carried.progress) ? carried.progress : undefined;
			if (!queue.heartbeat(row.id, row.lockedBy!, report).stop || carried.data.cancel) continue;
			await carried.updateData({ ...carried.data, cancel: true });
			// Not started yet: cancelled here and now. Started: its worker sees the flag.
			if (
				state !== 'active' &&
				(await carried.remove().then(
					() => true,
					() => false
				))
			) {
				await finish(row, { status: 'cancelled' });
			}
		}
	}

	/** Claims each due row and adds it to BullMQ with what its handler needs. */
	async function handOut() {
		while (!stopping) {
			const lock = `${LOCK}${crypto.randomUUID()}`;
			const row = queue.claim(lock);
			if (!row) return;
			const prepared = prepare(options.handlers[row.kind], row);
			if ('outcome' in prepared) {
				await finish(row, prepared.outcome);
				continue;
			}
			try {
				await media.add(
					row.kind,
					{ jobId: row.id, kind: row.kind, input: prepared.input },
					{ jobId: lock.slice(LOCK.length), removeOnComplete: false, removeOnFail: false }
				);
				queue.heartbeat(row.id, lock, { stage: 'waiting for a worker', progress: 0 });
			} catch (error) {
				queue.release(row.id, lock);
				throw error;
			}
		}
	}

	async function tick() {
		await follow();
		// Only after `follow` has vouched for every job still in BullMQ: the rest are lost.
		if (Date.now() - lastRecovery > s.staleSeconds * 1000) {
			lastRecovery = Date.now();
			const n = queue.recoverStale(s.staleSeconds);
			if (n > 0) s.log(`queued again ${n} stale job(s)`);
		}
		await handOut();
	}

	function run() {
		timer = undefined;
		if (stopping) return;
		if (ticking) {
			again = true;
			return;
		}
		ticking = tick()
			.catch((error: unknown) => s.log(`dispatching failed: ${describeError(error)}`))
			.finally(() => {
				ticking = undefined;
				schedule(again ? 0 : s.pollMs);
				again = false;
			});
	}

	function schedule(ms: number) {
		if (stopping) return;
		if (timer) {
			if (ms > 0) return;
			clearTimeout(timer);
		}
		timer = setTimeout(run, ms);
	}

	schedule(0);
	s.log('hands jobs to BullMQ');

	return {
		id: s.id,
		nudge: () => schedule(0),
		async stop() {
			stopping = true;
			if (timer) clearTimeout(timer);
			await ticking;
			await media.close();
			connection.disconnect();
		}
	};
}

/** The engine on the Redis server at `redisUrl` (REDIS_URL). */
export function bullmqEngine(redisUrl: string): QueueEngine {
	return {
		name: 'bullmq',
		startWorker: (options) => startWorker(redisUrl, options),
		startDispatcher: (options) => startDispatcher(redisUrl, options)
	};
}
