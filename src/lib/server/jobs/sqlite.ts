import { hostname } from 'node:os';
import { config } from '../config';
import type { Job } from '../db/schema';
import {
	attempt,
	describeError,
	prepare,
	settle,
	type JobContext,
	type QueueEngine,
	type Worker,
	type WorkerOptions
} from './engine';
import * as queue from './queue';

/**
 * Drains the job table with at most `concurrency` jobs at once. Many workers (in the app and in
 * `npm run worker`) may share one database: claims are atomic, heartbeats prove a job's owner is
 * alive, and stale running jobs are queued again on start and then periodically.
 */
export function startWorker(options: WorkerOptions): Worker {
	const c = config();
	const concurrency = options.concurrency ?? c.MEDIA_JOB_CONCURRENCY;
	const heartbeatMs = (options.heartbeatSeconds ?? c.JOB_HEARTBEAT_SECONDS) * 1000;
	const staleSeconds = options.staleSeconds ?? c.JOB_STALE_SECONDS;
	const retryBaseSeconds = options.retryBaseSeconds ?? c.JOB_RETRY_BASE_SECONDS;
	const pollMs = options.pollMs ?? 1000;
	const id = options.workerId ?? `${hostname()}:${process.pid}:${crypto.randomUUID().slice(0, 8)}`;
	const log = options.log ?? ((m: string) => console.log(`[worker ${id}] ${m}`));

	const running = new Map<string, { controller: AbortController; done: Promise<void> }>();
	let stopping = false;
	let timer: ReturnType<typeof setTimeout> | undefined;
	let lastRecovery = 0;

	const recovered = queue.recoverStale(staleSeconds);
	if (recovered > 0) log(`queued again ${recovered} job(s) left running by a stopped worker`);
	lastRecovery = Date.now();

	async function runOne(job: Job, controller: AbortController) {
		const handler = options.handlers[job.kind];
		let cancelled = false;
		let report = { stage: 'starting', progress: 0 };
		const beat = setInterval(() => {
			try {
				if (queue.heartbeat(job.id, id, report).stop && !controller.signal.aborted) {
					cancelled = !stopping;
					controller.abort(new Error(cancelled ? 'The job was cancelled.' : 'The worker stopped.'));
				}
			} catch (error) {
				log(`heartbeat for ${job.id} failed: ${describeError(error)}`);
			}
		}, heartbeatMs);
		const context: JobContext = {
			signal: controller.signal,
			report(stage, progress) {
				report = { stage, progress };
			}
		};
		try {
			const prepared = prepare(handler, job);
			const outcome =
				'outcome' in prepared
					? prepared.outcome
					: await attempt(handler, job.kind, prepared.input, context, () =>
							cancelled ? 'cancelled' : 'stopped'
						);
			if (outcome.status === 'succeeded') queue.heartbeat(job.id, id, report);
			await settle(job, id, outcome, { handlers: options.handlers, retryBaseSeconds, log });
		} finally {
			clearInterval(beat);
		}
	}

	function tick() {
		timer = undefined;
		if (stopping) return;
		try {
			if (Date.now() - lastRecovery > staleSeconds * 1000) {
				lastRecovery = Date.now();
				const n = queue.recoverStale(staleSeconds);
				if (n > 0) log(`queued again ${n} stale job(s)`);
			}
			while (running.size < concurrency) {
				const job = queue.claim(id);
				if (!job) break;
				const controller = new AbortController();
				const done = runOne(job, controller)
					.catch((error: unknown) => log(`job ${job.id}: ${describeError(error)}`))
					.finally(() => {
						running.delete(job.id);
						schedule(0);
					});
				running.set(job.id, { controller, done });
			}
		} catch (error) {
			log(`claiming failed: ${describeError(error)}`);
		}
		schedule(pollMs);
	}

	function schedule(ms: number) {
		if (stopping) return;
		if (timer) {
			if (ms > 0) return;
			clearTimeout(timer);
		}
		timer = setTimeout(tick, ms);
	}

	schedule(0);
	log(`started, at most ${concurrency} job(s) at once`);

	return {
		id,
		nudge: () => schedule(0),
		async stop() {
			stopping = true;
			if (timer) clearTimeout(timer);
			for (const entry of running.values())
				entry.controller.abort(new Error('The worker stopped.'));
			await Promise.allSettled([...running.values()].map((e) => e.done));
		}
	};
}

/** The embedded queue: workers on this machine share the app's SQLite file. */
export const sqliteEngine: QueueEngine = {
	name: 'sqlite',
	startWorker,
	startDispatcher: () => null
};
