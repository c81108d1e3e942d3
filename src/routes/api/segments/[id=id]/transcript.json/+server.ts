import { json } from '@sveltejs/kit';
import { matchesNoneMatch, REVALIDATE } from '$lib/server/captions/api';
import { segmentTag, segmentTranscript, type SegmentTranscript } from '$lib/server/segments';
import { callerSegment } from '$lib/server/segments/access';
import type { RequestHandler } from './$types';

export type { SegmentTranscript };

/** A segment's cues as transcript lines: id, start, end, text with tags, and plain text. */
export const GET: RequestHandler = ({ params, request }) => {
	const found = callerSegment(params.id);
	if (found instanceof Response) return found;
	const etag = segmentTag(found.segment, 'transcript');
	const headers = { ETag: etag, 'Cache-Control': REVALIDATE };
	if (matchesNoneMatch(request.headers.get('if-none-match'), etag)) {
		return new Response(null, { status: 304, headers });
	}
	return json(segmentTranscript(found.segment) satisfies SegmentTranscript, { headers });
};
