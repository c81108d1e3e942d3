import { apiError } from '$lib/server/api';
import { segmentClipKey } from '$lib/server/library/media';
import { redirectToObject, versionAsked } from '$lib/server/recordings/media';
import { callerSegment } from '$lib/server/segments/access';
import type { RequestHandler } from './$types';

/**
 * A segment's own clip: clinicians of its clinic, and patients with a published programme that
 * uses it, are redirected to a short-lived storage address that serves its byte ranges.
 * `?v=360` or `?v=540` asks for a smaller version of the bitrate ladder; a clip cut before the
 * ladder (or without that size) answers with the clip itself.
 */
export const GET: RequestHandler = ({ params, request }) => {
	const found = callerSegment(params.id);
	if (found instanceof Response) return found;
	const { segment } = found;
	if (segment.status !== 'ready') return apiError(404, 'This segment has not been cut yet.');
	const short = versionAsked(request);
	if (short instanceof Response) return short;
	return redirectToObject(request, segmentClipKey(segment, short), 'video/mp4');
};

export const HEAD = GET;
