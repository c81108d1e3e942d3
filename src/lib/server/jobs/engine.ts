/**
 * The job queue's one interface. The `job` table is the app's record of every job (its status,
 * attempts, back-off, progress and cancel requests, read by the pages); an engine is how a queued
 * row reaches a worker and how its outcome comes back:
 *
 * - `sqlite` (sqlite.ts, the default): workers on this machine claim rows straight from the
 *   database file, run them and write the outcome themselves.
 * - `bullmq` (bullmq.ts): the app hands each due row to BullMQ on Redis; workers on any machine
 *   run it with nothing but the queue and the storage and return their outcome as the BullMQ
 *   job's value; the app reads it back and writes it. Only the app opens SQLite.
 *
 * Both finish a job through `settle`, so retries, back-off, cancels and results are written by
 * the same code whichever engine carried the work.
 */
import { storageUnreachable } from '../storage/reachable';
import type { Job, JobKind } from '../db/schema';
import * as queue from './queue';

export interface JobContext {
	/** Aborted when the job is cancelled or its worker stops; pass it to ffmpeg. */
	signal: AbortSignal;
	/** Records the stage and overall progress (0..1); sent at the next heartbeat. */
	report(stage: string, progress: number): void;
}

/**
 * Reports progress through a job's stages, each given the share of the whole job it takes (the
 * shares add up to 1), so the bar moves at about the speed work gets done: `report(stage, 0.5)`
 * is halfway through that stage, after every stage before it.
 */
export function stageReporter<Stage extends string>(
	context: Pick<JobContext, 'report'>,
	stages: readonly (readonly [Stage, number])[]
): (stage: Stage, fraction?: number) => void {
	return (stage, fraction = 0) => {
		let before = 0;
		for (const [name, share] of stages) {
			if (name === stage) {
				context.report(stage, before + share * Math.max(0, Math.min(1, fraction)));
				return;
			}
			before += share;
		}
	};
}

/**
 * One kind of job, split where the database ends: `prepare` and `apply` run where SQLite is (the
 * app, or a worker sharing its file), `run` wherever the work is done, with the storage only.
 * Input and result travel between machines as JSON.
 */
export interface JobHandler<Input = unknown, Result = unknown> {
	/** What the work needs from the database, or null when nothing is left to do. */
	prepare(job: Job): Input | null;
	/** Does the work; answers what to write. Reads and writes storage, never the database. */
	run(input: Input, context: JobContext): Promise<Result>;
	/** Writes a finished run's result (and removes what it stored if its record went meanwhile). */
	apply(job: Job, result: Result): void | Promise<void>;
	/** Called once a job has failed its last attempt, with the reason. */
	failed?(job: Job, reason: string): void | Promise<void>;
	cancelled?(job: Job): void | Promise<void>;
}

export type Handlers = Partial<Record<JobKind, JobHandler>>;

export interface WorkerOptions {
	handlers: Handlers;
	concurrency?: number;
	heartbeatSeconds?: number;
	/** A running job whose worker gave no sign of life for this long is run again. */
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
	/** Stops taking jobs; running ones are aborted and handed back to the queue. */
	stop(): Promise<void>;
}

export interface QueueEngine {
	name: 'sqlite' | 'bullmq';
	/** Runs jobs in this process, at most `concurrency` at once. */
	startWorker(options: WorkerOptions): Worker;
	/**
	 * In a process that opens the database: hands due jobs to the engine's workers and writes
	 * their outcomes back. Null when workers use the database themselves.
	 */
	startDispatcher(options: WorkerOptions): Worker | null;
}

/** What one process runs in the background. */
export interface BackgroundPlan {
	/** Runs media jobs. */
	worker: boolean;
	/** Hands jobs to the engine's workers and writes their outcomes (bullmq). */
	dispatcher: boolean;
	/** The abandoned-upload sweep, the weekly digest and the mail outbox: database upkeep. */
	upkeep: boolean;
}

/**
 * Who runs what. With the SQLite engine `npm run worker` does all the background work beside the
 * database, and the app none unless it runs the worker too. With BullMQ the app alone opens the
 * database, so it dispatches and keeps up; `npm run worker` only runs jobs, on any machine.
 */
