import { spawn } from 'node:child_process';
import { accessSync, constants } from 'node:fs';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import { createRequire } from 'node:module';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Readable } from 'node:stream';
import { chooseTool } from '../../src/lib/server/media/tools';

/*
 * A stand-in for a speech-to-text server that offers the OpenAI-compatible audio transcription
 * endpoint (POST /v1/audio/transcriptions, multipart), which self-hosted speech engines offer
 * too. It recognises no words: it finds where the uploaded audio has sound (ffmpeg's
 * silencedetect on the file itself) and answers one segment per stretch of sound, whose text
 * says it is a placeholder. Every answer also carries `stand_in`, a sentence saying so.
 */

export const PLACEHOLDER_WORDS = '[placeholder words: no speech recognition in the local stand-in]';
export const STAND_IN_NOTE =
	'This is the local stand-in: it finds where the audio has sound but recognises no words, so every segment’s text is a placeholder.';

/** What counts as quiet here: below -40 dBFS for at least 0.3 s (our choice, a pause in speech). */
const NOISE_DB = -40;
const MIN_PAUSE_SECONDS = 0.3;
/** The documented upload limit of the hosted OpenAI endpoint, kept so the app meets it here too. */
const MAX_UPLOAD_BYTES = 25 * 1024 * 1024;

export interface SpeechFakeOptions {
	host?: string;
	port: number;
	/** When set, requests must carry `Authorization: Bearer <apiKey>`; otherwise any key is taken. */
	apiKey?: string;
	/** Defaults to the app's choice: FFMPEG_PATH, Debian's /usr/bin/ffmpeg, the npm package's. */
	ffmpegPath?: string;
}

export interface SpeechFake {
	/** The base URL an OpenAI client takes, ending in /v1. */
	url: string;
	close(): Promise<void>;
}

interface Span {
	start: number;
	end: number;
}

class RequestError extends Error {
	constructor(
		readonly status: number,
		message: string,
		readonly param: string | null = null,
		readonly type = 'invalid_request_error'
	) {
		super(message);
	}
}

function sendJson(res: ServerResponse, status: number, body: unknown) {
	const text = JSON.stringify(body);
	res.writeHead(status, {
		'Content-Type': 'application/json; charset=utf-8',
		'Content-Length': Buffer.byteLength(text),
		'Cache-Control': 'no-store'
	});
	res.end(text);
}

function sendError(res: ServerResponse, error: RequestError) {
	// The error shape of the OpenAI API, which its SDK reads into APIError.message.
	sendJson(res, error.status, {
		error: { message: error.message, type: error.type, param: error.param, code: null }
	});
}

const require = createRequire(import.meta.url);

function defaultFfmpeg(): string {
	return chooseTool('ffmpeg', {
		setting: process.env.FFMPEG_PATH,
		isExecutable: (path) => {
			try {
				accessSync(path, constants.X_OK);
				return true;
			} catch {
				return false;
			}
		},
		bundled: () => (require('@ffmpeg-installer/ffmpeg') as { path: string }).path
	}).path;
}

