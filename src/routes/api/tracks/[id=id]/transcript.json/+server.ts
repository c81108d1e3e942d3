import { json } from '@sveltejs/kit';
import { apiError } from '$lib/server/api';
import { exportTag, transcript, type Transcript } from '$lib/server/captions';
import { callerTrack, matchesNoneMatch, REVALIDATE, versionParam } from '$lib/server/captions/api';
import type { RequestHandler } from './$types';

export type { Transcript };

/** The track's cues as lines of a transcript (text with tags and plain); `?version=N` for an older one. */
export const GET: RequestHandler = ({ params, url, request }) => {
	const found = callerTrack(params.id);
	if (found instanceof Response) return found;
	const version = versionParam(url);
	if (version instanceof Response) return version;
	// Versions run from 1 to the current one and never change: a revalidation is answered
	// from the tag alone, before the lines are read back from the served file.
	const wanted = version ?? found.track.currentVersion;
	if (wanted > found.track.currentVersion) {
		return apiError(404, `There is no version ${version} of this track.`);
	}
	const etag = exportTag(found.track.id, wanted, 'transcript');
	const headers = { ETag: etag, 'Cache-Control': REVALIDATE };
	if (matchesNoneMatch(request.headers.get('if-none-match'), etag)) {
		return new Response(null, { status: 304, headers });
	}
	const body = transcript(found.track, version);
	if (!body) return apiError(404, `There is no version ${version} of this track.`);
	return json(body satisfies Transcript, { headers });
};
