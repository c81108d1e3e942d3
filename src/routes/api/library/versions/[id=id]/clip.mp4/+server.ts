import { servePublicAsset } from '$lib/server/library/serve';
import type { RequestHandler } from './$types';

/** A published exercise's clip (the library's own copy), for anyone, with byte ranges. */
export const GET: RequestHandler = ({ params, request }) =>
	servePublicAsset(request, params.id, 'clip.mp4');

export const HEAD = GET;
