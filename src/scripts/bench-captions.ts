/**
 * `npm run bench:captions`: measures the caption path, each figure beside its goal.
 *
 *   (a) a generated 2,000-cue WebVTT track: parse, a full guideline check with each profile, and
 *       the re-check after one cue's text is edited — median and 95th percentile over many runs
 *       after a warm-up (goal: re-check p95 under 16 ms, one frame at 60 Hz, so typing never
 *       stutters);
 *   (b) segment suggestion (suggestForRecording) on a generated 10-minute 720p recording with a
 *       cue script, as a multiple of real time (goal ≥ 1×: suggestions are ready before the
 *       recording could have been watched through);
 *   (c) requests per second of GET /api/tracks/<id>/captions.vtt at 50 concurrent keep-alive
 *       clients against a plain node:http server sending the same bytes and headers, in the
 *       same run, for 200 and for 304 (If-None-Match) answers (goal: ratio ≥ 0.5).
 *
 * (c) runs the production build with its own storage and mail fakes, database and ports in a
 * temporary folder, removed afterwards (Ctrl+C included). The recording of (b) is kept in
 * .data/bench/ (git-ignored) so that later runs skip making it. It is a measurement, not a test:
 * it exits 0 when a goal is missed and non-zero only when it could not measure.
 *
 *   npm run bench:captions -- [--runs=300] [--seconds=8] [--only=a,b,c] [--build]
 *
 * `--runs` is the number of timed runs per figure in (a); `--seconds` the time per way in (c)
 * (split in two halves each); `--only` picks parts; `--build` rebuilds the app first, without it
 * an existing build/ is used as it is.
 */
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { Agent, request as httpRequest, type OutgoingHttpHeaders } from 'node:http';
import { loadavg } from 'node:os';
import { join } from 'node:path';
import { checkCues, profiles, type GuidelineProfile } from '../lib/captions/checks';
import type { Cue } from '../lib/captions/types';
import { parseVtt, serializeVtt, type VttParseResult } from '../lib/captions/vtt';
import { makeCueScript } from './bench/cues';
import {
	argValue,
	buildIfAsked,
	copyBuild,
	cpuSeconds,
	printTable,
	ROOT,
	runBench,
	runCommand,
	seedClinician,
	signIn,
	startApp,
	startFakes,
	startHelper,
	startRun,
	type BenchRun,
	type Row
} from './bench/stack';

const PORTS = { app: 4274, storage: 4770, smtp: 2727, mailApi: 2728 };
const STATIC_PORT = 4275;
const CUE_COUNT = 2000;
/** A cue every 3 s: 2,000 cues are a 100-minute narrated recording. */
const TRACK_SECONDS = CUE_COUNT * 3;
const FRAME_MS = 16;
const WARM_UP_RUNS = 50;
const CLIENTS = 50;
const RECORDING_SECONDS = 600;
const SECTION_SECONDS = 60;
/** Quiet before each new section, so the sound, the picture and the cues all mark it. */
const PAUSE_SECONDS = 2.5;
const MATCH_SECONDS = 1;

const notes: string[] = [];

async function main(): Promise<void> {
	const runs = Number(argValue('runs') ?? 300);
	const seconds = Number(argValue('seconds') ?? 8);
	const only = new Set((argValue('only') ?? 'a,b,c').split(','));
	if (!(Number.isInteger(runs) && runs >= 20)) throw new Error('--runs must be 20 or more.');
	if (!(seconds > 0)) throw new Error('--seconds must be a positive number.');
	if (![...only].every((p) => ['a', 'b', 'c'].includes(p))) {
		throw new Error('--only takes a comma-separated list of a, b and c.');
	}

	const run = await startRun('bench-captions', PORTS);
	const loadStart = loadavg()[0];
	await runBench(run, async () => {
		let buildCopy: string | undefined;
		if (only.has('c')) {
			await buildIfAsked(run);
			buildCopy = copyBuild(run);
		}
		const rows: Row[] = [];
		if (only.has('a')) rows.push(...benchChecks(runs));
		if (only.has('b')) rows.push(await benchSuggest(run));
		if (buildCopy) rows.push(...(await benchEndpoint(run, buildCopy, seconds)));
		printTable(
			`Kinelume captions benchmark (${CUE_COUNT.toLocaleString('en')}-cue track; ms = milliseconds)`,
			rows,
			notes,
			loadStart,
			{ measured: 'measured', reference: 'reference or context (same run)' }
		);
	});
}

