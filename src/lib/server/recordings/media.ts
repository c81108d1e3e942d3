import { Readable } from 'node:stream';
import { GetObjectCommand, S3ServiceException } from '@aws-sdk/client-s3';
import { LRUCache } from 'lru-cache';
import { contentRange, ifRangeAllows, parseRange, rangeLength } from '../../media/byte-range';
import type { Recording } from '../db/schema';
import { bucketName, headObject, storage, type ObjectInfo } from '../storage';
import { recordingKeys } from '../storage/keys';
import { config } from '../config';
import { presignMediaUrl, signingWindow, type MediaAudience } from '../storage/media-urls';
import { parseVersionParam, servedVersion } from '../../media/ladder';
import { apiError } from '../api';

/**
 * The ladder version a media request asks for (`?v=360`), null for the largest, or a 400 answer
 * for a value that is not one of the ladder's sizes.
 */
export function versionAsked(request: Request): number | null | Response {
	const asked = parseVersionParam(new URL(request.url).searchParams.get('v'));
	if (asked === 'invalid') {
		return apiError(400, 'Unknown version: ask for ?v=360 or ?v=540, or none for the largest.');
	}
	return asked;
}

// A player asks for many ranges of one file; remembering its size and tag saves a HEAD per range.
// Every GET carries If-Match with the remembered tag, so a replaced object is noticed, not served.
const infoCache = new LRUCache<string, ObjectInfo>({ max: 500, ttl: 60_000 });

async function objectInfo(key: string, fresh = false): Promise<ObjectInfo | null> {
	const cached = fresh ? undefined : infoCache.get(key);
	if (cached) return cached;
	const info = await headObject(key);
	if (info) infoCache.set(key, info);
	else infoCache.delete(key);
	return info;
}

function isPreconditionFailed(error: unknown): boolean {
	return error instanceof S3ServiceException && error.$metadata.httpStatusCode === 412;
}

function isMissing(error: unknown): boolean {
	return error instanceof S3ServiceException && error.$metadata.httpStatusCode === 404;
}

/**
 * A web stream over a Node stream that reads only when the client takes data, so a slow viewer
 * holds one chunk in memory rather than the whole range (Readable.toWeb buffers ahead on Node 20).
 */
function pullStream(body: Readable): ReadableStream<Uint8Array> {
	const chunks = body[Symbol.asyncIterator]();
	return new ReadableStream<Uint8Array>(
		{
			async pull(controller) {
				try {
					const { value, done } = await chunks.next();
					if (done) controller.close();
					else controller.enqueue(value as Uint8Array);
				} catch (error) {
					controller.error(error);
				}
			},
			cancel() {
				body.destroy();
			}
		},
		{ highWaterMark: 0 }
	);
}

/** The stored asset an `[asset]` name stands for, with its type; null for an unknown name. */
export function assetKey(
	recording: Recording,
	asset: string,
	short: number | null = null
): { key: string; type: string } | null {
	const keys = recordingKeys(recording.clinicId, recording.id);
	if (asset === 'rendition.mp4') {
		const served = servedVersion(short, recording.renditionVersions);
		return { key: served ? keys.renditionVersion(served) : keys.rendition, type: 'video/mp4' };
	}
	if (asset === 'sprite.jpg') return { key: keys.sprite, type: 'image/jpeg' };
	if (asset === 'waveform.json') return { key: keys.waveform, type: 'application/json' };
	const poster = /^poster-(\d{1,2})\.jpg$/.exec(asset);
	if (poster && Number(poster[1]) < recording.posterCount) {
		return { key: keys.poster(Number(poster[1])), type: 'image/jpeg' };
	}
	return null;
}

/** Public redirects may sit in shared caches this long at most: an unpublished exercise drops out within it. */
const PUBLIC_REDIRECT_MAX_AGE = 60;

function matchesTag(ifNoneMatch: string | null, etag: string | null): boolean {
	if (!etag || !ifNoneMatch) return false;
	return ifNoneMatch.split(',').some((t) => t.trim() === etag || t.trim() === '*');
}

/**
 * Answers a media request whose caller was already authorised: a redirect (307) to a
 * short-lived presigned storage address, so the bytes and their byte ranges go from storage to
 * the browser. Nothing is cached on the way for private media (`private, no-store`: the next
 * request is checked again); a public library copy's redirect may be shared by caches for a
 * minute at most (its bytes, at storage, for a year). HEAD and a matching If-None-Match (the
 * patient's offline copy revalidating) are answered here, with no bytes; a missing object is a 404.
 */
