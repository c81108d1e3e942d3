/**
 * Pages and JSON compressed on the way out: the production server (adapter-node) sends its
 * built files precompressed but answers made by the app as they are, and a replay page is about
 * four times smaller gzipped, which is most of a repeat visit's time on a slow phone connection.
 * Answers of the app's endpoints with an ETag (captions, transcripts, media) are left alone, so
 * their validators keep naming the bytes as sent; byte ranges, empty answers and anything already
 * encoded too. A page's own ETag (SvelteKit sets one) becomes weak once the bytes are gzipped,
 * and a weak validator sent back is read as the page's, so revalidation still answers 304.
 */
const COMPRESSIBLE =
	/^(text\/html|application\/json|text\/plain|text\/calendar|image\/svg\+xml)\b/i;

/** A page rendered by SvelteKit (its ETag describes the page, not an endpoint's file). */
function isPage(headers: Headers): boolean {
	return headers.get('x-sveltekit-page') === 'true';
}

/**
 * The request as the page renderer should see it: a weak validator the browser sends back for a
 * gzipped page is compared as the page's own (RFC 9110 §13.1.2: If-None-Match compares weakly).
 */
export function withStrongPageValidator(request: Request): void {
	const sent = request.headers.get('If-None-Match');
	if (!sent?.includes('W/')) return;
	try {
		request.headers.set('If-None-Match', sent.replaceAll('W/', ''));
	} catch {
		// Immutable request headers: the page is sent again in full, which is still correct.
	}
}

/** True when the request accepts gzip (and does not refuse it with q=0). */
export function acceptsGzip(acceptEncoding: string | null): boolean {
	if (!acceptEncoding) return false;
	return acceptEncoding.split(',').some((part) => {
		const [name, ...params] = part.trim().toLowerCase().split(';');
		if (name !== 'gzip' && name !== '*') return false;
		const q = params.map((p) => p.trim()).find((p) => p.startsWith('q='));
		return q === undefined || Number(q.slice(2)) > 0;
	});
}

/** Whether an answer should be compressed for a request, from their headers alone. */
export function shouldCompress(
	request: { method: string; headers: Headers },
	response: { status: number; headers: Headers; body: unknown }
): boolean {
	if (request.method === 'HEAD' || !response.body) return false;
	if (response.status < 200 || response.status === 204 || response.status === 206) return false;
	if (response.status === 304) return false;
	if (response.headers.has('Content-Encoding')) return false;
	if (response.headers.has('ETag') && !isPage(response.headers)) return false;
	if (!COMPRESSIBLE.test(response.headers.get('Content-Type') ?? '')) return false;
	return acceptsGzip(request.headers.get('Accept-Encoding'));
}

/** The answer gzipped on the fly when `shouldCompress` says so; otherwise as it was. */
export function compressed(request: Request, response: Response): Response {
	const vary = () => {
		const current = response.headers.get('Vary');
		return current ? `${current}, Accept-Encoding` : 'Accept-Encoding';
	};
	if (!shouldCompress(request, response) || !response.body) {
		if (COMPRESSIBLE.test(response.headers.get('Content-Type') ?? '')) {
			try {
				response.headers.set('Vary', vary());
			} catch {
				// Immutable headers (a redirect made elsewhere): nothing to vary on.
			}
		}
		return response;
	}
	const headers = new Headers(response.headers);
	headers.set('Content-Encoding', 'gzip');
	headers.set('Vary', vary());
	const etag = headers.get('ETag');
	if (etag && !etag.startsWith('W/')) headers.set('ETag', `W/${etag}`);
	headers.delete('Content-Length');
	return new Response(response.body.pipeThrough(new CompressionStream('gzip')), {
		status: response.status,
		statusText: response.statusText,
		headers
	});
}
