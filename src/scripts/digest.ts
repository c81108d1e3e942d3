/**
 * `npm run digest`: sends this week's digest to every clinician now, without waiting for the
 * weekly hour. Still once per clinician and week: running it twice, or after the worker has
 * sent it, sends nothing more.
 */
import { config } from '../lib/server/config';
import { closeDatabase } from '../lib/server/db';
import { sendWeeklyDigests } from '../lib/server/followup/digest';

config();
const run = await sendWeeklyDigests({ log: (m) => console.error(m) });
closeDatabase();
console.log(`Weekly digest for the week of ${run.weekStarts.join(', ') || '(no clinicians)'}:`);
console.log(
	`  sent to ${run.sent.length} clinician(s)${run.sent.length ? `: ${run.sent.join(', ')}` : ''}`
);
console.log(`  already sent this week: ${run.alreadySent}`);
console.log(
	`  clinicians with nothing to report yet (no published programme, no log): ${run.nothingToReport}`
);
if (run.failed.length > 0) {
	for (const f of run.failed) console.error(`  FAILED ${f.email}: ${f.reason}`);
	process.exit(1);
}
