import { servePublicCaptions } from '$lib/server/library/serve';
import type { RequestHandler } from './$types';

/** A published exercise's captions as WebVTT, for its `<track>`, for anyone. */
export const GET: RequestHandler = ({ params, request }) => servePublicCaptions(request, params.id);
