/**
 * What the benchmark scripts share: a temporary folder removed at the end (Ctrl+C included), the
 * storage and mail fakes in a child process, the production build started from a private copy,
 * a signed-in clinician, and the printed table of figures beside their goals.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { cpSync, existsSync, readFileSync, symlinkSync } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { loadavg, tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { createInterface } from 'node:readline';

export const ROOT = resolve(import.meta.dirname, '../../..');
export const BUCKET = 'kinelume';
export const KEY_ID = 'S3RVER';
export const BENCH_CLINICIAN = 'clinician@alder-street.example';

/** Each benchmark listens on ports of its own, so two can run side by side. */
export interface BenchPorts {
	app: number;
	storage: number;
	smtp: number;
	mailApi: number;
}

export function argValue(name: string): string | undefined {
	const prefix = `--${name}=`;
	return process.argv.find((a) => a.startsWith(prefix))?.slice(prefix.length);
}

export interface BenchRun {
	dataDir: string;
	ports: BenchPorts;
	origin: string;
	appUrl: string;
	storageUrl: string;
	/** Aborted on Ctrl+C or SIGTERM; hand it to long commands. */
	signal: AbortSignal;
	/** Stops the child (if still running) when the run ends. */
	adopt(child: ChildProcess): ChildProcess;
	/** Stops every adopted child and removes the folder; safe to call more than once. */
	cleanUp(): Promise<void>;
}

/**
 * Makes the run's folder and points the app's configuration (this process's environment, which
 * children inherit) at it and at the run's own fakes and ports.
 */
export async function startRun(name: string, ports: BenchPorts): Promise<BenchRun> {
	process.chdir(ROOT);
	const dataDir = await mkdtemp(join(tmpdir(), `kinelume-${name}-`));
	const origin = `http://localhost:${ports.app}`;
	const storageUrl = `http://127.0.0.1:${ports.storage}`;
	Object.assign(process.env, {
		DATABASE_PATH: join(dataDir, 'kinelume.db'),
		ORIGIN: origin,
		S3_ENDPOINT: storageUrl,
		S3_BUCKET: BUCKET,
		S3_ACCESS_KEY_ID: KEY_ID,
		S3_SECRET_ACCESS_KEY: KEY_ID,
		SMTP_PORT: String(ports.smtp),
		DEV_INBOX_URL: `http://127.0.0.1:${ports.mailApi}`,
		MEDIA_WORK_DIR: join(dataDir, 'work'),
		// One process for the run: the app runs the media worker too, as the demo does.
		WORKER_IN_APP: 'true',
		AUTH_SECRET: 'bench-only-secret-that-is-long-enough-0123456789'
	});

	const children = new Set<ChildProcess>();
	const abort = new AbortController();
	let cleaning: Promise<void> | undefined;
	const cleanUp = () =>
		(cleaning ??= (async () => {
			abort.abort();
			await Promise.all([...children].map(stopChild));
			await rm(dataDir, { recursive: true, force: true });
		})());
	for (const signal of ['SIGINT', 'SIGTERM'] as const) {
		process.on(signal, () => {
			// tsx passes the signal on as well, so it can arrive twice.
			if (abort.signal.aborted) return;
			console.error(`\n${signal}: stopping and removing ${dataDir}`);
			void cleanUp().then(() => process.exit(130));
		});
	}
	return {
		dataDir,
		ports,
		origin,
		appUrl: `http://127.0.0.1:${ports.app}`,
		storageUrl,
		signal: abort.signal,
		adopt(child) {
			children.add(child);
			return child;
		},
		cleanUp
	};
}

/**
 * Runs `work`, then cleans up. A failure is printed and sets a non-zero exit code; after Ctrl+C
 * the failures are only those of processes being stopped, so they are not.
 */
export async function runBench(run: BenchRun, work: () => Promise<void>): Promise<void> {
	try {
		await work();
	} catch (error) {
		if (!run.signal.aborted) {
			console.error(`\nThe benchmark could not finish: ${(error as Error).stack ?? String(error)}`);
		}
		process.exitCode = 1;
	} finally {
		await run.cleanUp();
	}
}

/**
 * Runs a command to its end, keeping its output only to explain a failure. Not spawnSync: with the
 * event loop blocked, Ctrl+C would end this process before it could clean up.
 */
