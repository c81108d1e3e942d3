import { servePublicAsset } from '$lib/server/library/serve';
import type { RequestHandler } from './$types';

/** One of a published exercise's posters (poster-0.jpg, …), for anyone. */
export const GET: RequestHandler = ({ params, request }) =>
	servePublicAsset(request, params.id, `poster-${params.n}.jpg`);

export const HEAD = GET;
