import { createHash, createHmac, timingSafeEqual } from 'node:crypto';
import type { IncomingMessage } from 'node:http';

/**
 * AWS Signature Version 4 verification for the storage fake. s3rver only looks up the access key
 * id of a V4 request and never checks the signature, so without this a wrong secret would pass
 * and a misconfigured deployment would only be found against real storage.
 */

export type VerifyResult =
	| { ok: true; accessKeyId: string }
	| { ok: false; status: number; code: string; message: string };

const ALGORITHM = 'AWS4-HMAC-SHA256';
const MAX_SKEW_MS = 15 * 60 * 1000;
const MAX_PRESIGN_SECONDS = 7 * 24 * 60 * 60;

function refuse(code: string, message: string, status = 403): VerifyResult {
	return { ok: false, status, code, message };
}

function rfc3986(value: string): string {
	return encodeURIComponent(value).replace(
		/[!'()*]/g,
		(c) => '%' + c.charCodeAt(0).toString(16).toUpperCase()
	);
}

function sha256Hex(value: string): string {
	return createHash('sha256').update(value, 'utf8').digest('hex');
}

function hmac(key: Buffer | string, value: string): Buffer {
	return createHmac('sha256', key).update(value, 'utf8').digest();
}

function sameSignature(a: string, b: string): boolean {
	const left = Buffer.from(a, 'utf8');
	const right = Buffer.from(b, 'utf8');
	return left.length === right.length && timingSafeEqual(left, right);
}

function parseAmzDate(value: string): number {
	const m = /^(\d{4})(\d{2})(\d{2})T(\d{2})(\d{2})(\d{2})Z$/.exec(value);
	if (!m) return Number.NaN;
	return Date.UTC(+m[1], +m[2] - 1, +m[3], +m[4], +m[5], +m[6]);
}

function parseQuery(raw: string): [string, string][] {
	const pairs: [string, string][] = [];
	for (const part of raw.split('&')) {
		if (part === '') continue;
		const eq = part.indexOf('=');
		const name = eq === -1 ? part : part.slice(0, eq);
		const value = eq === -1 ? '' : part.slice(eq + 1);
		pairs.push([decodeURIComponent(name), decodeURIComponent(value)]);
	}
	return pairs;
}

// S3 signs the path as the client encoded it, without the double encoding other services use;
// decoding and re-encoding each segment makes `~` versus `%7E` style differences irrelevant.
function canonicalUri(path: string): string {
	return path
		.split('/')
		.map((segment) => rfc3986(decodeURIComponent(segment)))
		.join('/');
}

function canonicalQuery(pairs: [string, string][]): string {
	return pairs
		.map(([name, value]) => [rfc3986(name), rfc3986(value)] as const)
		.sort(([an, av], [bn, bv]) => (an < bn ? -1 : an > bn ? 1 : av < bv ? -1 : av > bv ? 1 : 0))
		.map(([name, value]) => `${name}=${value}`)
		.join('&');
}

function canonicalHeaders(req: IncomingMessage, signedHeaders: string[]): string | undefined {
	let out = '';
	for (const name of signedHeaders) {
		const values = req.headersDistinct[name];
		if (!values) return undefined;
		out += `${name}:${values.map((v) => v.trim().replace(/\s+/g, ' ')).join(',')}\n`;
	}
	return out;
}

interface Parsed {
	accessKeyId: string;
	scope: string;
	scopeDate: string;
	signedHeaders: string[];
	signature: string;
	amzDate: string;
	payloadHash: string;
	query: [string, string][];
}

function parseCredential(credential: string) {
	const [accessKeyId, scopeDate, region, service, terminator, ...rest] = credential.split('/');
	if (!accessKeyId || !scopeDate || !region || service !== 's3' || terminator !== 'aws4_request')
		return undefined;
	if (rest.length > 0) return undefined;
	return { accessKeyId, scopeDate, scope: [scopeDate, region, service, terminator].join('/') };
}

function parseHeaderAuth(req: IncomingMessage, query: [string, string][]): Parsed | VerifyResult {
	const header = req.headers.authorization ?? '';
	if (!header.startsWith(ALGORITHM + ' ')) {
		return refuse(
			'InvalidRequest',
			'The storage fake accepts only AWS Signature Version 4 (AWS4-HMAC-SHA256).',
			400
		);
	}
	const fields = new Map(
		header
			.slice(ALGORITHM.length + 1)
			.split(',')
			.map((part) => {
				const eq = part.indexOf('=');
				return [part.slice(0, eq).trim(), part.slice(eq + 1).trim()] as const;
			})
	);
	const credential = parseCredential(fields.get('Credential') ?? '');
	const signedHeaders = fields.get('SignedHeaders');
	const signature = fields.get('Signature');
	if (!credential || !signedHeaders || !signature) {
		return refuse(
			'AuthorizationHeaderMalformed',
			'The authorization header needs Credential, SignedHeaders and Signature.',
			400
		);
	}
	const payloadHash = req.headers['x-amz-content-sha256'];
	if (typeof payloadHash !== 'string') {
		return refuse(
			'InvalidRequest',
			'Missing required header for this request: x-amz-content-sha256.',
			400
		);
	}
	const amzDate = req.headers['x-amz-date'];
	if (typeof amzDate !== 'string') {
		return refuse('AccessDenied', 'AWS authentication requires a valid x-amz-date header.');
	}
	return {
		...credential,
		signedHeaders: signedHeaders.split(';'),
		signature,
		amzDate,
		payloadHash,
		query
	};
}

function parseQueryAuth(query: [string, string][]): Parsed | VerifyResult {
	const params = new Map(query);
	if (params.get('X-Amz-Algorithm') !== ALGORITHM) {
		return refuse(
			'AuthorizationQueryParametersError',
			'X-Amz-Algorithm must be AWS4-HMAC-SHA256.',
			400
		);
	}
	const credential = parseCredential(params.get('X-Amz-Credential') ?? '');
	const signedHeaders = params.get('X-Amz-SignedHeaders');
	const signature = params.get('X-Amz-Signature');
	const amzDate = params.get('X-Amz-Date');
	const expires = Number(params.get('X-Amz-Expires'));
	if (!credential || !signedHeaders || !signature || !amzDate || !Number.isInteger(expires)) {
		return refuse(
			'AuthorizationQueryParametersError',
			'A presigned URL needs X-Amz-Credential, X-Amz-Date, X-Amz-Expires, X-Amz-SignedHeaders and X-Amz-Signature.',
			400
		);
	}
	if (expires < 1 || expires > MAX_PRESIGN_SECONDS) {
		return refuse(
			'AuthorizationQueryParametersError',
			'X-Amz-Expires must be 1 to 604800 seconds.',
			400
		);
	}
	const signedAt = parseAmzDate(amzDate);
	if (Number.isNaN(signedAt)) {
		return refuse(
			'AuthorizationQueryParametersError',
			'X-Amz-Date must look like 20240131T120000Z.',
			400
		);
	}
	if (Date.now() > signedAt + expires * 1000) {
		return refuse('AccessDenied', 'Request has expired.');
	}
	return {
		...credential,
		signedHeaders: signedHeaders.split(';'),
		signature,
		amzDate,
		payloadHash: params.get('X-Amz-Content-Sha256') ?? 'UNSIGNED-PAYLOAD',
		query: query.filter(([name]) => name !== 'X-Amz-Signature')
	};
}

/**
 * Checks a request's SigV4 signature (Authorization header or presigned query) against the one
 * key pair the fake knows. The payload hash is taken as the client declares it, not recomputed.
 */
export function verifySignature(
	req: IncomingMessage,
	credentials: { accessKeyId: string; secretAccessKey: string }
): VerifyResult {
	const url = req.url ?? '/';
	const q = url.indexOf('?');
	const path = q === -1 ? url : url.slice(0, q);
	let query: [string, string][];
	let uri: string;
	try {
		query = parseQuery(q === -1 ? '' : url.slice(q + 1));
		uri = canonicalUri(path);
	} catch {
		return refuse('InvalidURI', 'Could not parse the specified URI.', 400);
	}

	const byHeader = req.headers.authorization !== undefined;
	const byQuery = query.some(([name]) => name === 'X-Amz-Algorithm');
	if (byHeader && byQuery) {
		return refuse('InvalidArgument', 'Only one auth mechanism allowed.', 400);
	}
	if (!byHeader && !byQuery) {
		return refuse('AccessDenied', 'Anonymous requests are not allowed: sign the request.');
	}

	const parsed = byHeader ? parseHeaderAuth(req, query) : parseQueryAuth(query);
	if ('ok' in parsed) return parsed;

	if (parsed.accessKeyId !== credentials.accessKeyId) {
		return refuse(
			'InvalidAccessKeyId',
			'The AWS Access Key Id you provided does not exist in our records.'
		);
	}
	if (parsed.amzDate.slice(0, 8) !== parsed.scopeDate) {
		return refuse('SignatureDoesNotMatch', 'The credential scope date does not match X-Amz-Date.');
	}
	if (byHeader) {
		const signedAt = parseAmzDate(parsed.amzDate);
		if (Number.isNaN(signedAt) || Math.abs(Date.now() - signedAt) > MAX_SKEW_MS) {
			return refuse(
				'RequestTimeTooSkewed',
				'The difference between the request time and the current time is too large.'
			);
		}
	}
	if (!parsed.signedHeaders.includes('host')) {
		return refuse('AccessDenied', 'The host header must be signed.');
	}

	const headers = canonicalHeaders(req, parsed.signedHeaders);
	if (headers === undefined) {
		return refuse('AccessDenied', 'A header listed in SignedHeaders is missing from the request.');
	}
	const canonicalRequest = [
		req.method ?? 'GET',
		uri,
		canonicalQuery(parsed.query),
		headers,
		parsed.signedHeaders.join(';'),
		parsed.payloadHash
	].join('\n');
	const stringToSign = [ALGORITHM, parsed.amzDate, parsed.scope, sha256Hex(canonicalRequest)].join(
		'\n'
	);
	const [scopeDate, region, service] = parsed.scope.split('/');
	let key = hmac('AWS4' + credentials.secretAccessKey, scopeDate);
	key = hmac(key, region);
	key = hmac(key, service);
	key = hmac(key, 'aws4_request');
	const expected = createHmac('sha256', key).update(stringToSign, 'utf8').digest('hex');
	if (!sameSignature(expected, parsed.signature)) {
		return refuse(
			'SignatureDoesNotMatch',
			'The request signature we calculated does not match the signature you provided. Check your key and signing method.'
		);
	}
	return { ok: true, accessKeyId: parsed.accessKeyId };
}
