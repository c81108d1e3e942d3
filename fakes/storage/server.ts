import { createReadStream } from 'node:fs';
import { mkdir } from 'node:fs/promises';
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import { createRequire } from 'node:module';
import type { AddressInfo } from 'node:net';
import { handleMultipart } from './multipart';
import { objectOf, readRange } from './ranges';
import { verifySignature } from './sigv4';

// s3rver ships no types; these cover only what the fake uses.
interface S3rverOptions {
	silent?: boolean;
	directory?: string;
	vhostBuckets?: boolean;
	configureBuckets?: { name: string; configs?: string[] }[];
}

interface S3rverObject {
	content: NodeJS.ReadableStream & { destroy(): void };
	range?: { start: number; end: number };
}

interface S3rverStore {
	getMetadata(bucket: string, key: string): Promise<Record<string, string>>;
	getObject(
		bucket: string,
		key: string,
		options?: { start?: number; end?: number }
	): Promise<S3rverObject | null>;
	getResourcePath(bucket: string, key: string, resource: string): string;
}

interface S3rverInstance {
	logger: { close(): void };
	store: S3rverStore;
	configureBuckets(): Promise<void>;
	callback(): (req: IncomingMessage, res: ServerResponse) => void;
}

interface S3rverAccount {
	createKeyPair(accessKeyId: string, secretAccessKey: string): void;
	revokeAccessKey(accessKeyId: string): void;
}

const require = createRequire(import.meta.url);

// tsx before 4.22.2 ignores the `'module.exports'` export that these packages' require(esm) entry
// points rely on, so koa (inside s3rver) receives an object instead of a function and throws at
// start. Replacing the cached exports before s3rver loads fixes that; elsewhere it changes nothing.
for (const name of ['generator-function', 'async-function', 'async-generator-function']) {
	let path: string;
	try {
		path = require.resolve(name);
	} catch {
		continue;
	}
	const loaded: unknown = require(name);
	const cached = require.cache[path];
	if (cached && typeof loaded === 'object' && loaded !== null && 'module.exports' in loaded) {
		cached.exports = (loaded as Record<string, unknown>)['module.exports'];
	}
}

const S3rver = require('s3rver') as new (options: S3rverOptions) => S3rverInstance;
// The only place s3rver keeps key pairs: a request whose key id is missing here is refused.
const account = (require('s3rver/lib/models/account') as { DUMMY_ACCOUNT: S3rverAccount })
	.DUMMY_ACCOUNT;

export interface StorageFakeOptions {
	host?: string;
	port: number;
	directory: string;
	bucket: string;
	accessKeyId: string;
	secretAccessKey: string;
	allowedOrigins?: string[];
}

export interface StorageFake {
	url: string;
	close(): Promise<void>;
}

// s3rver keeps its key pairs in one process-wide registry, so two fakes sharing a key must not
// revoke it from each other.
const registeredKeys = new Map<string, number>();

function registerKey(accessKeyId: string, secretAccessKey: string) {
	registeredKeys.set(accessKeyId, (registeredKeys.get(accessKeyId) ?? 0) + 1);
	account.createKeyPair(accessKeyId, secretAccessKey);
}

function releaseKey(accessKeyId: string) {
	const count = (registeredKeys.get(accessKeyId) ?? 1) - 1;
	if (count > 0) {
		registeredKeys.set(accessKeyId, count);
		return;
	}
	registeredKeys.delete(accessKeyId);
	if (accessKeyId !== 'S3RVER') account.revokeAccessKey(accessKeyId);
}

/**
 * s3rver's store reads a range ending at byte 0 (`bytes=0-0`, a player probing a file) as "to
 * the end"; this answers it with the first byte.
 */
function fixFirstByteRange(store: S3rverStore) {
	const getObject = store.getObject.bind(store);
	store.getObject = async (bucket, key, options) => {
		const object = await getObject(bucket, key, options);
		if (options?.end === 0 && object?.content && object.range) {
			object.content.destroy();
			object.content = createReadStream(store.getResourcePath(bucket, key, 'object'), {
				start: 0,
				end: 0
			});
			object.range = { start: 0, end: 0 };
		}
		return object;
	};
}

