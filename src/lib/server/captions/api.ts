import { apiCaller, apiError } from '../api';
import type { Principal } from '../auth/principal';
import { CaptionError, findTrack, type CaptionTrack } from '.';

/**
 * The caller and the track an endpoint works on, or the JSON error to answer: only clinicians of
 * the track's clinic reach it, and another clinic's track is a 404.
 */
export function callerTrack(id: string): { caller: Principal; track: CaptionTrack } | Response {
	const caller = apiCaller('clinician');
	if (caller instanceof Response) return caller;
	const track = findTrack(caller.clinicId, id);
	if (!track) return apiError(404, 'Not found.');
	return { caller, track };
}

/** `?version=N` as a number, undefined when absent, or a 400 answer. */
export function versionParam(url: URL): number | undefined | Response {
	const raw = url.searchParams.get('version');
	if (raw === null) return undefined;
	if (!/^\d{1,9}$/.test(raw)) return apiError(400, 'The version must be a whole number.');
	return Number(raw);
}

/** Runs a step, turning a CaptionError into the API's JSON error shape. */
export async function answering(step: () => Response | Promise<Response>): Promise<Response> {
	try {
		return await step();
	} catch (error) {
		if (error instanceof CaptionError) return apiError(error.status, error.message);
		throw error;
	}
}

/** RFC 9110 If-None-Match: weak comparison against one strong tag, "*" matching any. */
export function matchesNoneMatch(header: string | null, etag: string): boolean {
	if (!header) return false;
	if (header.trim() === '*') return true;
	const opaque = etag.replace(/^W\//, '');
	return header.split(',').some((tag) => tag.trim().replace(/^W\//, '') === opaque);
}

export const REVALIDATE = 'private, max-age=0, must-revalidate';
