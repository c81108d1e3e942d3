/**
 * `npm run demo`: builds the app, starts the local storage and mail stand-ins, migrates and
 * seeds the invented demo clinic, starts the production server and prints how to sign in.
 * `npm run demo -- --reset` first deletes the demo database and the fakes' data.
 */
import { spawn, spawnSync } from 'node:child_process';
import { rmSync } from 'node:fs';
import { resolve } from 'node:path';

const reset = process.argv.includes('--reset');
const port = Number(process.env.PORT ?? 3000);
const origin = process.env.ORIGIN ?? `http://localhost:${port}`;
const dataDir = resolve(process.env.DEMO_DATA_DIR ?? '.data');

process.env.DATABASE_PATH ??= resolve(dataDir, 'kinelume.db');
process.env.ORIGIN = origin;
// The demo is where the development inbox is on: e-mails land there instead of anyone's mailbox.
process.env.DEV_INBOX_URL ??= 'http://127.0.0.1:2526';
// One process for the whole demo: the app runs the job worker too (production runs `npm run worker`).
process.env.WORKER_IN_APP ??= 'true';

if (reset) {
	for (const name of ['kinelume.db', 'kinelume.db-wal', 'kinelume.db-shm', 'fakes']) {
		rmSync(resolve(dataDir, name), { recursive: true, force: true });
	}
	console.log('Demo data removed; starting over.');
}

console.log('Building Kinelume…');
const build = spawnSync(resolve('node_modules/.bin/vite'), ['build'], { encoding: 'utf8' });
if (build.status !== 0) {
	// Only a failed build's output is worth reading; a good one is just noise here.
	console.error(build.stdout, build.stderr, '\nThe build failed; see the messages above.');
	process.exit(1);
}

const { startStorageFake } = await import('../../fakes/storage/server');
const { startMailFake } = await import('../../fakes/mail/server');
const { config } = await import('../lib/server/config');
const cfg = config();

const storage = await startStorageFake({
	port: Number(new URL(cfg.S3_ENDPOINT || 'http://127.0.0.1:4569').port || 4569),
	directory: resolve(dataDir, 'fakes/storage'),
	bucket: cfg.S3_BUCKET,
	accessKeyId: cfg.S3_ACCESS_KEY_ID,
	secretAccessKey: cfg.S3_SECRET_ACCESS_KEY,
	allowedOrigins: [origin]
});
const mail = await startMailFake({
	smtpPort: cfg.SMTP_PORT,
	apiPort: Number(new URL(cfg.DEV_INBOX_URL || 'http://127.0.0.1:2526').port || 2526),
	directory: resolve(dataDir, 'fakes/mail')
});

const { seedDemo, DEMO_PASSWORD } = await import('./demo/seed');
const { seedDemoRecordings } = await import('./demo/recordings');
const { closeDatabase } = await import('../lib/server/db');
const accounts = await seedDemo();
console.log('Preparing the demonstration recordings (drawn once, then kept in .data/demo-clips)…');
const added = await seedDemoRecordings(
	resolve(dataDir, 'demo-clips'),
	'clinician@alder-street.example',
	(line) => console.log(line)
);
closeDatabase();

const app = spawn(process.execPath, ['build'], {
	stdio: ['ignore', 'pipe', 'inherit'],
	env: { ...process.env, PORT: String(port), HOST: process.env.HOST ?? '127.0.0.1', ORIGIN: origin }
});
app.stdout.on('data', (chunk: Buffer) => process.stdout.write(chunk));

async function waitForHealth(): Promise<boolean> {
	for (let i = 0; i < 100; i++) {
		try {
			const res = await fetch(`http://127.0.0.1:${port}/api/health`);
			if (res.ok) return true;
		} catch {
			// not listening yet
		}
		await new Promise((r) => setTimeout(r, 200));
	}
	return false;
}

if (!(await waitForHealth()))
	console.error('The app did not report healthy; see the messages above.');

const width = Math.max(...accounts.map((a) => a.email.length));
console.log(`\nKinelume demo is running at ${origin}\n`);
console.log(`Every demo account's password: ${DEMO_PASSWORD}\n`);
for (const a of accounts)
	console.log(`  ${a.email.padEnd(width)}  ${a.role.padEnd(9)}  ${a.name}, ${a.clinic}`);
if (added) {
	console.log(
		`\n${added} demonstration recording(s) uploaded; the app is making their web renditions now (Recordings page).`
	);
}
console.log(
	`\nE-mails (invitations, sign-in links) land in the development inbox: sign in as an admin and open ${origin}/inbox`
);
console.log(
	`Storage fake: ${storage.url}   Mail fake: SMTP 127.0.0.1:${mail.smtpPort}, messages ${mail.apiUrl}/messages`
);
console.log('Press Ctrl+C to stop.\n');

// The demo recordings' segments, once the app has made their web versions (it runs the cuts too).
const { confirmDemoSegments } = await import('./demo/segments');
confirmDemoSegments('clinician@alder-street.example', (line) => console.log(line))
	.then(async (n) => {
		if (n > 0) console.log(`Segments confirmed for ${n} demonstration recording(s).`);
		// Exercises on those segments, and the demo patient's programmes, once the cuts are done.
		const { seedDemoExercises } = await import('./demo/exercises');
		const made = await seedDemoExercises('clinician@alder-street.example', (line) =>
			console.log(line)
		);
		console.log(`Demo exercises ready: ${made.exercises}.`);
		// Weeks of session logs and range-of-motion readings, then this week's digest e-mails.
		const { seedDemoFollowup } = await import('./demo/followup');
		await seedDemoFollowup('clinician@alder-street.example', (line) => console.log(line));
		const { sendWeeklyDigests } = await import('../lib/server/followup/digest');
		const digest = await sendWeeklyDigests({ log: (line) => console.log(line) });
		if (digest.sent.length > 0)
			console.log(`Weekly digest sent to ${digest.sent.join(', ')} (see the inbox).`);
		// The public library: a few of those exercises reviewed and published, one still waiting.
		const { seedDemoLibrary } = await import('./demo/library');
		const library = await seedDemoLibrary(
			'clinician@alder-street.example',
			'educator@alder-street.example',
			(line) => console.log(line)
		);
		console.log(
			`Demo library: ${library.published} exercise(s) published, ${library.waiting} waiting for review (${origin}/library).`
		);
	})
	.catch((error: unknown) => console.error('The demo segments could not be made:', error));

let stopping = false;
async function stop(code = 0) {
	if (stopping) return;
	stopping = true;
	app.kill('SIGTERM');
	await Promise.allSettled([storage.close(), mail.close()]);
	process.exit(code);
}
process.on('SIGINT', () => void stop());
process.on('SIGTERM', () => void stop());
app.on('exit', (code) => void stop(code ?? 0));
