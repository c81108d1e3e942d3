/**
 * Storage addresses for media that a browser reads directly: a presigned GET of one object that
 * works for `MEDIA_URL_LIFETIME_SECONDS`. The media endpoints hand them out only after their own
 * checks (role, clinic, the patient's programme, the library's status), as a redirect, so the
 * bytes never pass through the app.
 *
 * Addresses are signed per time window rather than per request: every request within the same
 * half-lifetime gets the same address, which still works for at least half the lifetime. The
 * browser's cache (and a shared cache in front of storage, for public files) then recognises a
 * clip played again, where a new signature each time would fetch it anew.
 */
import { GetObjectCommand } from '@aws-sdk/client-s3';
import { LRUCache } from 'lru-cache';
import { getSignedUrl } from '@aws-sdk/s3-request-presigner';
import { config } from '../config';
import { bucketName, storage } from './index';

/** Who may keep the bytes: the viewer's own browser only, or any cache (library copies). */
export type MediaAudience = 'private' | 'public';

export interface MediaUrl {
	url: string;
	/** When storage stops honouring it (ms since the epoch). */
	expiresAt: number;
}

/** A year: public copies live under an immutable version id, so their bytes never change. */
export const IMMUTABLE_CACHE = 'public, max-age=31536000, immutable';

/**
 * A page's Content-Security-Policy with storage's origin added where the browser meets storage:
 * connect-src (uploads), media-src and img-src (the media endpoints' redirects). No other
 * directive, and nothing else from storage, is allowed.
 */
export function withStorageOrigin(csp: string, origin: string): string {
	return csp.replace(/\b(connect-src|media-src|img-src) 'self'/g, `$1 'self' ${origin}`);
}

/** The signing instant of the window `now` falls in, and when an address signed then expires. */
export function signingWindow(
	now: number,
	lifetimeSeconds: number
): { signedAt: number; expiresAt: number } {
	const window = Math.max(1, Math.floor(lifetimeSeconds / 2)) * 1000;
	const signedAt = Math.floor(now / window) * window;
	return { signedAt, expiresAt: signedAt + lifetimeSeconds * 1000 };
}

// Addresses signed in the current window, by what was signed: signing again would give the same
// address, so a player's many requests cost one signature per file and window.
// The id holds the window, so a later window never meets an earlier one's address; the time limit
// only frees memory, and no entry outlives its address.
const signed = new LRUCache<string, MediaUrl>({ max: 2000 });

/**
 * The storage address of `key` for a browser, with the type and caching storage must answer
 * with (S3's response-content-type and response-cache-control, which are part of the signature).
 */
export async function presignMediaUrl(
	key: string,
	{
		contentType,
		audience,
		now = Date.now(),
		lifetimeSeconds = config().MEDIA_URL_LIFETIME_SECONDS
	}: { contentType: string; audience: MediaAudience; now?: number; lifetimeSeconds?: number }
): Promise<MediaUrl> {
	const { signedAt, expiresAt } = signingWindow(now, lifetimeSeconds);
	const id = `${audience}\n${contentType}\n${lifetimeSeconds}\n${signedAt}\n${key}`;
	const known = signed.get(id);
	if (known) return known;
	const url = await getSignedUrl(
		storage(),
		new GetObjectCommand({
			Bucket: bucketName(),
			Key: key,
			ResponseContentType: contentType,
			// Private bytes stay in the viewer's own browser for as long as their address works.
			ResponseCacheControl:
				audience === 'public' ? IMMUTABLE_CACHE : `private, max-age=${lifetimeSeconds}`
		}),
		{ expiresIn: lifetimeSeconds, signingDate: new Date(signedAt) }
	);
	const made = { url, expiresAt };
	signed.set(id, made, { ttl: lifetimeSeconds * 1000 });
	return made;
}
