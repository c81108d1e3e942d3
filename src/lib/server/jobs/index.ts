import { config } from '../config';
import { startDigestSchedule } from '../followup/digest';
import { startOutboxSchedule } from '../mail';
import { processRecordingHandler } from '../recordings/process';
import { startUploadSweep } from '../recordings/uploads';
import { detectSignalsHandler } from '../segments/detection';
import { cutSegmentHandler } from '../segments/job';
import { startWorker, type Worker, type WorkerOptions } from './worker';

let running:
	| { worker: Worker; stopSweep: () => void; stopDigest: () => void; stopOutbox: () => void }
	| undefined;

/** Every kind of job this codebase knows how to run. */
export const HANDLERS: WorkerOptions['handlers'] = {
	'process-recording': processRecordingHandler,
	'cut-segment': cutSegmentHandler,
	'detect-signals': detectSignalsHandler
};

/**
 * Starts this process's media worker, the abandoned-upload sweep, the hourly check for the
 * weekly digest and the mail outbox's retries, once. `npm run worker` calls it; the app's `init` hook only when workerInApp().
 */
export function startBackgroundWork(options: Partial<WorkerOptions> = {}): Worker {
	if (running) return running.worker;
	const worker = startWorker({ handlers: HANDLERS, ...options });
	const stopSweep = startUploadSweep();
	const stopDigest = startDigestSchedule();
	const stopOutbox = startOutboxSchedule();
	running = { worker, stopSweep, stopDigest, stopOutbox };
	return worker;
}

/** Wakes this process's worker, if it runs one, so a new job starts without waiting for a poll. */
export function nudgeWorker(): void {
	running?.worker.nudge();
}

export async function stopBackgroundWork(): Promise<void> {
	if (!running) return;
	const { worker, stopSweep, stopDigest, stopOutbox } = running;
	running = undefined;
	stopSweep();
	stopDigest();
	stopOutbox();
	await worker.stop();
}

/**
 * Whether the app process runs the worker too: WORKER_IN_APP when set, otherwise only under the
 * dev server (`devServer`). In production the worker is its own process, `npm run worker`, so
 * ffmpeg work never multiplies with app processes behind a proxy.
 */
export function workerInApp(devServer: boolean): boolean {
	return config().WORKER_IN_APP ?? devServer;
}
