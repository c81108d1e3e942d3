import { json } from '@sveltejs/kit';
import { matchesNoneMatch, REVALIDATE } from '$lib/server/captions/api';
import {
	segmentCaptions,
	segmentTag,
	segmentTranscript,
	type SegmentTranscript
} from '$lib/server/segments';
import { callerSegment } from '$lib/server/segments/access';
import type { RequestHandler } from './$types';

export type { SegmentTranscript };

/**
 * A segment's captions as transcript lines (id, start, end, text with tags, plain text): the
 * recording's current track clipped to the segment, tagged by the version shown.
 */
export const GET: RequestHandler = ({ params, request }) => {
	const found = callerSegment(params.id);
	if (found instanceof Response) return found;
	const captions = segmentCaptions(found.segment);
	const etag = segmentTag(found.segment, 'transcript', captions);
	const headers = { ETag: etag, 'Cache-Control': REVALIDATE };
	if (matchesNoneMatch(request.headers.get('if-none-match'), etag)) {
		return new Response(null, { status: 304, headers });
	}
	return json(segmentTranscript(found.segment, captions) satisfies SegmentTranscript, {
		headers
	});
};
