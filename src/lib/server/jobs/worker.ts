import { hostname } from 'node:os';
import { config } from '../config';
import type { Job, JobKind } from '../db/schema';
import * as queue from './queue';

export interface JobContext {
	/** Aborted when the job is cancelled or its worker stops; pass it to ffmpeg. */
	signal: AbortSignal;
	/** Records the stage and overall progress (0..1); written at the next heartbeat. */
	report(stage: string, progress: number): void;
}

export interface JobHandler {
	run(job: Job, context: JobContext): Promise<void>;
	/** Called once a job has failed its last attempt, with the reason. */
	failed?(job: Job, reason: string): void | Promise<void>;
	cancelled?(job: Job): void | Promise<void>;
}

export interface WorkerOptions {
	handlers: Partial<Record<JobKind, JobHandler>>;
	concurrency?: number;
	heartbeatSeconds?: number;
	staleSeconds?: number;
	retryBaseSeconds?: number;
	pollMs?: number;
	workerId?: string;
	log?: (message: string) => void;
}

export interface Worker {
	id: string;
	/** Wakes the loop now (a job was just queued) instead of at the next poll. */
	nudge(): void;
	/** Stops claiming, aborts running jobs and hands them back to the queue. */
	stop(): Promise<void>;
}

function describe(error: unknown): string {
	if (error instanceof Error) return error.message;
	return String(error);
}

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
	const retryBase = options.retryBaseSeconds ?? c.JOB_RETRY_BASE_SECONDS;
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
				log(`heartbeat for ${job.id} failed: ${describe(error)}`);
			}
		}, heartbeatMs);
		const context: JobContext = {
			signal: controller.signal,
			report(stage, progress) {
				report = { stage, progress };
			}
		};
		try {
			if (!handler) throw new Error(`No handler for jobs of kind ${job.kind}.`);
			await handler.run(job, context);
			if (controller.signal.aborted) throw controller.signal.reason;
			queue.heartbeat(job.id, id, report);
			queue.succeed(job.id, id);
			log(`${job.kind} ${job.id} succeeded (attempt ${job.attempts})`);
		} catch (error) {
			if (stopping && controller.signal.aborted) {
				queue.release(job.id, id);
			} else if (cancelled) {
				queue.markCancelled(job.id, id);
				await handler?.cancelled?.(job);
				log(`${job.kind} ${job.id} cancelled`);
			} else {
				const message = describe(error);
				const outcome = queue.failAttempt(job, id, message, retryBase);
				log(`${job.kind} ${job.id} attempt ${job.attempts} failed (${outcome}): ${message}`);
				if (outcome === 'failed') await handler?.failed?.(job, message);
			}
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
					.catch((error: unknown) => log(`job ${job.id}: ${describe(error)}`))
					.finally(() => {
						running.delete(job.id);
						schedule(0);
					});
				running.set(job.id, { controller, done });
			}
		} catch (error) {
			log(`claiming failed: ${describe(error)}`);
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
