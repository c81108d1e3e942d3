/**
 * `npm run worker`: runs media jobs in its own process. This is how production runs background
 * work (the app runs none unless WORKER_IN_APP=true).
 *
 * With the SQLite queue (the default) it shares the database file and the storage with the app,
 * and also runs the upload sweep, the digest and the mail outbox; several may run on one machine,
 * and their ffmpeg runs together stay within FFMPEG_MAX_CONCURRENT. With QUEUE_ENGINE=bullmq it
 * needs only REDIS_URL and the storage, opens no database, and may run on any machine: one per
 * machine, its own FFMPEG_MAX_CONCURRENT the machine's limit. Stops cleanly on SIGINT/SIGTERM,
 * handing running jobs back to the queue.
 */
import { config } from '../lib/server/config';
import { closeDatabase, db } from '../lib/server/db';
import { startBackgroundWork, stopBackgroundWork } from '../lib/server/jobs';
import { backgroundPlan } from '../lib/server/jobs/engine';
import { countSlotsInProcess } from '../lib/server/media/slots';

const engine = config().QUEUE_ENGINE;
const plan = backgroundPlan('worker', engine, true);
if (engine === 'sqlite') db();
else countSlotsInProcess();
startBackgroundWork(plan);

let stopping = false;
async function stop() {
	if (stopping) return;
	stopping = true;
	await stopBackgroundWork();
	closeDatabase();
	process.exit(0);
}
process.on('SIGINT', () => void stop());
process.on('SIGTERM', () => void stop());