export async function redirectToObject(
	request: Request,
	key: string,
	contentType: string,
	audience: MediaAudience = 'private'
): Promise<Response> {
	if (request.method === 'HEAD') return serveObject(request, key, contentType);
	const info = await objectInfo(key);
	if (!info) return notFound();
	const now = Date.now();
	const { expiresAt } = signingWindow(now, config().MEDIA_URL_LIFETIME_SECONDS);
	const headers = new Headers({
		'Cache-Control':
			audience === 'public'
				? `public, max-age=${Math.max(0, Math.min(PUBLIC_REDIRECT_MAX_AGE, Math.floor((expiresAt - now) / 1000) - 1))}`
				: 'private, no-store'
	});
	const etag = info.etag ?? null;
	if (etag) headers.set('ETag', etag);
	if (matchesTag(request.headers.get('If-None-Match'), etag)) {
		return new Response(null, { status: 304, headers });
	}
	const { url } = await presignMediaUrl(key, { contentType, audience, now });
	headers.set('Location', url);
	return new Response(null, { status: 307, headers });
}

function notFound(): Response {
	return new Response('Not found.', { status: 404, headers: { 'Content-Type': 'text/plain' } });
}

/**
 * Streams a stored object honouring HTTP byte ranges (RFC 9110 §14): 206 with Content-Range for
 * one range, 416 with `bytes *\/LENGTH` when none can be met, 200 for no range, an invalid one,
 * several (rarely sent by players; answering them whole is allowed), or a stale If-Range. The
 * body is piped from storage's own ranged GET, so no file is ever held in memory.
 */
export async function serveObject(
	request: Request,
	key: string,
	contentType: string
): Promise<Response> {
	let info = await objectInfo(key);
	for (let attempt = 0; info; attempt++) {
		try {
			return await answer(request, key, contentType, info);
		} catch (error) {
			if (isPreconditionFailed(error) && attempt === 0) {
				info = await objectInfo(key, true);
				continue;
			}
			if (isMissing(error)) infoCache.delete(key);
			else throw error;
			break;
		}
	}
	return notFound();
}

async function answer(
	request: Request,
	key: string,
	contentType: string,
	info: ObjectInfo
): Promise<Response> {
	const length = info.contentLength;
	const etag = info.etag ?? null;
	const lastModified = info.lastModified ?? null;
	const headers = new Headers({
		'Content-Type': contentType,
		'Accept-Ranges': 'bytes',
		// Private: the viewer's role and clinic were checked; revalidated by ETag after a while.
		'Cache-Control': 'private, max-age=300',
		'X-Content-Type-Options': 'nosniff'
	});
	if (etag) headers.set('ETag', etag);
	if (lastModified) headers.set('Last-Modified', lastModified.toUTCString());

	const ifNoneMatch = request.headers.get('If-None-Match');
	if (
		etag &&
		ifNoneMatch &&
		ifNoneMatch.split(',').some((t) => t.trim() === etag || t.trim() === '*')
	) {
		return new Response(null, { status: 304, headers });
	}

	let range = parseRange(request.headers.get('Range'), length);
	if (
		range.kind !== 'none' &&
		!ifRangeAllows(request.headers.get('If-Range'), etag, lastModified)
	) {
		range = { kind: 'none' };
	}
	if (range.kind === 'unsatisfiable') {
		headers.set('Content-Range', contentRange(null, length));
		headers.delete('Content-Type');
		return new Response(null, { status: 416, headers });
	}
	const single = range.kind === 'ranges' && range.ranges.length === 1 ? range.ranges[0] : null;
	if (request.method === 'HEAD') {
		headers.set('Content-Length', String(single ? rangeLength(single) : length));
		if (single) headers.set('Content-Range', contentRange(single, length));
		return new Response(null, { status: single ? 206 : 200, headers });
	}
	if (length === 0) {
		headers.set('Content-Length', '0');
		return new Response(null, { status: 200, headers });
	}
	const result = await storage().send(
		new GetObjectCommand({
			Bucket: bucketName(),
			Key: key,
			Range: single ? `bytes=${single.start}-${single.end}` : undefined,
			IfMatch: etag ?? undefined
		}),
		{ abortSignal: request.signal }
	);
	if (!(result.Body instanceof Readable)) throw new Error(`serveObject(${key}): no Node stream.`);
	const body = pullStream(result.Body);
	if (single) {
		headers.set('Content-Range', contentRange(single, length));
		headers.set('Content-Length', String(rangeLength(single)));
		return new Response(body, { status: 206, headers });
	}
	headers.set('Content-Length', String(length));
	return new Response(body, { status: 200, headers });
}
