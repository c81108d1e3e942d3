import { serveCaptionFile } from '$lib/server/captions/serve';
import { segmentVtt } from '$lib/server/segments';
import { callerSegment } from '$lib/server/segments/access';
import type { RequestHandler } from './$types';

/**
 * A segment's captions as WebVTT, starting at zero with the clip, for its `<track>`: the
 * recording's current captions track clipped to the segment, so a saved fix reaches patients at
 * once. The strong ETag names the track version, so revalidation answers 304 until the next fix.
 */
export const GET: RequestHandler = ({ params, request }) => {
	const found = callerSegment(params.id);
	if (found instanceof Response) return found;
	return serveCaptionFile(request, { ...segmentVtt(found.segment), format: 'vtt' });
};