export function runCommand(command: string, args: string[], signal: AbortSignal): Promise<void> {
	return new Promise<void>((done, failed) => {
		const child = spawn(command, args, { stdio: ['ignore', 'pipe', 'pipe'], signal, cwd: ROOT });
		let output = '';
		const keep = (chunk: Buffer) => (output = (output + chunk.toString()).slice(-8000));
		child.stdout!.on('data', keep);
		child.stderr!.on('data', keep);
		child.once('error', failed);
		child.once('close', (code) =>
			code === 0 ? done() : failed(new Error(`${command} exited with ${code}:\n${output}`))
		);
	});
}

/** SIGTERM, then SIGKILL if the process is still there after 5 s; resolves once it has exited. */
export async function stopChild(child: ChildProcess | undefined): Promise<void> {
	if (!child || child.exitCode !== null || child.signalCode !== null) return;
	const exited = new Promise<void>((done) => child.once('exit', () => done()));
	child.kill('SIGTERM');
	const timer = setTimeout(() => child.kill('SIGKILL'), 5000);
	await exited;
	clearTimeout(timer);
}

/**
 * Starts a TypeScript file of this folder as a child process and waits for it to print `ready`.
 * Node itself with tsx's loader, not the tsx command, which would put a process in between and
 * leave CPU and memory readings to the wrong one. The child's stdin stays open: it ends itself
 * when this process goes, however it went.
 */
export async function startHelper(
	run: BenchRun,
	file: string,
	args: string[],
	label: string
): Promise<ChildProcess> {
	const child = run.adopt(
		spawn(process.execPath, ['--import', 'tsx', join(import.meta.dirname, file), ...args], {
			stdio: ['pipe', 'pipe', 'inherit'],
			env: process.env,
			cwd: ROOT
		})
	);
	await new Promise<void>((ready, failed) => {
		const lines = createInterface({ input: child.stdout! });
		lines.on('line', (line) => {
			if (line === 'ready') ready();
			else console.log(`[${label}] ${line}`);
		});
		child.once('exit', (code) => failed(new Error(`${label} exited at start (${code})`)));
	});
	return child;
}

/**
 * The storage and mail fakes, in a child process of their own: in this process the storage fake
 * would share one event loop with the benchmark's clients, and a reference read from it would
 * be slowed by its own client.
 */
export function startFakes(run: BenchRun): Promise<ChildProcess> {
	return startHelper(run, 'fakes.ts', [run.dataDir, JSON.stringify(run.ports)], 'fakes');
}

/** `vite build` when asked (`--build`) or when there is no build yet. */
export async function buildIfAsked(run: BenchRun): Promise<void> {
	if (process.argv.includes('--build') || !existsSync(join(ROOT, 'build/index.js'))) {
		console.log('Building the app (vite build)…');
		await runCommand(resolve(ROOT, 'node_modules/.bin/vite'), ['build'], run.signal);
	}
}

/**
 * A private copy of build/: another session's `vite build` replaces build/ while it runs. Its
 * imports find the packages through a node_modules link next to it. Take it first, before the
 * slower set-up, so the window in which build/ is read stays short.
 */
export function copyBuild(run: BenchRun): string {
	const copy = join(run.dataDir, 'build');
	cpSync(join(ROOT, 'build'), copy, { recursive: true });
	symlinkSync(join(ROOT, 'node_modules'), join(run.dataDir, 'node_modules'), 'dir');
	return copy;
}

export interface RunningApp {
	child: ChildProcess;
	/** Rejects when the app exits; race long measurements against it. */
	exited: Promise<never>;
}

/** `node build` from the copy, on the run's port; resolves once /api/health answers. */
export async function startApp(run: BenchRun, buildCopy: string): Promise<RunningApp> {
	const child = run.adopt(
		spawn(process.execPath, [buildCopy], {
			stdio: ['ignore', 'inherit', 'inherit'],
			env: { ...process.env, PORT: String(run.ports.app), HOST: '127.0.0.1' }
		})
	);
	const exited = new Promise<never>((_, reject) =>
		child.once('exit', (code, signal) =>
			reject(new Error(`the app (node build) exited early: ${code ?? signal}`))
		)
	);
	exited.catch(() => {});
	await Promise.race([waitForHealth(run.appUrl), exited]);
	return { child, exited };
}

