import { serveTrackFile } from '$lib/server/captions/serve';
import type { RequestHandler } from './$types';

/** The track as an SRT download; `?version=N` for an older one. */
export const GET: RequestHandler = ({ params, url, request }) =>
	serveTrackFile(params.id, url, request, 'srt');
