/**
 * `npm run bench:media`: measures the media path against references taken in the same run.
 *
 *   (a) byte-range throughput of the app's media endpoint — a request the app authorises and
 *       answers with a redirect to a presigned storage address, which the client then reads,
 *       as a browser does — vs the same client reading a presigned address of the same object
 *       straight from storage, at 1 and 32 concurrent clients (goal: ratio ≥ 0.9);
 *   (b) web rendition encoding speed of a generated 720p clip as a multiple of its own
 *       duration (goal ≥ 3×);
 *   (c) upload throughput through presigned multipart parts vs one PutObject of the same bytes
 *       (goal: ratio ≥ 0.8);
 *   (d) the app's peak resident memory while serving (a) (goal < 200 MB, whatever the number of
 *       viewers: the bytes no longer pass through it).
 *
 * It runs its own storage and mail fakes, database and production server on ports of its own in
 * a temporary folder, and removes all of it afterwards (Ctrl+C included). It is a measurement,
 * not a test: it exits 0 when a goal is missed and non-zero only when it could not measure.
 *
 *   npm run bench:media -- [--seconds=8] [--range-mib=8] [--only=a,b,c] [--build]
 *
 * `--seconds` is the time per way and client count in (a); `--range-mib` the size of each range
 * (a player asks for far smaller ones; large ones measure streaming rather than request cost).
 * `--build` rebuilds the app first; without it an existing build/ is used as it is.
 */
import { createHash, randomFillSync } from 'node:crypto';
import { createReadStream, createWriteStream, readFileSync } from 'node:fs';
import { rm } from 'node:fs/promises';
import { Agent, request as httpRequest, type IncomingMessage } from 'node:http';
import { loadavg } from 'node:os';
import { join } from 'node:path';
import type { Readable } from 'node:stream';
import {
	argValue,
	buildIfAsked,
	copyBuild,
	cpuSeconds,
	printTable,
	runBench,
	runCommand,
	seedClinician,
	signIn,
	startApp,
	startFakes,
	startRun,
	stopChild,
	type BenchRun,
	type Row
} from './bench/stack';

const PORTS = { app: 4273, storage: 4769, smtp: 2725, mailApi: 2726 };
const MB = 1_000_000;
const MIB = 1024 * 1024;

const OBJECT_BYTES = 100 * MIB;
const RANGE_BYTES = Math.floor(Number(argValue('range-mib') ?? 8) * MIB);
const CONCURRENCIES = [1, 32];
const UPLOAD_BYTES = 64 * MIB;
const UPLOAD_ROUNDS = 3;
const UPLOAD_PARALLEL = 3;
const CLIP_SECONDS = 20;

async function main(): Promise<void> {
	const only = new Set((argValue('only') ?? 'a,b,c').split(','));
	const seconds = Number(argValue('seconds') ?? 8);
	if (!(seconds > 0)) throw new Error('--seconds must be a positive number.');
	if (!(RANGE_BYTES >= 1 && RANGE_BYTES <= OBJECT_BYTES / 2)) {
		throw new Error('--range-mib must be more than 0 and at most half the 100 MiB object.');
	}

	const run = await startRun('bench', PORTS);
	const loadStart = loadavg()[0];
	await runBench(run, async () => {
		await buildIfAsked(run);
		const buildCopy = copyBuild(run);

		console.log(`Data in ${run.dataDir}; starting the storage and mail fakes…`);
		const fakes = await startFakes(run);

		const rows: Row[] = [];
		const storageModule = await import('../lib/server/storage');
		console.log('Seeding the demo clinic and storing a 100 MiB object…');
		const { clinicId, recordingId } = await seedRecording();
		const s3 = await prepareRangeObject(storageModule, clinicId, recordingId);
		console.log('Starting the app (node build)…');
		const app = await startApp(run, buildCopy);
		const idleRss = readStatus(app.child.pid!).rss;
		const cookie = await signIn(run);

		if (only.has('a'))
			rows.push(
				...(await Promise.race([
					benchRanges({
						run,
						key: s3.key,
						recordingId,
						cookie,
						appPid: app.child.pid!,
						fakesPid: fakes.pid!,
						idleRss,
						seconds,
						sha256First: s3.sha256First
					}),
					app.exited
				]))
			);
		// (b) and (c) do not involve the app; stopping it gives them the whole machine.
		await stopChild(app.child);

		if (only.has('b')) rows.push(await benchRendition(run.dataDir, run.signal));
		if (only.has('c')) rows.push(...(await benchUpload(storageModule)));

		printTable(
			`Kinelume media benchmark (MB = 10^6 bytes; ranges of ${RANGE_BYTES / MIB} MiB over a 100 MiB object)`,
			rows,
			notes,
			loadStart
		);
	});
}

