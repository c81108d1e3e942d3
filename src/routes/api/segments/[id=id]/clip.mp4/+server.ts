import { apiError } from '$lib/server/api';
import { redirectToObject } from '$lib/server/recordings/media';
import { callerSegment } from '$lib/server/segments/access';
import { recordingKeys } from '$lib/server/storage/keys';
import type { RequestHandler } from './$types';

/**
 * A segment's own clip: clinicians of its clinic, and patients with a published programme that
 * uses it, are redirected to a short-lived storage address that serves its byte ranges.
 */
export const GET: RequestHandler = ({ params, request }) => {
	const found = callerSegment(params.id);
	if (found instanceof Response) return found;
	const { segment } = found;
	if (segment.status !== 'ready') return apiError(404, 'This segment has not been cut yet.');
	const key = recordingKeys(segment.clinicId, segment.recordingId).segment(segment.id);
	return redirectToObject(request, key, 'video/mp4');
};

export const HEAD = GET;
