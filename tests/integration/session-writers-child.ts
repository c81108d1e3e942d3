/**
 * One writer of the contention test (faults.test.ts): at START_AT (ms since the epoch) it logs
 * LOGS sessions for PATIENT_ID's ITEM_ID through the app's own recordSession, each sent twice
 * (a phone resending after a lost answer), and prints how many the app acknowledged as new.
 */
import { eq } from 'drizzle-orm';
import { closeDatabase, db, schema } from '../../src/lib/server/db';
import { recordSession } from '../../src/lib/server/sessions';

const patient = db()
	.select()
	.from(schema.patients)
	.where(eq(schema.patients.id, process.env.PATIENT_ID!))
	.get()!;
const startAt = Number(process.env.START_AT ?? 0);
while (Date.now() < startAt) await new Promise((resolve) => setTimeout(resolve, 5));
let acknowledged = 0;
for (let i = 0; i < Number(process.env.LOGS ?? 1); i++) {
	const log = {
		clientId: crypto.randomUUID(),
		programmeItemId: process.env.ITEM_ID!,
		doneAt: new Date().toISOString(),
		setsDone: 1,
		repsDone: 8,
		pain: 2,
		sharpPain: false,
		note: `writer ${process.pid}`
	};
	if (recordSession(patient, log).created) acknowledged++;
	// The resend finds the first and adds nothing.
	if (recordSession(patient, log).created) acknowledged++;
	// Let the other writers in between, as requests would.
	await new Promise((resolve) => setImmediate(resolve));
}
closeDatabase();
process.stdout.write(JSON.stringify({ acknowledged }));