type StorageModule = typeof import('../lib/server/storage');

/** A ~100 MB object at the recording's rendition key, written from a file so nothing is buffered. */
async function prepareRangeObject(
	storageModule: StorageModule,
	clinicId: string,
	recordingId: string
): Promise<{ key: string; sha256First: string }> {
	const { recordingKeys } = await import('../lib/server/storage/keys');
	const key = recordingKeys(clinicId, recordingId).rendition;
	const path = join(process.env.MEDIA_WORK_DIR!, '..', 'range-object.bin');
	await writeRandomFile(path, OBJECT_BYTES);
	await storageModule.putObject(key, createReadStream(path), 'video/mp4', OBJECT_BYTES);
	const hash = createHash('sha256');
	await drain(createReadStream(path, { end: RANGE_BYTES - 1 }), hash);
	await rm(path);
	return { key, sha256First: hash.digest('hex') };
}

async function writeRandomFile(path: string, size: number): Promise<void> {
	const out = createWriteStream(path);
	const chunk = Buffer.alloc(MIB);
	for (let written = 0; written < size; written += chunk.length) {
		// Random bytes: nothing on the way can make the transfer cheaper by compressing it. Each
		// write gets a copy, as the chunk is refilled while earlier writes may still be queued.
		randomFillSync(chunk);
		if (!out.write(Buffer.from(chunk.subarray(0, Math.min(chunk.length, size - written))))) {
			await new Promise<void>((r) => out.once('drain', () => r()));
		}
	}
	await new Promise<void>((done, failed) => {
		out.once('error', failed);
		out.end(() => done());
	});
}

/** Seeds the demo scenario and adds a ready recording to the demo clinician's clinic. */
async function seedRecording(): Promise<{ clinicId: string; recordingId: string }> {
	const { db, schema, closeDatabase } = await import('../lib/server/db');
	const { clinicId, userId } = await seedClinician();
	const recording = db()
		.insert(schema.recordings)
		.values({
			clinicId,
			uploadedBy: userId,
			title: 'Benchmark object',
			originalFilename: 'bench.mp4',
			contentType: 'video/mp4',
			sizeBytes: OBJECT_BYTES,
			status: 'ready',
			durationSeconds: 600,
			width: 1280,
			height: 720,
			videoCodec: 'h264',
			audioCodec: 'aac',
			frameRate: 30,
			hasAudio: true,
			renditionSize: OBJECT_BYTES,
			readyAt: new Date()
		})
		.returning()
		.get();
	// The app opens the file itself; two writers are not wanted while it starts.
	closeDatabase();
	return { clinicId, recordingId: recording.id };
}

interface RunResult {
	bytes: number;
	seconds: number;
	requests: number;
}

/**
 * `clients` loops, each taking the next of a fixed set of ranges spread over the object, until
 * `seconds` have passed; requests under way then finish, and the elapsed time runs until the
 * last has. Every response must be a 206 of exactly the range's length.
 */
