/**
 * Byte ranges from a saved whole file. The Cache API keeps only whole 200 responses, but a video
 * element asks for ranges (`Range: bytes=0-`, then wherever it seeks), so the service worker
 * answers them itself from the saved body, by the same rules as the media endpoints
 * (src/lib/media/byte-range.ts, RFC 9110 §14).
 */
import {
	contentRange,
	ifRangeAllows,
	parseHttpDate,
	parseRange,
	rangeLength
} from '$lib/media/byte-range';

/** Answers `request` (GET or HEAD) from `saved`, a whole file with status 200. */
export async function answerFromSaved(
	saved: Response,
	request: Pick<Request, 'method' | 'headers'>
): Promise<Response> {
	const body = await saved.blob();
	const length = body.size;
	const etag = saved.headers.get('ETag');
	const modified = saved.headers.get('Last-Modified');
	const modifiedAt = modified ? parseHttpDate(modified) : null;
	const headers = new Headers({ 'Accept-Ranges': 'bytes', 'Cache-Control': 'no-store' });
	const type = saved.headers.get('Content-Type');
	if (type) headers.set('Content-Type', type);
	if (etag) headers.set('ETag', etag);
	if (modified) headers.set('Last-Modified', modified);

	let range = parseRange(request.headers.get('Range'), length);
	if (
		range.kind !== 'none' &&
		!ifRangeAllows(
			request.headers.get('If-Range'),
			etag,
			modifiedAt === null ? null : new Date(modifiedAt)
		)
	) {
		range = { kind: 'none' };
	}
	if (range.kind === 'unsatisfiable') {
		headers.set('Content-Range', contentRange(null, length));
		headers.delete('Content-Type');
		return new Response(null, { status: 416, headers });
	}
	const head = request.method === 'HEAD';
	// Several ranges get the whole file with 200, which RFC 9110 allows (players never ask so).
	const single = range.kind === 'ranges' && range.ranges.length === 1 ? range.ranges[0] : null;
	if (single) {
		headers.set('Content-Range', contentRange(single, length));
		headers.set('Content-Length', String(rangeLength(single)));
		return new Response(head ? null : body.slice(single.start, single.end + 1), {
			status: 206,
			headers
		});
	}
	headers.set('Content-Length', String(length));
	return new Response(head ? null : body, { status: 200, headers });
}
