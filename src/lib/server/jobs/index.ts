import { config } from '../config';
import { startDigestSchedule } from '../followup/digest';
import { startOutboxSchedule } from '../mail';
import { processRecordingHandler } from '../recordings/process';
import { startUploadSweep } from '../recordings/uploads';
import { detectSignalsHandler } from '../segments/detection';
import { cutSegmentHandler } from '../segments/job';
import { bullmqEngine } from './bullmq';
import type { BackgroundPlan, Handlers, QueueEngine, Worker, WorkerOptions } from './engine';
import { sqliteEngine } from './sqlite';

/** Every kind of job this codebase knows how to run. */
export const HANDLERS: Handlers = {
	'process-recording': processRecordingHandler,
	'cut-segment': cutSegmentHandler,
	'detect-signals': detectSignalsHandler
};

/** The queue engine QUEUE_ENGINE names (engine.ts). */
export function queueEngine(): QueueEngine {
	const { QUEUE_ENGINE, REDIS_URL } = config();
	return QUEUE_ENGINE === 'bullmq' ? bullmqEngine(REDIS_URL) : sqliteEngine;
}

let running: { workers: Worker[]; stops: (() => void)[] } | undefined;

/** Starts this process's share of the background work (`backgroundPlan`), once. */
export function startBackgroundWork(
	plan: BackgroundPlan,
	options: Partial<WorkerOptions> = {}
): void {
	if (running) return;
	const engine = queueEngine();
	const settings = { handlers: HANDLERS, ...options };
	const dispatcher = plan.dispatcher ? engine.startDispatcher(settings) : null;
	const workers = [
		...(dispatcher ? [dispatcher] : []),
		...(plan.worker ? [engine.startWorker(settings)] : [])
	];
	const stops = plan.upkeep
		? [startUploadSweep(), startDigestSchedule(), startOutboxSchedule()]
		: [];
	running = { workers, stops };
}

/** Wakes this process's worker or dispatcher, if it runs one, so a new job starts without waiting for a poll. */
export function nudgeWorker(): void {
	for (const worker of running?.workers ?? []) worker.nudge();
}

export async function stopBackgroundWork(): Promise<void> {
	if (!running) return;
	const { workers, stops } = running;
	running = undefined;
	for (const stop of stops) stop();
	await Promise.all(workers.map((worker) => worker.stop()));
}

/**
 * Whether the app process runs the worker too: WORKER_IN_APP when set, otherwise only under the
 * dev server (`devServer`). In production the worker is its own process, `npm run worker`, so
 * ffmpeg work never multiplies with app processes behind a proxy.
 */
export function workerInApp(devServer: boolean): boolean {
	return config().WORKER_IN_APP ?? devServer;
}