/** Median and 95th percentile (nearest rank) of the samples. */
function spread(samples: number[]): { median: number; p95: number } {
	const sorted = [...samples].sort((a, b) => a - b);
	const rank = (p: number) => sorted[Math.min(sorted.length - 1, Math.ceil(p * sorted.length) - 1)];
	return { median: rank(0.5), p95: rank(0.95) };
}

const ms = (value: number) => `${value.toFixed(2)} ms`;

function benchChecks(runs: number): Row[] {
	const text = serializeVtt(makeCueScript(CUE_COUNT, TRACK_SECONDS).cues);
	const bytes = Buffer.byteLength(text);
	const parsed = parseVtt(text);
	if (!parsed.ok || parsed.cues.length !== CUE_COUNT) {
		throw new Error(`the generated track did not parse into ${CUE_COUNT} cues`);
	}
	const cues = parsed.cues;
	console.log(
		`(a) ${CUE_COUNT} cues (${(bytes / 1000).toFixed(0)} kB of WebVTT): ${WARM_UP_RUNS} warm-up and ${runs} timed runs each…`
	);

	const time = (work: () => unknown) => {
		const started = performance.now();
		work();
		return performance.now() - started;
	};
	const order = [profiles.bbc, profiles.dcmp];
	const samples = {
		parse: [] as number[],
		full: new Map<GuidelineProfile, number[]>(order.map((p) => [p, []])),
		edit: new Map<GuidelineProfile, number[]>(order.map((p) => [p, []]))
	};
	for (let i = 0; i < WARM_UP_RUNS + runs; i++) {
		const keep = i >= WARM_UP_RUNS;
		let fresh: VttParseResult = parsed;
		const parseMs = time(() => (fresh = parseVtt(text)));
		if (!fresh.ok) throw new Error('the track stopped parsing');
		const freshCues = fresh.cues;
		if (keep) samples.parse.push(parseMs);
		for (const profile of order) {
			// A full check of cues fresh from the parser, as when a track is opened.
			const fullMs = time(() => checkCues(freshCues, profile));
			if (keep) samples.full.get(profile)!.push(fullMs);

			// One keystroke: a new array in which one cue (a different one each run) has new text,
			// the rest the same objects, as the studio's state holds them.
			const at = (i * 7919) % cues.length;
			const edited: Cue[] = cues.slice();
			edited[at] = { ...cues[at], text: `${cues[at].text}${i % 2 ? ' again' : 's'}` };
			const editMs = time(() => checkCues(edited, profile));
			if (keep) samples.edit.get(profile)!.push(editMs);
		}
	}
	const findings = new Map(order.map((p) => [p, checkCues(cues, p)]));

	const parse = spread(samples.parse);
	const rows: Row[] = [
		{
			figure: `(a) parse ${CUE_COUNT.toLocaleString('en')}-cue WebVTT (parseVtt)`,
			measured: `median ${ms(parse.median)}, p95 ${ms(parse.p95)}`,
			reference: `${(bytes / 1000).toFixed(0)} kB, ${runs} runs`,
			result: `p95 ${ms(parse.p95)}`,
			goal: '— (context)',
			pass: null
		}
	];
	for (const [kind, label] of [
		['full', 'full check'],
		['edit', 're-check after one edit']
	] as const) {
		for (const profile of order) {
			const s = spread(samples[kind].get(profile)!);
			rows.push({
				figure: `(a) ${label}, ${profile.id.toUpperCase()} (checkCues)`,
				measured: `median ${ms(s.median)}, p95 ${ms(s.p95)}`,
				reference: `${findings.get(profile)!.length} findings, ${runs} runs`,
				result: `p95 ${ms(s.p95)}`,
				goal: kind === 'edit' ? `p95 < ${FRAME_MS} ms` : '— (context)',
				pass: kind === 'edit' ? s.p95 < FRAME_MS : null
			});
		}
	}
	notes.push(
		'(a) checkCues has no incremental path: a re-check after an edit is a full check of the edited array'
	);
	return rows;
}

/**
 * A 10-minute 1280×720@30 recording encoded as a web rendition is, in ten one-minute sections:
 * each has a test picture of its own (so each section starts with a scene cut) and a tone that
 * stops for 0.2 s every second, like speech, then for 2.5 s before the next section.
 */
