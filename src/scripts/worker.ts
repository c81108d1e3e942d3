/**
 * `npm run worker`: drains the media job table in its own process, sharing only the database and
 * the storage with the app (run the app with WORKER_IN_APP=false then). Stops cleanly on
 * SIGINT/SIGTERM, handing running jobs back to the queue.
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
