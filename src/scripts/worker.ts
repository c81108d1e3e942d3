/**
 * `npm run worker`: drains the job table in its own process, sharing only the database and the
 * storage with the app. This is how production runs background work (the app runs none unless
 * WORKER_IN_APP=true); several may run on one machine, and their ffmpeg runs together stay within
 * FFMPEG_MAX_CONCURRENT. Stops cleanly on SIGINT/SIGTERM, handing running jobs back to the queue.
 */
import { config } from '../lib/server/config';
import { closeDatabase, db } from '../lib/server/db';
import { startBackgroundWork, stopBackgroundWork } from '../lib/server/jobs';

config();
db();
startBackgroundWork();

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
