/**
 * The library's file endpoints. Public ones serve the copies of the current version of a
 * published exercise to anyone (a retired exercise's answer 410, everything else 404 — so a
 * submission under review or an unpublished exercise leaks nothing); the submission ones serve
 * the clinic's own files to educators reviewing them, and to nobody else.
 */
import { createHash } from 'node:crypto';
import { serializeVtt } from '$lib/captions/vtt';
import type { Cue } from '$lib/captions/types';
import { apiCaller, apiError } from '../api';
import { serveCaptionFile } from '../captions/serve';
import { db } from '../db';
import {
	libraryVersions,
	segments,
	type LibrarySubmission,
	type LibraryVersion,
	type SegmentRow
} from '../db/schema';
import { redirectToObject, versionAsked } from '../recordings/media';
import { eq } from 'drizzle-orm';
import { submissionAsset, versionAsset } from './media';
import { findPublicVersion } from './public';
import { findSubmission } from './submissions';

/**
 * Public answers may sit in shared caches briefly; an unpublished exercise drops out within it.
 * (The bytes themselves come from storage, cached for a year: see redirectToObject.)
 */
export const PUBLIC_MEDIA_CACHE = 'public, max-age=60';

/** The version whose files the public may fetch, or the answer to give instead (404 or 410). */
export function publicVersionOr(id: string): LibraryVersion | Response {
	const found = findPublicVersion(id);
	if (found?.kind === 'retired')
		return apiError(410, 'This exercise was retired from the library.');
	if (!found) return apiError(404, 'Not found.');
	return found.value;
}

function withCache(response: Response, cacheControl: string): Response {
	if (response.ok || response.status === 206 || response.status === 304) {
		response.headers.set('Cache-Control', cacheControl);
	}
	return response;
}

/**
 * A public copy (clip.mp4 or poster-N.jpg) of a published version: a redirect to storage that
 * any cache may share, without `Vary: Cookie` (the answer is the same for everyone).
 */
export async function servePublicAsset(
	request: Request,
	id: string,
	asset: string
): Promise<Response> {
	const version = publicVersionOr(id);
	if (version instanceof Response) return version;
	const short = versionAsked(request);
	if (short instanceof Response) return short;
	const stored = versionAsset(version, asset, short);
	if (!stored) return apiError(404, 'Not found.');
	const response = await redirectToObject(request, stored.key, stored.type, 'public');
	return request.method === 'HEAD' ? withCache(response, PUBLIC_MEDIA_CACHE) : response;
}

function captionsTag(kind: string, id: string): string {
	const hash = createHash('sha256').update(`library\n${kind}\n${id}\nvtt`).digest('base64url');
	return `"${hash.slice(0, 32)}"`;
}

function vttOf(kind: string, id: string, cues: Cue[], language: string) {
	return {
		body: () => serializeVtt(cues),
		etag: captionsTag(kind, id),
		filename: `captions-${language.replace(/[^A-Za-z0-9-]/g, '')}.vtt`,
		format: 'vtt' as const
	};
}

/** A published version's captions as WebVTT, from its frozen snapshot (the tag never lies). */
export function servePublicCaptions(request: Request, id: string): Response {
	const version = publicVersionOr(id);
	if (version instanceof Response) return version;
	const { cues, segment } = version.snapshot;
	const response = serveCaptionFile(
		request,
		vttOf('version', version.id, cues, segment.captionsLanguage)
	);
	return withCache(response, 'public, max-age=0, must-revalidate');
}

/** The submission and its segment, for an educator; otherwise the JSON error to answer. */
export function educatorSubmission(
	id: string
): { submission: LibrarySubmission; segment: SegmentRow | null } | Response {
	const caller = apiCaller('educator');
	if (caller instanceof Response) return caller;
	const submission = findSubmission(id);
	if (!submission) return apiError(404, 'Not found.');
	const segment = submission.segmentId
		? (db().select().from(segments).where(eq(segments.id, submission.segmentId)).get() ?? null)
		: null;
	return { submission, segment };
}

/**
 * The clip or a poster behind a submission, for the educator reviewing it: the clinic's segment
 * files, or for a caption revision the public copies of the version it revises.
 */
export async function serveSubmissionAsset(
	request: Request,
	id: string,
	asset: string
): Promise<Response> {
	const found = educatorSubmission(id);
	if (found instanceof Response) return found;
	const { submission } = found;
	const short = versionAsked(request);
	if (short instanceof Response) return short;
	const revised =
		submission.kind === 'captions' && submission.revisesVersionId
			? db()
					.select()
					.from(libraryVersions)
					.where(eq(libraryVersions.id, submission.revisesVersionId))
					.get()
			: undefined;
	const stored = revised
		? versionAsset(revised, asset, short)
		: submissionAsset(submission, found.segment, asset, short);
	if (!stored) return apiError(404, 'Not found.');
	return redirectToObject(request, stored.key, stored.type);
}

/** A submission's captions as submitted (its snapshot), for the educator reviewing it. */
export function serveSubmissionCaptions(request: Request, id: string): Response {
	const found = educatorSubmission(id);
	if (found instanceof Response) return found;
	const { cues, segment } = found.submission.snapshot;
	return serveCaptionFile(
		request,
		vttOf('submission', found.submission.id, cues, segment.captionsLanguage)
	);
}