async function runClients(
	clients: number,
	seconds: number,
	objectBytes: number,
	fetchRange: (start: number, end: number) => Promise<number>
): Promise<RunResult> {
	const slots = 16;
	const stride = Math.floor((objectBytes - RANGE_BYTES) / (slots - 1));
	let next = 0;
	let bytes = 0;
	let requests = 0;
	const started = performance.now();
	const deadline = started + seconds * 1000;
	await Promise.all(
		Array.from({ length: clients }, async () => {
			while (performance.now() < deadline) {
				const start = (next++ % slots) * stride;
				const end = start + RANGE_BYTES - 1;
				const got = await fetchRange(start, end);
				if (got !== RANGE_BYTES) throw new Error(`range ${start}-${end} gave ${got} bytes`);
				bytes += got;
				requests++;
			}
		})
	);
	return { bytes, requests, seconds: (performance.now() - started) / 1000 };
}

async function drain(body: Readable, hash?: ReturnType<typeof createHash>): Promise<number> {
	let n = 0;
	for await (const chunk of body as AsyncIterable<Buffer>) {
		n += chunk.length;
		hash?.update(chunk);
	}
	return n;
}

function readStatus(pid: number): { rss: number; hwm: number } {
	const text = readFileSync(`/proc/${pid}/status`, 'utf8');
	const kb = (field: string) => Number(new RegExp(`^${field}:\\s+(\\d+) kB`, 'm').exec(text)?.[1]);
	return { rss: kb('VmRSS') * 1024, hwm: kb('VmHWM') * 1024 };
}

interface CpuUse {
	app: number;
	storage: number;
	clients: number;
}

/** Runs `work` and reports the CPU seconds each process spent on it. */
async function measureCpu<T>(
	pids: { app: number; fakes: number },
	work: () => Promise<T>
): Promise<[T, CpuUse]> {
	const self = () => {
		const u = process.cpuUsage();
		return (u.user + u.system) / 1e6;
	};
	const before = { app: cpuSeconds(pids.app), storage: cpuSeconds(pids.fakes), clients: self() };
	const result = await work();
	return [
		result,
		{
			app: cpuSeconds(pids.app) - before.app,
			storage: cpuSeconds(pids.fakes) - before.storage,
			clients: self() - before.clients
		}
	];
}

const notes: string[] = [];

function combine(runs: [RunResult, CpuUse][]): [RunResult, CpuUse] {
	const sum = (pick: (r: [RunResult, CpuUse]) => number) => runs.reduce((t, r) => t + pick(r), 0);
	return [
		{
			bytes: sum(([r]) => r.bytes),
			seconds: sum(([r]) => r.seconds),
			requests: sum(([r]) => r.requests)
		},
		{
			app: sum(([, c]) => c.app),
			storage: sum(([, c]) => c.storage),
			clients: sum(([, c]) => c.clients)
		}
	];
}

