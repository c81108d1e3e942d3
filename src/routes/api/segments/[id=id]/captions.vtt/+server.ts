import { serveCaptionFile } from '$lib/server/captions/serve';
import { segmentVtt } from '$lib/server/segments';
import { callerSegment } from '$lib/server/segments/access';
import type { RequestHandler } from './$types';

/**
 * A segment's captions as WebVTT, starting at zero with the clip, for its `<track>`. They never
 * change once confirmed, so the strong ETag answers every revalidation with 304.
 */
export const GET: RequestHandler = ({ params, request }) => {
	const found = callerSegment(params.id);
	if (found instanceof Response) return found;
	return serveCaptionFile(request, { ...segmentVtt(found.segment), format: 'vtt' });
};