export function backgroundPlan(
	place: 'app' | 'worker',
	engine: QueueEngine['name'],
	workerInApp: boolean
): BackgroundPlan {
	if (place === 'worker') return { worker: true, dispatcher: false, upkeep: engine === 'sqlite' };
	if (engine === 'sqlite') return { worker: workerInApp, dispatcher: false, upkeep: workerInApp };
	return { worker: workerInApp, dispatcher: true, upkeep: true };
}

/** How one attempt ended, as a worker reports it (JSON, so it can cross machines). */
export type Outcome =
	| { status: 'succeeded'; result: unknown }
	/** `prepare` found nothing left to do. */
	| { status: 'skipped' }
	| { status: 'failed'; message: string }
	| { status: 'cancelled' }
	/** Its worker stopped; the attempt does not count. */
	| { status: 'released' }
	/** Storage could not be reached: the job waits and tries again; the attempt does not count. */
	| { status: 'unreachable'; message: string };

export function describeError(error: unknown): string {
	if (error instanceof Error) return error.message;
	return String(error);
}

/**
 * Runs one attempt of `handler` on `input` and says how it ended; never throws. `interrupted`
 * tells why the context's signal fired, once it has.
 */
export async function attempt(
	handler: JobHandler | undefined,
	kind: JobKind,
	input: unknown,
	context: JobContext,
	interrupted: () => 'cancelled' | 'stopped'
): Promise<Outcome> {
	try {
		if (!handler) throw new Error(`No handler for jobs of kind ${kind}.`);
		const result = await handler.run(input, context);
		context.signal.throwIfAborted();
		return { status: 'succeeded', result: result ?? null };
	} catch (error) {
		if (context.signal.aborted) {
			return interrupted() === 'stopped' ? { status: 'released' } : { status: 'cancelled' };
		}
		if (storageUnreachable(error)) return { status: 'unreachable', message: describeError(error) };
		return { status: 'failed', message: describeError(error) };
	}
}

/**
 * Writes an attempt's outcome for the job held under `lockedBy`: the result applied and the job
 * succeeded, queued again after a back-off or failed for good, cancelled, or handed back.
 */
export async function settle(
	job: Job,
	lockedBy: string,
	outcome: Outcome,
	options: Pick<WorkerOptions, 'handlers'> & { retryBaseSeconds: number; log(m: string): void }
): Promise<void> {
	const handler = options.handlers[job.kind];
	const { log } = options;
	if (outcome.status === 'succeeded' || outcome.status === 'skipped') {
		try {
			if (outcome.status === 'succeeded') await handler?.apply(job, outcome.result);
			queue.succeed(job.id, lockedBy);
			log(`${job.kind} ${job.id} succeeded (attempt ${job.attempts})`);
			return;
		} catch (error) {
			outcome = { status: 'failed', message: describeError(error) };
		}
	}
	if (outcome.status === 'released') {
		queue.release(job.id, lockedBy);
	} else if (outcome.status === 'unreachable') {
		queue.waitForStorage(job.id, lockedBy, outcome.message);
		log(`${job.kind} ${job.id} waits for storage: ${outcome.message}`);
	} else if (outcome.status === 'cancelled') {
		queue.markCancelled(job.id, lockedBy);
		await handler?.cancelled?.(job);
		log(`${job.kind} ${job.id} cancelled`);
	} else if (outcome.status === 'failed') {
		const result = queue.failAttempt(job, lockedBy, outcome.message, options.retryBaseSeconds);
		log(`${job.kind} ${job.id} attempt ${job.attempts} failed (${result}): ${outcome.message}`);
		if (result === 'failed') await handler?.failed?.(job, outcome.message);
	}
}

/** The handler's input for a claimed job, or the outcome that ends it before any work. */
export function prepare(
	handler: JobHandler | undefined,
	job: Job
): { input: unknown } | { outcome: Outcome } {
	if (!handler) return { input: null };
	try {
		const input = handler.prepare(job);
		return input === null ? { outcome: { status: 'skipped' } } : { input };
	} catch (error) {
		return { outcome: { status: 'failed', message: describeError(error) } };
	}
}
