import { config } from '../config';
import { startDigestSchedule } from '../followup/digest';
import { processRecordingHandler } from '../recordings/process';
import { startUploadSweep } from '../recordings/uploads';
import { cutSegmentHandler } from '../segments/job';
import { startWorker, type Worker, type WorkerOptions } from './worker';

let running: { worker: Worker; stopSweep: () => void; stopDigest: () => void } | undefined;

/** Every kind of job this codebase knows how to run. */
export const HANDLERS: WorkerOptions['handlers'] = {
	'process-recording': processRecordingHandler,
	'cut-segment': cutSegmentHandler
};

/**
 * Starts this process's media worker, the abandoned-upload sweep and the hourly check for the
 * weekly digest, once. The app calls it from its `init` hook unless WORKER_IN_APP=false;
 * `npm run worker` calls it on its own.
 */
export function startBackgroundWork(options: Partial<WorkerOptions> = {}): Worker {
	if (running) return running.worker;
	const worker = startWorker({ handlers: HANDLERS, ...options });
	const stopSweep = startUploadSweep();
	const stopDigest = startDigestSchedule();
	running = { worker, stopSweep, stopDigest };
	return worker;
}

/** Wakes this process's worker, if it runs one, so a new job starts without waiting for a poll. */
export function nudgeWorker(): void {
	running?.worker.nudge();
}

export async function stopBackgroundWork(): Promise<void> {
	if (!running) return;
	const { worker, stopSweep, stopDigest } = running;
	running = undefined;
	stopSweep();
	stopDigest();
	await worker.stop();
}

export function workerInApp(): boolean {
	return config().WORKER_IN_APP;
}