async function benchRanges({
	run,
	key,
	recordingId,
	cookie,
	appPid,
	fakesPid,
	idleRss,
	seconds,
	sha256First
}: {
	run: BenchRun;
	key: string;
	recordingId: string;
	cookie: string;
	appPid: number;
	fakesPid: number;
	idleRss: number;
	seconds: number;
	sha256First: string;
}): Promise<Row[]> {
	const { presignMediaUrl } = await import('../lib/server/storage/media-urls');
	// Both ways use Node's own HTTP client with keep-alive and room for every client, so the
	// comparison is between paths, not between client libraries or connection limits.
	const agent = () => new Agent({ keepAlive: true, maxSockets: 64 });
	const storageAgent = agent();
	const appAgent = agent();
	const path = `/api/recordings/${recordingId}/media/rendition.mp4`;
	// The reference: a browser that already holds a storage address reads it directly.
	const { url: presigned } = await presignMediaUrl(key, {
		contentType: 'video/mp4',
		audience: 'private',
		lifetimeSeconds: 3600
	});

	const hops: number[] = [];
	const get = (
		url: string,
		headers: Record<string, string>,
		onResponse: (res: IncomingMessage) => void,
		failed: (error: Error) => void
	) => {
		const req = httpRequest(
			url,
			{ agent: url.startsWith(run.appUrl) ? appAgent : storageAgent, headers },
			onResponse
		);
		req.on('error', failed);
		req.end();
	};
	/** A ranged read of a storage address: exactly the range, with a 206. */
	const readStorage = (
		url: string,
		start: number,
		end: number,
		hash?: ReturnType<typeof createHash>
	) =>
		new Promise<number>((done, failed) => {
			get(
				url,
				{ Range: `bytes=${start}-${end}` },
				(res) => {
					if (res.statusCode !== 206) {
						res.resume();
						failed(new Error(`storage answered ${res.statusCode}, not 206`));
						return;
					}
					drain(res, hash).then(done, failed);
				},
				failed
			);
		});
	const direct = (start: number, end: number, hash?: ReturnType<typeof createHash>) =>
		readStorage(presigned, start, end, hash);
	const viaApp = (start: number, end: number, hash?: ReturnType<typeof createHash>) =>
		new Promise<string>((done, failed) => {
			const asked = performance.now();
			get(
				`${run.appUrl}${path}`,
				{ Cookie: cookie, Range: `bytes=${start}-${end}` },
				(res) => {
					res.resume();
					const location = res.headers.location;
					if (res.statusCode !== 307 || !location) {
						failed(new Error(`the media endpoint answered ${res.statusCode}, not 307`));
						return;
					}
					hops.push(performance.now() - asked);
					done(location);
				},
				failed
			);
		}).then((location) => readStorage(location, start, end, hash));

	// Both paths must hand back the stored bytes before their speed means anything.
	for (const [name, read] of [
		['storage', direct],
		['the app’s redirect', viaApp]
	] as const) {
		const hash = createHash('sha256');
		await read(0, RANGE_BYTES - 1, hash);
		if (hash.digest('hex') !== sha256First) {
			throw new Error(
				`the first ${RANGE_BYTES} bytes read through ${name} differ from the stored ones`
			);
		}
	}
	// Warm-up: first requests pay for connections, JIT and the page cache.
	await runClients(4, 1, OBJECT_BYTES, direct);
	await runClients(4, 1, OBJECT_BYTES, viaApp);

	let peakRss = readStatus(appPid).rss;
	const sampler = setInterval(() => {
		try {
			peakRss = Math.max(peakRss, readStatus(appPid).rss);
		} catch {
			// the process is gone; its exit is reported elsewhere
		}
	}, 50);

	const rows: Row[] = [];
	try {
		for (const clients of CONCURRENCIES) {
			console.log(`(a) ${RANGE_BYTES / MIB} MiB ranges, ${clients} client(s), ${seconds} s each…`);
			const pids = { app: appPid, fakes: fakesPid };
			// Two halves each, in the order direct, app, app, direct: load that comes and goes on a
			// shared machine then weighs on both ways alike instead of on whichever ran second.
			const runs = { direct: [] as [RunResult, CpuUse][], app: [] as [RunResult, CpuUse][] };
			for (const way of ['direct', 'app', 'app', 'direct'] as const) {
				runs[way].push(
					await measureCpu(pids, () =>
						runClients(clients, seconds / 2, OBJECT_BYTES, way === 'direct' ? direct : viaApp)
					)
				);
			}
			const [ref, refCpu] = combine(runs.direct);
			const [got, gotCpu] = combine(runs.app);
			// CPU per GB moved shows where the time goes once the two cores are the limit.
			const perGb = (cpu: CpuUse, run: RunResult) => {
				const gb = run.bytes / 1e9;
				const busy = (cpu.app + cpu.storage + cpu.clients) / run.seconds;
				return `app ${(cpu.app / gb).toFixed(2)}, storage ${(cpu.storage / gb).toFixed(2)}, clients ${(cpu.clients / gb).toFixed(2)} CPU s/GB; ${busy.toFixed(2)} of 2 cores busy`;
			};
			notes.push(
				`(a) ${clients} client(s), direct: ${perGb(refCpu, ref)}`,
				`(a) ${clients} client(s), via app: ${perGb(gotCpu, got)}; app VmRSS max so far ${(peakRss / MB).toFixed(0)} MB`
			);
			const refRate = ref.bytes / ref.seconds / MB;
			const gotRate = got.bytes / got.seconds / MB;
			const ratio = gotRate / refRate;
			rows.push({
				figure: `(a) byte ranges via redirect, ${clients} client${clients === 1 ? '' : 's'}`,
				measured: `${gotRate.toFixed(0)} MB/s (${got.requests} req)`,
				reference: `${refRate.toFixed(0)} MB/s (${ref.requests} req) direct`,
				result: `ratio ${ratio.toFixed(2)}`,
				goal: '≥ 0.90',
				pass: ratio >= 0.9
			});
		}
	} finally {
		clearInterval(sampler);
	}
	const after = readStatus(appPid);
	peakRss = Math.max(peakRss, after.rss);
	appAgent.destroy();
	storageAgent.destroy();
	const sorted = [...hops].sort((x, y) => x - y);
	const at = (q: number) => sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))];
	notes.push(
		`(a) every read through the app was authorised and redirected: ${hops.length} redirects (307) followed; ` +
			`the app's answer took ${at(0.5).toFixed(1)} ms median, ${at(0.95).toFixed(1)} ms p95 (a player pays it once per seek, not per range)`
	);
	rows.push({
		figure: '(d) app peak memory during (a)',
		measured: `VmHWM ${(after.hwm / MB).toFixed(0)} MB (${(after.hwm / MIB).toFixed(0)} MiB)`,
		reference: `VmRSS ${(idleRss / MB).toFixed(0)} MB idle, max ${(peakRss / MB).toFixed(0)} MB in (a)`,
		result: `${(after.hwm / MB).toFixed(0)} MB`,
		goal: '< 200 MB',
		pass: after.hwm < 200 * MB
	});
	return rows;
}

