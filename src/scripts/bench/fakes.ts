/**
 * The storage and mail fakes for a benchmark, run as a child process by `startFakes` in
 * stack.ts: `node --import tsx fakes.ts <data folder> <ports as JSON>`. Prints `ready` once both
 * listen; stops when told (SIGTERM) or when the parent's end of stdin closes.
 */
import { join } from 'node:path';
import { startMailFake } from '../../../fakes/mail/server';
import { startStorageFake } from '../../../fakes/storage/server';
import { BUCKET, KEY_ID, type BenchPorts } from './stack';

const [dataDir, portsJson] = process.argv.slice(2);
const ports = JSON.parse(portsJson) as BenchPorts;

const storage = await startStorageFake({
	port: ports.storage,
	directory: join(dataDir, 'storage'),
	bucket: BUCKET,
	accessKeyId: KEY_ID,
	secretAccessKey: KEY_ID,
	allowedOrigins: [`http://localhost:${ports.app}`]
});
const mail = await startMailFake({
	smtpPort: ports.smtp,
	apiPort: ports.mailApi,
	directory: join(dataDir, 'mail')
});
let closing = false;
const close = () => {
	if (closing) return;
	closing = true;
	void Promise.allSettled([storage.close(), mail.close()]).then(() => process.exit(0));
};
process.on('SIGTERM', close);
// Ctrl+C reaches the whole process group; the parent decides when the fakes go.
process.on('SIGINT', () => {});
process.stdin.on('end', close);
process.stdin.resume();
process.stdout.write('ready\n');
