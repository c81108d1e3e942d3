import { serveSubmissionCaptions } from '$lib/server/library/serve';
import type { RequestHandler } from './$types';

/** A submission's captions as it was submitted, for educators reviewing it (never public). */
export const GET: RequestHandler = ({ params, request }) =>
	serveSubmissionCaptions(request, params.id);
