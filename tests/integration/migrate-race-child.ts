/**
 * One process of the concurrent-start test (migrations-concurrency.test.ts): loads the app's own
 * database module, waits for the shared start time (START_AT, ms since the epoch) so every
 * process opens the new database at the same moment, then opens it (which migrates) and exits.
 */
import { closeDatabase, db } from '../../src/lib/server/db';

const startAt = Number(process.env.START_AT ?? 0);
while (Date.now() < startAt - 20) await new Promise((resolve) => setTimeout(resolve, 10));
// The last few milliseconds spun, so the processes leave the line closer together than timers allow.
while (Date.now() < startAt);
db();
closeDatabase();
