import { serveSubmissionAsset } from '$lib/server/library/serve';
import type { RequestHandler } from './$types';

/** One of the posters behind a submission, for educators reviewing it (never public). */
export const GET: RequestHandler = ({ params, request }) =>
	serveSubmissionAsset(request, params.id, `poster-${params.n}.jpg`);

export const HEAD = GET;