async function ensureRecording(run: BenchRun): Promise<string> {
	const { ffmpegPath } = await import('../lib/server/media/ffmpeg');
	const { WEB_ENCODING_ARGS, WEB_MP4_MUX_ARGS } = await import('../lib/server/media/outputs');
	const pictures = ['testsrc2', 'smptehdbars', 'testsrc', 'rgbtestsrc', 'pal100bars'];
	const sections = RECORDING_SECONDS / SECTION_SECONDS;
	const speech = SECTION_SECONDS - PAUSE_SECONDS;
	const tone = `0.4*sin(2*PI*(300+25*floor(t/${SECTION_SECONDS}))*t)`;
	const sound = `if(lt(mod(t,${SECTION_SECONDS}),${speech})*lt(mod(t,1),0.8),${tone},0)`;
	const args = [
		'-hide_banner',
		'-loglevel',
		'error',
		'-y',
		...Array.from({ length: sections }, (_, i) => [
			'-f',
			'lavfi',
			'-i',
			`${pictures[i % pictures.length]}=size=1280x720:rate=30:duration=${SECTION_SECONDS}`
		]).flat(),
		'-f',
		'lavfi',
		'-i',
		`aevalsrc=exprs='${sound}':sample_rate=48000:duration=${RECORDING_SECONDS}`,
		'-filter_complex',
		`${Array.from({ length: sections }, (_, i) => `[${i}:v]`).join('')}concat=n=${sections}:v=1:a=0[v]`,
		'-map',
		'[v]',
		'-map',
		`${sections}:a`,
		...WEB_ENCODING_ARGS,
		'-ac',
		'2',
		...WEB_MP4_MUX_ARGS
	];
	// The name carries the recipe, so a changed recipe makes a new file instead of reusing one.
	const recipe = createHash('sha256').update(args.join('\n')).digest('hex').slice(0, 12);
	const folder = join(ROOT, '.data/bench');
	const path = join(folder, `recording-${RECORDING_SECONDS}s-720p-${recipe}.mp4`);
	if (existsSync(path)) return path;
	mkdirSync(folder, { recursive: true });
	const partial = `${path}.partial`;
	console.log(
		`(b) making the ${RECORDING_SECONDS / 60}-minute 720p recording once (kept in .data/bench/)…`
	);
	const started = performance.now();
	try {
		await runCommand(ffmpegPath(), [...args, partial], run.signal);
	} catch (error) {
		rmSync(partial, { force: true });
		throw error;
	}
	renameSync(partial, path);
	notes.push(`(b) made the recording in ${((performance.now() - started) / 1000).toFixed(0)} s`);
	return path;
}

async function benchSuggest(run: BenchRun): Promise<Row> {
	const path = await ensureRecording(run);
	const { probeFile } = await import('../lib/server/media/probe');
	const { suggestForRecording } = await import('../lib/server/segments/suggest');
	const probe = await probeFile(path);
	const script = makeCueScript(
		RECORDING_SECONDS / 3,
		RECORDING_SECONDS,
		RECORDING_SECONDS / SECTION_SECONDS
	);
	console.log(
		`(b) suggestForRecording on ${probe.durationSeconds.toFixed(0)} s of ${probe.video?.width}×${probe.video?.height} with ${script.cues.length} cues…`
	);
	const started = performance.now();
	const suggestions = await suggestForRecording(path, script.cues, probe.durationSeconds, {
		signal: run.signal
	});
	const elapsed = (performance.now() - started) / 1000;
	// A check that the figure is of real work: the known section starts should be found.
	const known = script.boundaries.filter((b) => b > 0);
	const found = known.filter((b) =>
		suggestions.some((s) => Math.abs(s.time - b) <= MATCH_SECONDS)
	).length;
	const speed = probe.durationSeconds / elapsed;
	notes.push(
		`(b) ${suggestions.length} suggestions; the two detectors run side by side at ffmpeg's lowered priority (nice 10)`
	);
	return {
		figure: `(b) segment suggestion, ${RECORDING_SECONDS / 60} min 720p`,
		measured: `${elapsed.toFixed(1)} s wall`,
		reference: `${probe.durationSeconds.toFixed(0)} s recording; ${found} of ${known.length} section starts found (±${MATCH_SECONDS} s)`,
		result: `${speed.toFixed(2)}× real time`,
		goal: '≥ 1.00×',
		pass: speed >= 1
	};
}

