import { ReadStream } from 'node:fs';
import { Readable } from 'node:stream';
import {
	DeleteObjectCommand,
	DeleteObjectsCommand,
	GetObjectCommand,
	HeadBucketCommand,
	HeadObjectCommand,
	ListObjectsCommand,
	PutObjectCommand,
	S3Client,
	S3ServiceException
} from '@aws-sdk/client-s3';
import { getSignedUrl } from '@aws-sdk/s3-request-presigner';
import { config } from '../config';

export type ObjectBody = Uint8Array | string | Readable;

export interface ObjectInfo {
	contentLength: number;
	contentType: string | undefined;
	etag: string | undefined;
	lastModified: Date | undefined;
}

export interface ObjectStream extends ObjectInfo {
	body: Readable;
	/** Set when a range was asked for, e.g. `bytes 0-1023/52428800`. */
	contentRange: string | undefined;
}

export interface HealthCheck {
	ok: boolean;
	detail: string;
}

function createClient(maxAttempts?: number): S3Client {
	const c = config();
	return new S3Client({
		region: c.S3_REGION,
		...(c.S3_ENDPOINT ? { endpoint: c.S3_ENDPOINT } : {}),
		forcePathStyle: c.S3_FORCE_PATH_STYLE,
		credentials: { accessKeyId: c.S3_ACCESS_KEY_ID, secretAccessKey: c.S3_SECRET_ACCESS_KEY },
		// The SDK's default checksums frame stream bodies as aws-chunked, which some
		// S3-compatible servers (the local fake among them) store verbatim as the object.
		requestChecksumCalculation: 'WHEN_REQUIRED',
		responseChecksumValidation: 'WHEN_REQUIRED',
		maxAttempts
	});
}

let client: S3Client | undefined;
let probeClient: S3Client | undefined;

/** The shared S3 client, created on first use so that importing this module touches nothing. */
export function storage(): S3Client {
	client ??= createClient();
	return client;
}

export function bucketName(): string {
	return config().S3_BUCKET;
}

function isNotFound(error: unknown): boolean {
	return (
		error instanceof S3ServiceException &&
		(error.name === 'NoSuchKey' ||
			error.name === 'NotFound' ||
			error.$metadata.httpStatusCode === 404)
	);
}

/** Stores an object; a stream other than a file stream needs its length, as S3 refuses chunked uploads. */
export async function putObject(
	key: string,
	body: ObjectBody,
	contentType: string,
	contentLength?: number
): Promise<{ etag: string | undefined }> {
	if (body instanceof Readable && !(body instanceof ReadStream) && contentLength === undefined) {
		throw new Error(`putObject(${key}): a stream body needs its contentLength.`);
	}
	const result = await storage().send(
		new PutObjectCommand({
			Bucket: bucketName(),
			Key: key,
			Body: body,
			ContentType: contentType,
			ContentLength: contentLength
		})
	);
	return { etag: result.ETag };
}

/** Opens an object for reading, optionally one HTTP byte range (`bytes=0-1023`); null if missing. */
export async function getObjectStream(key: string, range?: string): Promise<ObjectStream | null> {
	try {
		const result = await storage().send(
			new GetObjectCommand({ Bucket: bucketName(), Key: key, Range: range })
		);
		if (!(result.Body instanceof Readable)) {
			throw new Error(`getObjectStream(${key}): the response body is not a Node stream.`);
		}
		return {
			body: result.Body,
			contentLength: result.ContentLength ?? 0,
			contentType: result.ContentType,
			contentRange: result.ContentRange,
			etag: result.ETag,
			lastModified: result.LastModified
		};
	} catch (error) {
		if (isNotFound(error)) return null;
		throw error;
	}
}

/**
 * A URL that reads one object for `expiresIn` seconds, with HTTP ranges: for the media worker's
 * ffmpeg, which seeks in a long rendition and reads only the part it cuts. Never given to a
 * browser (media reaches browsers through the role-checked endpoints).
 */