/** Runs ffmpeg's silencedetect over `file`; returns its silences and the decoded duration. */
function findSilences(
	ffmpeg: string,
	file: string
): Promise<{ silences: Span[]; duration: number }> {
	return new Promise((resolve, reject) => {
		const child = spawn(
			ffmpeg,
			[
				'-hide_banner',
				'-nostdin',
				'-nostats',
				'-loglevel',
				'info',
				'-protocol_whitelist',
				'file,pipe',
				'-i',
				file,
				'-vn',
				'-sn',
				'-dn',
				'-af',
				`silencedetect=noise=${NOISE_DB}dB:d=${MIN_PAUSE_SECONDS}`,
				'-progress',
				'pipe:1',
				'-f',
				'null',
				'-'
			],
			{ stdio: ['ignore', 'pipe', 'pipe'] }
		);
		let stdout = '';
		let stderr = '';
		child.stdout.on('data', (chunk: Buffer) => (stdout += chunk.toString('utf8')));
		child.stderr.on('data', (chunk: Buffer) => (stderr += chunk.toString('utf8')));
		const timer = setTimeout(() => child.kill('SIGKILL'), 120_000);
		child.on('error', (error) => {
			clearTimeout(timer);
			reject(
				new RequestError(500, `ffmpeg could not be started: ${error.message}`, null, 'server_error')
			);
		});
		child.on('close', (code) => {
			clearTimeout(timer);
			if (code !== 0) {
				const last = stderr.trim().split('\n').slice(-2).join(' ');
				return reject(
					new RequestError(400, `The audio file could not be decoded (${last}).`, 'file')
				);
			}
			// The last progress report says how much audio was decoded; the header is the fallback.
			const outTimes = [...stdout.matchAll(/out_time_(?:us|ms)=(\d+)/g)].map((m) => Number(m[1]));
			const header = /Duration: (\d+):(\d{2}):(\d{2}(?:\.\d+)?)/.exec(stderr);
			const duration =
				outTimes.length > 0
					? outTimes[outTimes.length - 1] / 1e6
					: header
						? Number(header[1]) * 3600 + Number(header[2]) * 60 + Number(header[3])
						: 0;
			const silences: Span[] = [];
			let open: number | null = null;
			for (const line of stderr.split('\n')) {
				const start = /silence_start: (-?[\d.]+)/.exec(line);
				const end = /silence_end: (-?[\d.]+)/.exec(line);
				if (end && open !== null) {
					silences.push({ start: open, end: Math.max(open, Number(end[1])) });
					open = null;
				}
				if (start) open = Math.max(0, Number(start[1]));
			}
			// Some ffmpeg builds never close a silence that lasts until the sound stops.
			if (open !== null && duration > open) silences.push({ start: open, end: duration });
			resolve({ silences, duration });
		});
	});
}

/** The stretches of the audio outside every silence, at least 0.1 s long. */
function soundBetween(silences: readonly Span[], duration: number): Span[] {
	const out: Span[] = [];
	let from = 0;
	for (const silence of [...silences].sort((a, b) => a.start - b.start)) {
		if (silence.start - from >= 0.1) out.push({ start: from, end: silence.start });
		from = Math.max(from, silence.end);
	}
	if (duration - from >= 0.1) out.push({ start: from, end: duration });
	return out;
}

const round = (n: number) => Math.round(n * 1000) / 1000;

async function readForm(req: IncomingMessage): Promise<FormData> {
	const type = req.headers['content-type'] ?? '';
	if (!type.startsWith('multipart/form-data')) {
		throw new RequestError(400, 'Send the audio as multipart/form-data with a "file" field.');
	}
	const declared = Number(req.headers['content-length'] ?? 0);
	if (declared > MAX_UPLOAD_BYTES) {
		throw new RequestError(413, 'The audio file is larger than 25 MB.', 'file');
	}
	let received = 0;
	const limited = Readable.from(
		(async function* () {
			for await (const chunk of req as AsyncIterable<Buffer>) {
				received += chunk.length;
				if (received > MAX_UPLOAD_BYTES) {
					throw new RequestError(413, 'The audio file is larger than 25 MB.', 'file');
				}
				yield chunk;
			}
		})()
	);
	// Node's own fetch Request parses multipart bodies: no form library needed for a fake.
	const request = new Request('http://speech.invalid/', {
		method: 'POST',
		headers: { 'content-type': type },
		body: Readable.toWeb(limited) as ReadableStream,
		duplex: 'half'
	} as RequestInit);
	try {
		return await request.formData();
	} catch (error) {
		if (error instanceof RequestError) throw error;
		if (received > MAX_UPLOAD_BYTES) {
			throw new RequestError(413, 'The audio file is larger than 25 MB.', 'file');
		}
		throw new RequestError(400, 'The multipart body could not be read.');
	}
}

