/**
 * One app process asking for a recording's segment suggestions (segment-detection.test.ts): at
 * START_AT (ms since the epoch) it asks through the app's own module, as the suggestions endpoint
 * does, waits up to WAIT_MS for the answer and prints it as JSON.
 */
import { eq } from 'drizzle-orm';
import { closeDatabase, db, schema } from '../../src/lib/server/db';
import { suggestionsFor } from '../../src/lib/server/segments';

const recording = db()
	.select()
	.from(schema.recordings)
	.where(eq(schema.recordings.id, process.env.RECORDING_ID ?? ''))
	.get();
if (!recording) throw new Error('No such recording.');
const startAt = Number(process.env.START_AT ?? 0);
while (Date.now() < startAt) await new Promise((resolve) => setTimeout(resolve, 5));
const answer = await suggestionsFor(recording, { waitMs: Number(process.env.WAIT_MS ?? 0) });
process.stdout.write(JSON.stringify(answer));
closeDatabase();