/** Seeds a ready recording with a captions track whose one version holds the generated cues. */
async function seedTrack(): Promise<{ trackId: string; body: string; etag: string }> {
	const { db, schema, closeDatabase } = await import('../lib/server/db');
	const captions = await import('../lib/server/captions');
	const { clinicId, userId } = await seedClinician();
	const recording = db()
		.insert(schema.recordings)
		.values({
			clinicId,
			uploadedBy: userId,
			title: 'Benchmark captions',
			originalFilename: 'bench.mp4',
			contentType: 'video/mp4',
			sizeBytes: 1,
			status: 'ready',
			durationSeconds: TRACK_SECONDS,
			width: 1280,
			height: 720,
			videoCodec: 'h264',
			audioCodec: 'aac',
			frameRate: 30,
			hasAudio: true,
			readyAt: new Date()
		})
		.returning()
		.get();
	const track = captions.createTrack(recording, { kind: 'captions', language: 'en-GB' });
	const saved = captions.saveVersion(track, {
		baseVersion: 0,
		cues: makeCueScript(CUE_COUNT, TRACK_SECONDS).cues,
		source: 'import',
		userId
	});
	if (!saved.ok) throw new Error('the benchmark track could not be saved');
	const exported = captions.exportTrack(captions.findTrack(clinicId, track.id)!, 'vtt')!;
	// The app opens the file itself; two writers are not wanted while it starts.
	closeDatabase();
	return { trackId: track.id, body: exported.body, etag: exported.etag };
}

interface Answer {
	status: number;
	bytes: number;
	headers: Record<string, string | string[] | undefined>;
	sha256?: string;
}

function get(
	agent: Agent,
	url: string,
	headers: OutgoingHttpHeaders,
	hash = false
): Promise<Answer> {
	return new Promise<Answer>((done, failed) => {
		const req = httpRequest(url, { agent, headers }, (res) => {
			let bytes = 0;
			const digest = hash ? createHash('sha256') : null;
			res.on('data', (chunk: Buffer) => {
				bytes += chunk.length;
				digest?.update(chunk);
			});
			res.once('end', () =>
				done({
					status: res.statusCode ?? 0,
					bytes,
					headers: res.headers,
					sha256: digest?.digest('hex')
				})
			);
			res.once('error', failed);
		});
		req.once('error', failed);
		req.end();
	});
}

interface Load {
	requests: number;
	seconds: number;
	latencies: number[];
}

/**
 * `clients` loops, each sending the next request as soon as its last one is answered, until
 * `seconds` have passed; requests under way then finish, and the time runs until the last has.
 */
async function hammer(
	clients: number,
	seconds: number,
	once: () => Promise<Answer>,
	expect: { status: number; bytes: number }
): Promise<Load> {
	const latencies: number[] = [];
	const started = performance.now();
	const deadline = started + seconds * 1000;
	await Promise.all(
		Array.from({ length: clients }, async () => {
			while (performance.now() < deadline) {
				const sent = performance.now();
				const answer = await once();
				if (answer.status !== expect.status || answer.bytes !== expect.bytes) {
					throw new Error(
						`expected ${expect.status} with ${expect.bytes} bytes, got ${answer.status} with ${answer.bytes}`
					);
				}
				latencies.push(performance.now() - sent);
			}
		})
	);
	return { requests: latencies.length, seconds: (performance.now() - started) / 1000, latencies };
}

/** The headers that describe the body, copied from the endpoint's answer for the reference. */
function describingHeaders(answer: Answer): Record<string, string> {
	const skip = new Set([
		'date',
		'connection',
		'keep-alive',
		'content-length',
		'transfer-encoding',
		'set-cookie'
	]);
	const out: Record<string, string> = {};
	for (const [name, value] of Object.entries(answer.headers)) {
		if (skip.has(name) || value === undefined) continue;
		// Node lower-cases names; the reference server looks the tag and type up by these.
		const key =
			name === 'etag'
				? 'ETag'
				: name === 'content-type'
					? 'Content-Type'
					: name.replace(/(^|-)[a-z]/g, (c) => c.toUpperCase());
		out[key] = Array.isArray(value) ? value.join(', ') : value;
	}
	return out;
}