async function transcribe(ffmpeg: string, req: IncomingMessage, res: ServerResponse) {
	const form = await readForm(req);
	const file = form.get('file');
	if (!(file instanceof Blob) || file.size === 0) {
		throw new RequestError(400, 'The request has no audio in its "file" field.', 'file');
	}
	const model = form.get('model');
	if (typeof model !== 'string' || model.trim() === '') {
		throw new RequestError(400, 'The request names no model.', 'model');
	}
	const format = String(form.get('response_format') ?? 'json');
	if (!['json', 'text', 'verbose_json'].includes(format)) {
		throw new RequestError(
			400,
			`The local stand-in answers json, text and verbose_json, not ${format}.`,
			'response_format'
		);
	}
	const language = String(form.get('language') ?? '') || 'en';

	const dir = await mkdtemp(join(tmpdir(), 'kinelume-speech-fake-'));
	try {
		const path = join(dir, 'upload');
		await writeFile(path, Buffer.from(await file.arrayBuffer()));
		const { silences, duration } = await findSilences(ffmpeg, path);
		const sound = soundBetween(silences, duration);
		const segments = sound.map((span, id) => ({
			id,
			seek: 0,
			start: round(span.start),
			end: round(span.end),
			text: ` ${PLACEHOLDER_WORDS}`,
			tokens: [],
			temperature: 0,
			avg_logprob: 0,
			compression_ratio: 0,
			no_speech_prob: 0
		}));
		const text = segments.map((s) => s.text.trim()).join(' ');
		if (format === 'text') {
			res.writeHead(200, {
				'Content-Type': 'text/plain; charset=utf-8',
				'Cache-Control': 'no-store'
			});
			res.end(text);
			return;
		}
		if (format === 'json') return sendJson(res, 200, { text, stand_in: STAND_IN_NOTE });
		return sendJson(res, 200, {
			task: 'transcribe',
			language,
			duration: round(duration),
			text,
			segments,
			stand_in: STAND_IN_NOTE
		});
	} finally {
		await rm(dir, { recursive: true, force: true });
	}
}

async function handle(
	opts: SpeechFakeOptions,
	ffmpeg: string,
	req: IncomingMessage,
	res: ServerResponse
) {
	const path = new URL(req.url ?? '/', 'http://speech.invalid').pathname;
	if (path !== '/v1/audio/transcriptions') {
		req.resume();
		throw new RequestError(
			404,
			`The local stand-in offers only POST /v1/audio/transcriptions, not ${path}.`,
			null,
			'not_found'
		);
	}
	if (req.method !== 'POST') {
		req.resume();
		throw new RequestError(405, 'Use POST.');
	}
	if (opts.apiKey && req.headers.authorization !== `Bearer ${opts.apiKey}`) {
		req.resume();
		throw new RequestError(401, 'The API key is missing or wrong.', null, 'authentication_error');
	}
	await transcribe(ffmpeg, req, res);
}

/**
 * Starts the speech-to-text stand-in on `port` (0 for any free one). It keeps nothing: each
 * upload goes to a scratch folder and is removed once answered.
 */
export async function startSpeechFake(opts: SpeechFakeOptions): Promise<SpeechFake> {
	const host = opts.host ?? '127.0.0.1';
	const ffmpeg = opts.ffmpegPath ?? defaultFfmpeg();
	const server = createServer((req, res) => {
		handle(opts, ffmpeg, req, res).catch((error: unknown) => {
			if (res.headersSent) return void res.destroy();
			if (error instanceof RequestError) return sendError(res, error);
			sendError(
				res,
				new RequestError(
					500,
					error instanceof Error ? error.message : String(error),
					null,
					'server_error'
				)
			);
		});
	});
	await new Promise<void>((resolve, reject) => {
		server.once('error', reject);
		server.listen(opts.port, host, () => {
			server.off('error', reject);
			resolve();
		});
	});
	const port = (server.address() as AddressInfo).port;
	const hostInUrl = host.includes(':') ? `[${host}]` : host;
	let closing: Promise<void> | undefined;
	return {
		url: `http://${hostInUrl}:${port}/v1`,
		close() {
			closing ??= new Promise<void>((resolve, reject) => {
				server.close((error) => (error ? reject(error) : resolve()));
				server.closeAllConnections();
			});
			return closing;
		}
	};
}