async function benchRendition(dataDir: string, signal: AbortSignal): Promise<Row> {
	const { ffmpegPath } = await import('../lib/server/media/ffmpeg');
	const { makeRendition } = await import('../lib/server/media/outputs');
	const { probeFile } = await import('../lib/server/media/probe');
	const source = join(dataDir, 'clip-720p.mp4');
	const output = join(dataDir, 'clip-rendition.mp4');
	console.log(`(b) generating a ${CLIP_SECONDS} s 1280×720@30 clip…`);
	// A camera-like source: H.264 at a high bitrate with AAC sound, as a phone would record it.
	const args = [
		'-hide_banner',
		'-loglevel',
		'error',
		'-y',
		'-f',
		'lavfi',
		'-i',
		`testsrc2=size=1280x720:rate=30:duration=${CLIP_SECONDS}`,
		'-f',
		'lavfi',
		'-i',
		`sine=frequency=440:sample_rate=48000:duration=${CLIP_SECONDS}`,
		'-c:v',
		'libx264',
		'-preset',
		'ultrafast',
		'-crf',
		'18',
		'-pix_fmt',
		'yuv420p',
		'-c:a',
		'aac',
		'-b:a',
		'192k',
		'-shortest',
		source
	];
	await runCommand(ffmpegPath(), args, signal);
	const probe = await probeFile(source);
	console.log('(b) encoding the web rendition with makeRendition…');
	const started = performance.now();
	// As the job runs it: the probe's frame rate is passed, so no second probe is timed.
	await makeRendition(source, output, {
		durationSeconds: probe.durationSeconds,
		frameRate: probe.video?.frameRate,
		signal
	});
	const elapsed = (performance.now() - started) / 1000;
	const rendition = await probeFile(output);
	const speed = probe.durationSeconds / elapsed;
	await rm(source, { force: true });
	await rm(output, { force: true });
	return {
		figure: '(b) 720p rendition encoding',
		measured: `${elapsed.toFixed(1)} s wall`,
		reference: `${probe.durationSeconds.toFixed(1)} s clip → ${rendition.durationSeconds.toFixed(1)} s`,
		result: `${speed.toFixed(2)}× real time`,
		goal: '≥ 3.00×',
		pass: speed >= 3
	};
}

