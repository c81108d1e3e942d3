/**
 * A worker of the queue contract test (queue-engines.test.ts) in a process of its own, so the
 * test can kill it mid-job: ENGINE (sqlite or bullmq) and REDIS_URL choose the queue. It prints
 * `running <recording id>` when a job starts. HANDLERS=media runs the app's own media handlers
 * instead. Under bullmq its DATABASE_PATH is unusable: a worker there must not need the database.
 */
import { HANDLERS } from '../../src/lib/server/jobs';
import { bullmqEngine } from '../../src/lib/server/jobs/bullmq';
import { sqliteEngine } from '../../src/lib/server/jobs/sqlite';
import { countSlotsInProcess } from '../../src/lib/server/media/slots';
import { noteHandler } from './queue-support';

const engine =
	process.env.ENGINE === 'bullmq' ? bullmqEngine(process.env.REDIS_URL ?? '') : sqliteEngine;
// As `npm run worker` does under BullMQ (src/scripts/worker.ts).
if (engine.name === 'bullmq') countSlotsInProcess();
engine.startWorker({
	handlers:
		process.env.HANDLERS === 'media'
			? HANDLERS
			: {
					'process-recording': noteHandler((input) => console.log(`running ${input.recordingId}`))
				},
	heartbeatSeconds: 0.2,
	staleSeconds: 1,
	pollMs: 50,
	log: (message) => console.log(message)
});
