/**
 * `npm run bench:load`: 200 signed-in patients at once for 60 s, doing what patients do, against
 * the production build with its fakes. Each patient (one keep-alive connection of autocannon)
 * goes round: open Today, open a replay, fetch its captions, read a byte range of the clip, post
 * a session log. It prints requests per second, p50/p95/p99 per route, errors, the app's memory
 * and — the point — logs acknowledged versus logs stored: every acknowledged log must be stored,
 * with no errors. A log whose answer was still on its way when the run stopped may be stored
 * without having been acknowledged; those are counted apart.
 *
 * The reference, measured in the same run at the same number of connections: `/robots.txt`, which
 * passes every hook and sends a few bytes (the app's floor on this machine).
 *
 * It makes its own database, fakes and ports in a temporary folder, removed afterwards (Ctrl+C
 * included). A measurement, not a test: it exits 0 when a goal is missed and non-zero only when
 * it could not measure.
 *
 *   npm run bench:load -- [--patients=200] [--seconds=60] [--build]
 */
import autocannon from 'autocannon';
import Database from 'better-sqlite3';
import type { Cookies } from '@sveltejs/kit';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { loadavg } from 'node:os';
import type { SessionLogResponse } from '../lib/sessions/log';
import {
	argValue,
	buildIfAsked,
	copyBuild,
	printTable,
	runBench,
	seedClinician,
	startApp,
	startFakes,
	startRun,
	type Row
} from './bench/stack';

const PORTS = { app: 4286, storage: 4782, smtp: 2739, mailApi: 2740 };
const PATIENTS = Number(argValue('patients') ?? 200);
const SECONDS = Number(argValue('seconds') ?? 60);
const REFERENCE_SECONDS = 10;
/** The clip read a player makes first: its opening 256 KiB. */
const CLIP_RANGE = 'bytes=0-262143';
/** Ours, for a 2-core machine: a patient waits under a second for anything, even at 200 at once. */
const P95_GOAL_MS = 1000;
const MEMORY_GOAL_MB = 200;
const BENCH_EMAIL = (i: number) => `load.patient.${i}@alder-street.example`;

interface BenchPatient {
	cookie: string;
	itemId: string;
	segmentId: string;
}