async function waitForHealth(appUrl: string): Promise<void> {
	for (let i = 0; i < 150; i++) {
		try {
			const res = await fetch(`${appUrl}/api/health`);
			if (res.ok) return;
		} catch {
			// not listening yet
		}
		await new Promise((r) => setTimeout(r, 200));
	}
	throw new Error('the app did not report healthy within 30 s');
}

/** Seeds the demo scenario; returns the demo clinician and their clinic. */
export async function seedClinician(): Promise<{ clinicId: string; userId: string }> {
	const { seedDemo } = await import('../demo/seed');
	// Imported after the bench's environment is set: the database opens on first use.
	const { demoOwner } = await import('../demo/owner');
	await seedDemo();
	const owner = demoOwner(BENCH_CLINICIAN);
	return { clinicId: owner.clinicId, userId: owner.id };
}

/** Signs in through the real password form action and returns the cookies it set. */
export async function signIn(run: BenchRun): Promise<string> {
	const { DEMO_PASSWORD } = await import('../demo/seed');
	const res = await fetch(`${run.appUrl}/signin?/password`, {
		method: 'POST',
		redirect: 'manual',
		headers: {
			Origin: run.origin,
			Accept: 'text/html',
			'Content-Type': 'application/x-www-form-urlencoded'
		},
		body: new URLSearchParams({
			providerId: 'credentials',
			email: BENCH_CLINICIAN,
			password: DEMO_PASSWORD,
			redirectTo: '/home'
		})
	});
	const cookies = res.headers.getSetCookie().map((c) => c.split(';')[0]);
	if (res.status !== 303 || !cookies.some((c) => c.includes('session-token'))) {
		throw new Error(`sign-in answered ${res.status} without a session cookie`);
	}
	return cookies.join('; ');
}

/** CPU seconds (user + system) a process has used so far. */
export function cpuSeconds(pid: number): number {
	const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ');
	// utime and stime are fields 14 and 15 of stat(5), counted here from field 3, in 1/100 s.
	return (Number(fields[11]) + Number(fields[12])) / 100;
}

export interface Row {
	figure: string;
	measured: string;
	reference: string;
	result: string;
	goal: string;
	/** null: a figure given for context, with no goal of its own. */
	pass: boolean | null;
}

/** The figures as a table, the notes on where the time went, the machine's load, and a verdict. */
export function printTable(
	title: string,
	rows: Row[],
	notes: string[],
	loadStart: number,
	headings: { measured: string; reference: string } = {
		measured: 'Kinelume',
		reference: 'reference (same run)'
	}
): void {
	const cells = (r: Row) => [
		r.figure,
		r.measured,
		r.reference,
		r.result,
		r.goal,
		r.pass === null ? 'info' : r.pass ? 'PASS' : 'MISSED'
	];
	const all = [
		['figure', headings.measured, headings.reference, 'result', 'goal', 'verdict'],
		...rows.map(cells)
	];
	const widths = all[0].map((_, i) => Math.max(...all.map((c) => c[i].length)));
	const line = (c: string[]) =>
		c
			.map((v, i) => v.padEnd(widths[i]))
			.join('  ')
			.trimEnd();
	console.log(`\n${title}\n`);
	console.log(line(all[0]));
	console.log(widths.map((w) => '-'.repeat(w)).join('  '));
	for (const c of all.slice(1)) console.log(line(c));
	console.log('\nWhere the time went:');
	for (const note of notes) console.log(`  ${note}`);
	const [loadEnd] = loadavg();
	console.log(
		`  load average ${loadStart.toFixed(2)} at the start, ${loadEnd.toFixed(2)} at the end` +
			(loadStart > 0.5 ? ' (other work was running: figures are less reliable)' : '')
	);
	const goals = rows.filter((r) => r.pass !== null);
	const missed = goals.filter((r) => r.pass === false).length;
	console.log(
		`\n${missed === 0 ? 'Every goal met.' : `${missed} of ${goals.length} goals missed.`} ` +
			'A measurement, not a test: the exit code does not depend on the goals.'
	);
}
