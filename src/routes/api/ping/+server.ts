import type { RequestHandler } from './$types';

/**
 * An empty answer for anyone: an upload waiting for the network asks it every few seconds to
 * tell "the network is back" (any answer) from "still nothing", since `navigator.onLine` can say
 * online on a network that reaches nothing. It touches no database, storage or mail, unlike
 * `/api/health`.
 */
export const GET: RequestHandler = () =>
	new Response(null, { status: 204, headers: { 'Cache-Control': 'no-store' } });
