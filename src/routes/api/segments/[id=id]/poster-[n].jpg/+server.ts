import { apiError } from '$lib/server/api';
import { redirectToObject } from '$lib/server/recordings/media';
import { callerSegment } from '$lib/server/segments/access';
import { recordingKeys } from '$lib/server/storage/keys';
import type { RequestHandler } from './$types';

/** One of a segment's posters (poster-0.jpg, poster-1.jpg, …), for the same people as its clip. */
export const GET: RequestHandler = ({ params, request }) => {
	const found = callerSegment(params.id);
	if (found instanceof Response) return found;
	const { segment } = found;
	const index = /^\d{1,2}$/.test(params.n) ? Number(params.n) : -1;
	if (segment.status !== 'ready' || index < 0 || index >= segment.posterCount) {
		return apiError(404, 'Not found.');
	}
	const key = recordingKeys(segment.clinicId, segment.recordingId).segmentPoster(segment.id, index);
	return redirectToObject(request, key, 'image/jpeg');
};

export const HEAD = GET;