async function benchUpload(storageModule: StorageModule): Promise<Row[]> {
	const multipart = await import('../lib/server/storage/multipart');
	// Random bytes made once and shared by both ways, so both send exactly the same thing.
	const bytes = randomFillSync(Buffer.alloc(UPLOAD_BYTES));
	const sha256 = createHash('sha256').update(bytes).digest('hex');
	const partSize = multipart.choosePartSize(bytes.length);
	const parts = multipart.partCount(bytes.length, partSize);

	async function verify(key: string) {
		const object = await storageModule.getObjectStream(key);
		if (!object) throw new Error(`${key} is missing after its upload`);
		const hash = createHash('sha256');
		const size = await drain(object.body, hash);
		if (size !== bytes.length || hash.digest('hex') !== sha256) {
			throw new Error(`${key} does not hold the uploaded bytes (${size} bytes read back)`);
		}
	}

	const completeTimes: number[] = [];
	async function viaParts(key: string): Promise<number> {
		const started = performance.now();
		const uploadId = await multipart.createMultipartUpload(key, 'video/mp4');
		const stored: { partNumber: number; etag: string; size: number }[] = [];
		let next = 1;
		await Promise.all(
			Array.from({ length: UPLOAD_PARALLEL }, async () => {
				while (next <= parts) {
					const partNumber = next++;
					const body = bytes.subarray((partNumber - 1) * partSize, partNumber * partSize);
					const url = await multipart.presignPart(key, uploadId, partNumber, body.length);
					const res = await fetch(url, { method: 'PUT', body });
					const etag = res.headers.get('etag');
					await res.arrayBuffer();
					if (!res.ok || !etag) throw new Error(`part ${partNumber}: HTTP ${res.status}`);
					stored.push({ partNumber, etag, size: body.length });
				}
			})
		);
		stored.sort((a, b) => a.partNumber - b.partNumber);
		const completing = performance.now();
		await multipart.completeMultipartUpload(key, uploadId, stored);
		completeTimes.push((performance.now() - completing) / 1000);
		return (performance.now() - started) / 1000;
	}

	async function viaPut(key: string): Promise<number> {
		const started = performance.now();
		await storageModule.putObject(key, bytes, 'video/mp4');
		return (performance.now() - started) / 1000;
	}

	const partTimes: number[] = [];
	const putTimes: number[] = [];
	for (let round = 1; round <= UPLOAD_ROUNDS; round++) {
		console.log(`(c) ${UPLOAD_BYTES / MIB} MiB upload, round ${round} of ${UPLOAD_ROUNDS}…`);
		// Alternating which goes first keeps a warming disk cache from favouring one way.
		const order = round % 2 ? (['parts', 'put'] as const) : (['put', 'parts'] as const);
		for (const way of order) {
			const key = `bench/upload-${way}-${round}`;
			if (way === 'parts') partTimes.push(await viaParts(key));
			else putTimes.push(await viaPut(key));
			if (round === 1) await verify(key);
			await storageModule.deleteObject(key);
		}
	}
	const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
	const partRate = bytes.length / median(partTimes) / MB;
	const putRate = bytes.length / median(putTimes) / MB;
	const ratio = partRate / putRate;
	const completeShare = median(completeTimes) / median(partTimes);
	// Completing is storage's own work (the local fake copies every part into a new file and
	// hashes it); the parts alone show what the presigned path itself costs.
	const sendingRatio = median(putTimes) / (median(partTimes) - median(completeTimes));
	notes.push(
		`(c) parts ${partTimes.map((t) => t.toFixed(2)).join('/')} s, of which completing ` +
			`${completeTimes.map((t) => t.toFixed(2)).join('/')} s (${(completeShare * 100).toFixed(0)}% of the median); ` +
			`PutObject ${putTimes.map((t) => t.toFixed(2)).join('/')} s; ` +
			`sending the parts alone vs PutObject: ratio ${sendingRatio.toFixed(2)}`
	);
	return [
		{
			figure: `(c) upload, ${parts} presigned parts ×${UPLOAD_PARALLEL}`,
			measured: `${partRate.toFixed(0)} MB/s`,
			reference: `${putRate.toFixed(0)} MB/s PutObject`,
			result: `ratio ${ratio.toFixed(2)}`,
			goal: '≥ 0.80',
			pass: ratio >= 0.8
		}
	];
}

await main();