/** The route a request belongs to, by its path: the table's rows. */
const ROUTES: [string, RegExp][] = [
	['GET /today', /^\/today$/],
	['GET /replay/[id]', /^\/replay\//],
	['GET captions.vtt', /\/captions\.vtt$/],
	['GET clip.mp4 (range)', /\/clip\.mp4$/],
	['POST /api/sessions', /^\/api\/sessions$/]
];
const routeOf = (path: string) => ROUTES.find(([, pattern]) => pattern.test(path))?.[0] ?? path;

/**
 * A 12 s clip at a phone-like bitrate (640 × 360 H.264, fast start), made with the app's ffmpeg:
 * what the range reads fetch.
 */
async function makeClip(dir: string): Promise<Buffer> {
	const { runFfmpeg } = await import('../lib/server/media/ffmpeg');
	const out = join(dir, 'load-clip.mp4');
	const args = ['-v', 'error', '-f', 'lavfi', '-i', 'testsrc2=size=640x360:rate=30:duration=12'];
	args.push(
		'-c:v',
		'libx264',
		'-b:v',
		'900k',
		'-pix_fmt',
		'yuv420p',
		'-movflags',
		'+faststart',
		out
	);
	await runFfmpeg(args);
	return readFileSync(out);
}

/**
 * The demo clinic's clinician with one ready recording, one cut segment (with its clip in
 * storage and three cues) and one exercise on it; then `count` patients, each with a published
 * programme of that exercise and a sign-in of their own, written straight into the database:
 * signing 200 people in through the form would meet the sign-in limits, which is what they are for.
 */
async function seedPatients(count: number, origin: string, dir: string): Promise<BenchPatient[]> {
	const { startSession, sessionCookieName } = await import('../lib/server/auth/session');
	const { putObject } = await import('../lib/server/storage');
	const { recordingKeys } = await import('../lib/server/storage/keys');
	const { clinicId, userId: clinicianId } = await seedClinician();
	const clip = await makeClip(dir);
	const sqlite = new Database(process.env.DATABASE_PATH!);
	const now = Date.now();
	const recordingId = crypto.randomUUID();
	const segmentId = crypto.randomUUID();
	const exerciseId = crypto.randomUUID();
	const cues = [
		{ id: '1', start: 0.5, end: 3.5, text: 'Lie on your back with both legs straight.' },
		{ id: '2', start: 4, end: 7.5, text: 'Slide your heel towards you, then back.' },
		{ id: '3', start: 8, end: 11.5, text: 'Ten times, slowly, within comfort.' }
	];
	sqlite
		.prepare(
			`insert into recording (id, clinic_id, uploaded_by, title, original_filename, content_type, size_bytes,
			 status, duration_seconds, width, height, video_codec, poster_count, created_at, ready_at)
			 values (?, ?, ?, 'Load clip', 'load.mp4', 'video/mp4', ?, 'ready', 12, 640, 360, 'h264', 0, ?, ?)`
		)
		.run(recordingId, clinicId, clinicianId, clip.length, now, now);
	sqlite
		.prepare(
			`insert into segment (id, recording_id, clinic_id, position, title, start_seconds, end_seconds, status,
			 clip_duration_seconds, clip_size, poster_count, cues, captions_version, captions_language, created_at)
			 values (?, ?, ?, 0, 'Heel slides', 0, 12, 'ready', 12, ?, 0, ?, 1, 'en-GB', ?)`
		)
		.run(segmentId, recordingId, clinicId, clip.length, JSON.stringify(cues), now);
	sqlite
		.prepare(
			`insert into exercise (id, clinic_id, segment_id, title, body_region, position, movement_type, sets, reps,
			 sessions_per_day, days_per_week, status, created_at, updated_at)
			 values (?, ?, ?, 'Heel slides', 'knee', 'supine', 'active', 1, 10, 3, 7, 'ready', ?, ?)`
		)
		.run(exerciseId, clinicId, segmentId, now, now);
	await putObject(recordingKeys(clinicId, recordingId).segment(segmentId), clip, 'video/mp4');

	const url = new URL(origin);
	const name = sessionCookieName(url);
	const addPatient = sqlite.transaction((i: number) => {
		const userId = crypto.randomUUID();
		const patientId = crypto.randomUUID();
		const programmeId = crypto.randomUUID();
		const itemId = crypto.randomUUID();
		const email = BENCH_EMAIL(i);
		const fullName = `Load Patient ${i + 1}`;
		sqlite
			.prepare('insert into user (id, name, email, created_at) values (?, ?, ?, ?)')
			.run(userId, fullName, email, now);
		sqlite
			.prepare(
				`insert into patient (id, clinic_id, user_id, full_name, email, created_at) values (?, ?, ?, ?, ?, ?)`
			)
			.run(patientId, clinicId, userId, fullName, email, now);
		sqlite
			.prepare(
				`insert into programme (id, clinic_id, patient_id, title, status, start_date, created_at, updated_at, published_at)
				 values (?, ?, ?, 'Home programme', 'published', date('now', '-7 days'), ?, ?, ?)`
			)
			.run(programmeId, clinicId, patientId, now, now, now);
		sqlite
			.prepare(
				`insert into programme_item (id, programme_id, exercise_id, position, sets, reps, sessions_per_day, days_per_week)
				 values (?, ?, ?, 0, 1, 10, 3, 7)`
			)
			.run(itemId, programmeId, exerciseId);
		return { userId, email, fullName, itemId };
	});
	const patients: BenchPatient[] = [];
	for (let i = 0; i < count; i++) {
		const { userId, email, fullName, itemId } = addPatient(i);
		let token = '';
		const jar = { set: (_name: string, value: string) => (token = value) } as unknown as Cookies;
		await startSession(jar, url, { id: userId, email, name: fullName, role: 'patient' });
		patients.push({ cookie: `${name}=${token}`, itemId, segmentId });
	}
	sqlite.close();
	return patients;
}

/** The app's resident memory now and at its peak, from /proc (Linux). */
function memoryOf(pid: number): { rssMb: number; peakMb: number } {
	const status = readFileSync(`/proc/${pid}/status`, 'utf8');
	const kb = (field: string) => Number(new RegExp(`${field}:\\s+(\\d+)`).exec(status)?.[1] ?? 0);
	return { rssMb: kb('VmRSS') / 1024, peakMb: kb('VmHWM') / 1024 };
}

function percentiles(samples: number[]) {
	const sorted = [...samples].sort((a, b) => a - b);
	const rank = (p: number) =>
		sorted.length === 0
			? NaN
			: sorted[Math.min(sorted.length - 1, Math.ceil(p * sorted.length) - 1)];
	return { p50: rank(0.5), p95: rank(0.95), p99: rank(0.99) };
}

const ms = (value: number) => `${Math.round(value)} ms`;

async function main() {
	const loadStart = loadavg()[0];
	const run = await startRun('load', PORTS);
	await runBench(run, async () => {
		await buildIfAsked(run);
		const buildCopy = copyBuild(run);
		await startFakes(run);
		console.log(`Seeding the demo clinic, one clip and ${PATIENTS} patients…`);
		const patients = await seedPatients(PATIENTS, run.origin, run.dataDir);
		const app = await startApp(run, buildCopy);
		const pid = app.child.pid!;

		console.log(`Reference: /robots.txt at ${PATIENTS} connections for ${REFERENCE_SECONDS} s…`);
		const reference = await Promise.race([
			autocannon({
				url: `${run.appUrl}/robots.txt`,
				connections: PATIENTS,
				duration: REFERENCE_SECONDS
			}),
			app.exited
		]);

		console.log(`${PATIENTS} patients for ${SECONDS} s…`);
		const latencies = new Map<string, number[]>(ROUTES.map(([route]) => [route, []]));
		const statuses = new Map<string, Map<number, number>>();
		/** The client ids of the logs the app answered 201 for. */
		const acknowledged = new Set<string>();
		let sentLogs = 0;
		let nextPatient = 0;
		let peakRssMb = 0;
		const sampler = setInterval(() => {
			peakRssMb = Math.max(peakRssMb, memoryOf(pid).rssMb);
		}, 250);
		/** One patient's round, with their own cookie (fresh objects: autocannon keeps state on them). */
		const roundOf = (patient: BenchPatient): autocannon.Request[] => {
			const headers = { cookie: patient.cookie, origin: run.origin };
			const clip = `/api/segments/${patient.segmentId}`;
			return [
				{ method: 'GET', path: '/today', headers: { ...headers } },
				{ method: 'GET', path: `/replay/${patient.itemId}`, headers: { ...headers } },
				{ method: 'GET', path: `${clip}/captions.vtt`, headers: { ...headers } },
				{ method: 'GET', path: `${clip}/clip.mp4`, headers: { ...headers, range: CLIP_RANGE } },
				{
					method: 'POST',
					path: '/api/sessions',
					headers: { ...headers, 'content-type': 'application/json' },
					setupRequest: (req) => {
						sentLogs++;
						return {
							...req,
							body: JSON.stringify({
								clientId: crypto.randomUUID(),
								programmeItemId: patient.itemId,
								doneAt: new Date().toISOString(),
								setsDone: 1,
								repsDone: 10,
								pain: 2,
								sharpPain: false,
								note: ''
							})
						};
					},
					onResponse: (status, body) => {
						if (status === 201) {
							acknowledged.add((JSON.parse(body) as SessionLogResponse).log.clientId);
						}
					}
				}
			];
		};
		let finished!: (result: autocannon.Result) => void;
		let failed!: (error: Error) => void;
		const done = new Promise<autocannon.Result>((resolve, reject) => {
			finished = resolve;
			failed = reject;
		});
		// The callback form returns the running instance, whose answers are timed per route below.
		const instance = autocannon(
			{
				url: run.appUrl,
				connections: PATIENTS,
				duration: SECONDS,
				timeout: 30,
				// Each connection is one patient, signed in with their own cookie.
				setupClient(client) {
					client.setRequests(roundOf(patients[nextPatient++ % patients.length]));
				},
				requests: roundOf(patients[0])
			},
			(error, result) => (error ? failed(error) : finished(result))
		);
		instance.on('response', (client, statusCode, _bytes, responseTime) => {
			const path = (client as unknown as { requestIterator: { currentRequest: { path: string } } })
				.requestIterator.currentRequest.path;
			const route = routeOf(path);
			latencies.get(route)?.push(responseTime);
			const counts = statuses.get(route) ?? new Map<number, number>();
			counts.set(statusCode, (counts.get(statusCode) ?? 0) + 1);
			statuses.set(route, counts);
		});
		const result = await Promise.race([done, app.exited]);
		clearInterval(sampler);
		const { peakMb } = memoryOf(pid);

		const sqlite = new Database(process.env.DATABASE_PATH!, { readonly: true });
		const storedIds = new Set(
			(
				sqlite
					.prepare(
						`select l.client_id as clientId from session_log l join patient p on p.id = l.patient_id
						 where p.email like 'load.patient.%'`
					)
					.all() as { clientId: string }[]
			).map((row) => row.clientId)
		);
		sqlite.close();
		const lost = [...acknowledged].filter((id) => !storedIds.has(id)).length;
		const unanswered = [...storedIds].filter((id) => !acknowledged.has(id)).length;

		const refused = [...statuses.entries()].flatMap(([route, counts]) =>
			[...counts.entries()]
				.filter(([status]) => status >= 400)
				.map(([status, n]) => `${route}: ${n} × ${status}`)
		);
		const errors = refused.length + result.errors + result.timeouts;
		const rows: Row[] = [
			{
				figure: `requests per second, ${PATIENTS} patients`,
				measured: result.requests.average.toFixed(0),
				reference: `${reference.requests.average.toFixed(0)} (/robots.txt)`,
				result: `${(result.requests.average / reference.requests.average).toFixed(2)} of the floor`,
				goal: '—',
				pass: null
			},
			...ROUTES.map(([route]): Row => {
				const { p50, p95, p99 } = percentiles(latencies.get(route) ?? []);
				return {
					figure: `${route}: p50 / p95 / p99`,
					measured: `${ms(p50)} / ${ms(p95)} / ${ms(p99)}`,
					reference: `${ms(reference.latency.p50)} / ${ms(reference.latency.p97_5)} (p97.5)`,
					result: `${(latencies.get(route) ?? []).length} answered`,
					goal: `p95 < ${P95_GOAL_MS} ms`,
					pass: p95 < P95_GOAL_MS
				};
			}),
			{
				figure: 'errors (HTTP ≥ 400, socket errors, timeouts)',
				measured: String(errors),
				reference: '—',
				result: refused.join('; ') || `${result.errors} errors, ${result.timeouts} timeouts`,
				goal: '0',
				pass: errors === 0
			},
			{
				figure: 'session logs: acknowledged (201) and stored',
				measured: `${acknowledged.size} acknowledged, ${lost} of them not stored`,
				reference: `${storedIds.size} stored`,
				result: `${sentLogs} sent; ${unanswered} stored, answer cut off at the stop`,
				goal: 'none lost',
				pass: lost === 0 && acknowledged.size > 0
			},
			{
				figure: "app's memory (resident), peak during the run",
				measured: `${peakRssMb.toFixed(0)} MB sampled, ${peakMb.toFixed(0)} MB peak`,
				reference: '—',
				result: '—',
				goal: `< ${MEMORY_GOAL_MB} MB`,
				pass: peakMb < MEMORY_GOAL_MB
			}
		];
		const clipStatuses = [...(statuses.get('GET clip.mp4 (range)') ?? new Map()).entries()]
			.map(([status, n]) => `${n} × ${status}`)
			.join(', ');
		printTable(
			`bench:load — ${PATIENTS} patients, ${SECONDS} s`,
			rows,
			[
				`clip answers: ${clipStatuses || 'none'} (a redirect hands the bytes to storage; not followed here)`,
				'The load generator runs on the same 2 cores as the app and its fakes.'
			],
			loadStart
		);
	});
}

await main();