function escapeXml(value: string): string {
	return value.replace(/[<>&'"]/g, (c) => `&#${c.charCodeAt(0)};`);
}

function corsXml(origins: string[]): string {
	const rule = [
		...origins.map((o) => `<AllowedOrigin>${escapeXml(o)}</AllowedOrigin>`),
		...['GET', 'PUT', 'POST', 'HEAD', 'DELETE'].map((m) => `<AllowedMethod>${m}</AllowedMethod>`),
		'<AllowedHeader>*</AllowedHeader>',
		'<ExposeHeader>ETag</ExposeHeader>',
		'<MaxAgeSeconds>3000</MaxAgeSeconds>'
	].join('');
	return `<CORSConfiguration><CORSRule>${rule}</CORSRule></CORSConfiguration>`;
}

function hasUnsafeSegment(url: string): boolean {
	const path = url.split('?')[0];
	try {
		return path.split('/').some((segment) => {
			const decoded = decodeURIComponent(segment);
			return decoded === '.' || decoded === '..' || decoded.includes('/');
		});
	} catch {
		return true;
	}
}

/**
 * Starts an S3-compatible fake on loopback with one bucket (CORS open for direct browser
 * uploads) and real SigV4 checking of the given key pair. Data persists under `directory`.
 */
export async function startStorageFake(opts: StorageFakeOptions): Promise<StorageFake> {
	const host = opts.host ?? '127.0.0.1';
	const origins = opts.allowedOrigins?.length ? opts.allowedOrigins : ['*'];
	await mkdir(opts.directory, { recursive: true });

	const s3rver = new S3rver({
		silent: true,
		directory: opts.directory,
		// A hostname such as `storage` would otherwise be taken for a virtual-host bucket name.
		vhostBuckets: false,
		configureBuckets: [{ name: opts.bucket, configs: [corsXml(origins)] }]
	});
	registerKey(opts.accessKeyId, opts.secretAccessKey);

	fixFirstByteRange(s3rver.store);
	const handle = s3rver.callback();
	const credentials = { accessKeyId: opts.accessKeyId, secretAccessKey: opts.secretAccessKey };

	// Without CORS headers a browser hides a refusal behind a generic network error.
	function allowOrigin(origin: string | undefined, res: ServerResponse) {
		if (origin && (origins.includes('*') || origins.includes(origin))) {
			res.setHeader('Access-Control-Allow-Origin', origins.includes('*') ? '*' : origin);
			res.setHeader('Access-Control-Expose-Headers', 'ETag');
		}
	}

	function sendError(
		req: IncomingMessage,
		res: ServerResponse,
		status: number,
		code: string,
		message: string
	) {
		const origin = req.headers.origin;
		allowOrigin(origin, res);
		const body =
			'<?xml version="1.0" encoding="UTF-8"?>\n' +
			`<Error><Code>${code}</Code><Message>${escapeXml(message)}</Message></Error>`;
		res.writeHead(status, {
			'Content-Type': 'application/xml',
			'Content-Length': Buffer.byteLength(body)
		});
		res.end(body);
	}

	const server = createServer((req, res) => {
		if (hasUnsafeSegment(req.url ?? '/')) {
			sendError(
				req,
				res,
				400,
				'InvalidURI',
				'The storage fake refuses "." and ".." segments and encoded slashes in keys.'
			);
			return;
		}
		// Preflights carry no credentials; s3rver answers them from the bucket's CORS rules.
		if (req.method === 'OPTIONS') {
			handle(req, res);
			return;
		}
		const payload = req.headers['x-amz-content-sha256'];
		const encoding = req.headers['content-encoding'] ?? '';
		if (
			(typeof payload === 'string' && payload.startsWith('STREAMING-')) ||
			encoding.includes('aws-chunked')
		) {
			// s3rver would store the chunk framing as the object's bytes without any error.
			sendError(
				req,
				res,
				501,
				'NotImplemented',
				'The storage fake cannot decode aws-chunked uploads; create the S3Client with ' +
					"requestChecksumCalculation: 'WHEN_REQUIRED'."
			);
			return;
		}
		if (req.method === 'PUT' && req.headers['content-length'] === undefined) {
			// Real S3 refuses a PUT of unknown length, and the SDK sends one for a stream it cannot measure.
			sendError(
				req,
				res,
				411,
				'MissingContentLength',
				'You must provide the Content-Length HTTP header.'
			);
			return;
		}
		const verdict = verifySignature(req, credentials);
		if (!verdict.ok) {
			sendError(req, res, verdict.status, verdict.code, verdict.message);
			return;
		}
		handleMultipart(req, res, opts.directory, (r, w) => allowOrigin(r.headers.origin, w))
			.then(async (handled) => {
				if (handled) return;
				// After the signature check: the SDK signs the Range header as sent.
				if (await answerUnsatisfiableRange(req, res)) return;
				handle(req, res);
			})
			.catch((error: unknown) => sendError(req, res, 500, 'InternalError', String(error)));
	});

	/**
	 * Puts the Range header of an object read in the one form s3rver reads right (`bytes=A-B`),
	 * drops one S3 would ignore, and answers 416 itself for one past the end. True when answered.
	 */
	async function answerUnsatisfiableRange(
		req: IncomingMessage,
		res: ServerResponse
	): Promise<boolean> {
		const range = req.headers.range;
		if (range === undefined || (req.method !== 'GET' && req.method !== 'HEAD')) return false;
		const object = objectOf(req.url ?? '/');
		if (!object) return false;
		const metadata = await s3rver.store.getMetadata(object.bucket, object.key).catch(() => null);
		// A missing object: s3rver answers NoSuchKey.
		if (!metadata) return false;
		const size = Number(metadata['content-length']);
		const decision = readRange(range, size);
		if (decision.kind === 'whole') {
			delete req.headers.range;
			return false;
		}
		if (decision.kind === 'part') {
			req.headers.range = `bytes=${decision.start}-${decision.end}`;
			return false;
		}
		res.setHeader('Content-Range', `bytes */${size}`);
		sendError(req, res, 416, 'InvalidRange', 'The requested range is not satisfiable');
		return true;
	}

	try {
		await s3rver.configureBuckets();
		await new Promise<void>((resolve, reject) => {
			server.once('error', reject);
			server.listen(opts.port, host, () => {
				server.off('error', reject);
				resolve();
			});
		});
	} catch (error) {
		releaseKey(opts.accessKeyId);
		s3rver.logger.close();
		throw error;
	}

	const { port } = server.address() as AddressInfo;
	const url = `http://${host.includes(':') ? `[${host}]` : host}:${port}`;
	let closing: Promise<void> | undefined;

	return {
		url,
		close() {
			closing ??= new Promise<void>((resolve, reject) => {
				server.close((error) => {
					releaseKey(opts.accessKeyId);
					s3rver.logger.close();
					if (error) reject(error);
					else resolve();
				});
				// SDK clients keep sockets alive; close() alone would wait for them to time out.
				server.closeAllConnections();
			});
			return closing;
		}
	};
}