export async function presignRead(key: string, expiresIn: number): Promise<string> {
	return getSignedUrl(storage(), new GetObjectCommand({ Bucket: bucketName(), Key: key }), {
		expiresIn: Math.max(60, Math.min(Math.ceil(expiresIn), 7 * 24 * 3600))
	});
}

/** An object's size and type without its body; null if missing. */
export async function headObject(key: string): Promise<ObjectInfo | null> {
	try {
		const result = await storage().send(new HeadObjectCommand({ Bucket: bucketName(), Key: key }));
		return {
			contentLength: result.ContentLength ?? 0,
			contentType: result.ContentType,
			etag: result.ETag,
			lastModified: result.LastModified
		};
	} catch (error) {
		if (isNotFound(error)) return null;
		throw error;
	}
}

/** Deletes one object; deleting a missing key is not an error, as in S3. */
export async function deleteObject(key: string): Promise<void> {
	await storage().send(new DeleteObjectCommand({ Bucket: bucketName(), Key: key }));
}

/** Deletes every object under a prefix (which must end with `/`) and returns how many went. */
export async function deletePrefix(prefix: string): Promise<number> {
	if (!prefix.endsWith('/') || prefix === '/') {
		throw new Error(
			`deletePrefix: the prefix must be a folder ending with '/', not ${JSON.stringify(prefix)}.`
		);
	}
	let deleted = 0;
	let marker: string | undefined;
	for (;;) {
		// ListObjects (v1) rather than v2: the storage fake cannot make v2 continuation tokens on
		// this Node (they use DES, which OpenSSL 3 no longer offers) and fails once a listing is cut.
		const page = await storage().send(
			new ListObjectsCommand({ Bucket: bucketName(), Prefix: prefix, Marker: marker })
		);
		const keys = (page.Contents ?? []).flatMap((o) => (o.Key ? [o.Key] : []));
		if (keys.length > 0) {
			const result = await storage().send(
				new DeleteObjectsCommand({
					Bucket: bucketName(),
					Delete: { Objects: keys.map((Key) => ({ Key })), Quiet: true }
				})
			);
			const failed = result.Errors ?? [];
			if (failed.length > 0) {
				const first = failed[0];
				throw new Error(
					`deletePrefix(${prefix}): ${failed.length} object(s) could not be deleted, first ${first.Key}: ${first.Code} ${first.Message}`
				);
			}
			deleted += keys.length;
		}
		if (!page.IsTruncated || keys.length === 0) return deleted;
		marker = page.NextMarker ?? keys[keys.length - 1];
	}
}

function describeFailure(error: unknown, timeoutMs: number): string {
	if (error instanceof Error && (error.name === 'AbortError' || error.name === 'TimeoutError')) {
		return `no answer within ${timeoutMs} ms`;
	}
	if (error instanceof S3ServiceException) {
		const status = error.$metadata.httpStatusCode;
		if (status === 403) return 'access refused: check S3_ACCESS_KEY_ID and S3_SECRET_ACCESS_KEY';
		if (status === 404) return `bucket "${bucketName()}" does not exist`;
		return `${error.name}${status ? ` (HTTP ${status})` : ''}: ${error.message}`;
	}
	if (error instanceof Error) {
		const code = (error as NodeJS.ErrnoException).code;
		return code ? `${code}: ${error.message}` : error.message;
	}
	return String(error);
}

/** Asks storage whether the bucket is there and ours; never throws, answers within the timeout. */
export async function checkStorage(timeoutMs = 2000): Promise<HealthCheck> {
	let where = 'storage';
	try {
		const c = config();
		where = `storage at ${c.S3_ENDPOINT || `S3 region ${c.S3_REGION}`}`;
		// One attempt only: retries would hide an outage behind the timeout.
		probeClient ??= createClient(1);
		await probeClient.send(new HeadBucketCommand({ Bucket: c.S3_BUCKET }), {
			abortSignal: AbortSignal.timeout(timeoutMs)
		});
		return { ok: true, detail: `${where}: bucket "${c.S3_BUCKET}" reachable` };
	} catch (error) {
		return { ok: false, detail: `${where}: ${describeFailure(error, timeoutMs)}` };
	}
}
