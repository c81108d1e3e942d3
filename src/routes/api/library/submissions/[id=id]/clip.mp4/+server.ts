import { serveSubmissionAsset } from '$lib/server/library/serve';
import type { RequestHandler } from './$types';

/** The clip behind a submission, for educators reviewing it (never public). */
export const GET: RequestHandler = ({ params, request }) =>
	serveSubmissionAsset(request, params.id, 'clip.mp4');

export const HEAD = GET;