async function benchEndpoint(run: BenchRun, buildCopy: string, seconds: number): Promise<Row[]> {
	console.log(`(c) data in ${run.dataDir}; starting the storage and mail fakes…`);
	await startFakes(run);
	console.log(`(c) seeding the demo clinic and a ${CUE_COUNT}-cue captions track…`);
	const seeded = await seedTrack();
	const expectedSha = createHash('sha256').update(seeded.body).digest('hex');
	const bytes = Buffer.byteLength(seeded.body);
	const file = join(run.dataDir, 'captions.vtt');
	writeFileSync(file, seeded.body);

	console.log('(c) starting the app (node build)…');
	const app = await startApp(run, buildCopy);
	const cookie = await signIn(run);
	const appUrl = `${run.appUrl}/api/tracks/${seeded.trackId}/captions.vtt`;
	const agents = { app: keepAlive(), static: keepAlive() };
	const appHeaders = { Cookie: cookie };

	// The endpoint must hand back the stored track before its speed means anything.
	const first = await get(agents.app, appUrl, appHeaders, true);
	if (first.status !== 200 || first.sha256 !== expectedSha) {
		throw new Error(`the endpoint answered ${first.status} with other bytes than the track's`);
	}
	if (first.headers.etag !== seeded.etag) throw new Error('the endpoint sent another ETag');
	const reference = await startHelper(
		run,
		'static-server.ts',
		[file, String(STATIC_PORT), JSON.stringify(describingHeaders(first))],
		'static'
	);
	const staticUrl = `http://127.0.0.1:${STATIC_PORT}/captions.vtt`;
	const check = await get(agents.static, staticUrl, {}, true);
	if (check.status !== 200 || check.sha256 !== expectedSha) {
		throw new Error(`the reference answered ${check.status} with other bytes than the track's`);
	}
	const revalidate = { 'If-None-Match': seeded.etag };
	for (const [name, agent, url, headers] of [
		['endpoint', agents.app, appUrl, { ...appHeaders, ...revalidate }],
		['reference', agents.static, staticUrl, revalidate]
	] as const) {
		const answer = await get(agent, url, headers);
		if (answer.status !== 304) throw new Error(`the ${name} answered ${answer.status}, not 304`);
	}

	const rows: Row[] = [];
	for (const path of ['200', '304'] as const) {
		const expect = { status: Number(path), bytes: path === '200' ? bytes : 0 };
		const ways = {
			app: () =>
				get(agents.app, appUrl, path === '200' ? appHeaders : { ...appHeaders, ...revalidate }),
			static: () => get(agents.static, staticUrl, path === '200' ? {} : revalidate)
		};
		console.log(`(c) ${path} answers, ${CLIENTS} clients, ${seconds} s each way…`);
		// Warm-up: the first requests pay for connections and the JIT.
		await hammer(CLIENTS, 1, ways.static, expect);
		await hammer(CLIENTS, 1, ways.app, expect);
		const loads = { app: [] as Load[], static: [] as Load[] };
		const cpu = { app: 0, static: 0, clients: 0 };
		// In the order reference, app, app, reference: load that comes and goes on a shared
		// machine then weighs on both alike instead of on whichever ran second.
		for (const way of ['static', 'app', 'app', 'static'] as const) {
			const server = way === 'app' ? app.child.pid! : reference.pid!;
			const before = { server: cpuSeconds(server), clients: selfCpu() };
			loads[way].push(
				await Promise.race([hammer(CLIENTS, seconds / 2, ways[way], expect), app.exited])
			);
			cpu[way] += cpuSeconds(server) - before.server;
			cpu.clients += selfCpu() - before.clients;
		}
		const total = (ls: Load[]) => ({
			requests: ls.reduce((t, l) => t + l.requests, 0),
			seconds: ls.reduce((t, l) => t + l.seconds, 0),
			latencies: ls.flatMap((l) => l.latencies)
		});
		const got = total(loads.app);
		const ref = total(loads.static);
		const gotRate = got.requests / got.seconds;
		const refRate = ref.requests / ref.seconds;
		const ratio = gotRate / refRate;
		const gotLatency = spread(got.latencies);
		const refLatency = spread(ref.latencies);
		notes.push(
			`(c) ${path}: latency median/p95 endpoint ${ms(gotLatency.median)}/${ms(gotLatency.p95)}, reference ${ms(refLatency.median)}/${ms(refLatency.p95)}; ` +
				`CPU per 1,000 requests: app ${((cpu.app / got.requests) * 1000).toFixed(2)} s, reference ${((cpu.static / ref.requests) * 1000).toFixed(2)} s; ` +
				`clients (this process) ${((cpu.clients / (got.seconds + ref.seconds)) * 100).toFixed(0)}% of one core`
		);
		rows.push({
			figure:
				path === '200'
					? `(c) captions.vtt 200, ${CLIENTS} clients`
					: `(c) captions.vtt 304 (If-None-Match), ${CLIENTS} clients`,
			measured: `${gotRate.toFixed(0)} req/s (${got.requests} req)`,
			reference: `${refRate.toFixed(0)} req/s static (${ref.requests} req)`,
			result: `ratio ${ratio.toFixed(2)}`,
			goal: '≥ 0.50',
			pass: ratio >= 0.5
		});
	}
	notes.push(
		`(c) ${(bytes / 1000).toFixed(0)} kB per 200; the reference is node:http in its own process, reading the file per request with the endpoint's headers`
	);
	agents.app.destroy();
	agents.static.destroy();
	return rows;
}

function keepAlive(): Agent {
	return new Agent({ keepAlive: true, maxSockets: CLIENTS });
}

function selfCpu(): number {
	const u = process.cpuUsage();
	return (u.user + u.system) / 1e6;
}

await main();
