import { compressed, withStrongPageValidator } from '$lib/server/compress';
import {
	error,
	redirect,
	type Handle,
	type HandleServerError,
	type RequestEvent
} from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { dev } from '$app/environment';
// Named apart from the handles' own `resolve`.
import { resolve as pagePath } from '$app/paths';
import { accessForRoute, decide } from '$lib/auth/access';
import { loadPrincipal } from '$lib/server/auth/principal';
import { runWithRequestContext } from '$lib/server/auth/request-context';
import { readSessionClaim, sessionCookieName, type SessionClaim } from '$lib/server/auth/session';
import { sessionIsAlive } from '$lib/server/auth/sessions';
import { config } from '$lib/server/config';
import { db } from '$lib/server/db';
import { startBackgroundWork, stopBackgroundWork, workerInApp } from '$lib/server/jobs';
import { backgroundPlan } from '$lib/server/jobs/engine';
import { withStorageOrigin } from '$lib/server/storage/media-urls';
import { storageOrigin } from '$lib/server/storage/multipart';
import { authHandle } from './auth';
import { holdForFirstFrame } from '$lib/server/pages/replay-first';

/** Fails start-up early with a sentence when configuration or the database is wrong. */
export function init() {
	config();
	db();
	// In production the worker is `npm run worker`; the demo and the e2e stack set WORKER_IN_APP.
	// With BullMQ the app also hands jobs out and writes their outcomes (jobs/engine.ts).
	const plan = backgroundPlan('app', config().QUEUE_ENGINE, workerInApp(dev));
	if (plan.worker || plan.dispatcher || plan.upkeep) {
		startBackgroundWork(plan);
		// adapter-node emits this on SIGTERM/SIGINT: running jobs go back to the queue at once
		// instead of waiting for their heartbeat to go stale.
		process.once('sveltekit:shutdown', () => void stopBackgroundWork());
	}
}

/**
 * Runs the request where Auth.js's callbacks can see the client's address (the sign-in limits
 * count by it; src/lib/server/auth/request-context.ts).
 */
const requestContext: Handle = ({ event, resolve }) =>
	runWithRequestContext({ clientAddress: event.getClientAddress() }, () => resolve(event));

/**
 * A change sent with a body but no Content-Type cannot be read as a form or JSON; say so plainly
 * (400) instead of letting the reader fail as a server error.
 */
const contentTypeRequired: Handle = ({ event, resolve }) => {
	const { method, headers } = event.request;
	const hasBody =
		method !== 'GET' &&
		method !== 'HEAD' &&
		(Number(headers.get('content-length') ?? 0) > 0 || headers.has('transfer-encoding'));
	// Answered here rather than thrown, so the answer passes back through securityHeaders.
	if (hasBody && !headers.get('content-type')) {
		return plainAnswer(
			400,
			'The request had no Content-Type, so it could not be read. Send it from the page’s form.'
		);
	}
	return resolve(event);
};

/**
 * Auth.js's own routes, kept to what Kinelume uses: the e-mailed sign-in link lands on
 * `GET /auth/callback/nodemailer`. Everything else — the raw POST routes that would skip the
 * sign-in page (password callback, link request, sign-out), its built-in pages, the CSRF and
 * session JSON — answers 404. Kinelume's own forms call Auth.js directly from their actions.
 */
const AUTH_ROUTES_IN_USE = new Set([
	'GET /auth/callback/nodemailer',
	'HEAD /auth/callback/nodemailer'
]);

const authRoutes: Handle = ({ event, resolve }) => {
	const path = event.url.pathname;
	if (path === '/auth' || path.startsWith('/auth/')) {
		if (!AUTH_ROUTES_IN_USE.has(`${event.request.method} ${path}`))
			return plainAnswer(404, 'Not found.');
	}
	return resolve(event);
};

function plainAnswer(status: number, message: string): Response {
	return new Response(message, {
		status,
		headers: { 'Content-Type': 'text/plain; charset=utf-8', 'Cache-Control': 'no-store' }
	});
}

/**
 * Who is asking: fills `locals.user` from the session token, the session record and the
 * database. A token whose session was ended (sign-out, a password or role change, a removal) or
 * ran out is treated as no session and its cookie is cleared. Reads of API files (captions,
 * transcripts, posters, media ranges, progress) only read the token; pages and every change go
 * through Auth.js, which also renews the token.
 */
const authentication: Handle = async ({ event, resolve }) => {
	const claim = await sessionClaim(event);
	const alive = claim !== null && sessionIsAlive(claim.sessionId, claim.userId);
	if (claim && !alive) event.cookies.delete(sessionCookieName(event.url), { path: '/' });
	event.locals.user = alive ? loadPrincipal(claim.userId) : null;
	event.locals.sessionId = alive && event.locals.user ? (claim.sessionId ?? null) : null;
	return resolve(event);
};

async function sessionClaim(event: RequestEvent): Promise<SessionClaim | null> {
	const method = event.request.method;
	if ((method === 'GET' || method === 'HEAD') && event.url.pathname.startsWith('/api/')) {
		const read = await readSessionClaim(event.cookies, event.url);
		if (read !== 'chunked') return read;
	}
	const session = await event.locals.auth();
	return session?.user?.id ? { userId: session.user.id, sessionId: session.sessionId } : null;
}

/**
 * May they: decided by route group before any load runs. Loads, actions and endpoints check
 * again through requireRole(), because a guard here alone would not cover every data access.
 */
const authorization: Handle = async ({ event, resolve }) => {
	const access = accessForRoute(event.route.id);
	const decision = decide(access, event.locals.user?.role ?? null);
	if (decision === 'sign-in') {
		const next = event.url.pathname + event.url.search;
		redirect(303, pagePath(`/signin?next=${encodeURIComponent(next)}`));
	}
	if (decision === 'forbidden') {
		// A page of a role's group, merely viewed, gets its 403 from that group's layout load
		// (requireRole), so the error page is drawn in the app's look; an error thrown here could
		// only use the bare error.html. Anything else — actions, other methods, denied routes —
		// stops here.
		const viewingGroupPage =
			access.kind === 'roles' &&
			(event.request.method === 'GET' || event.request.method === 'HEAD');
		if (!viewingGroupPage) error(403, 'Your role does not give access to this page.');
	}
	return resolve(event);
};

/**
 * On a patient's replay the clip's first bytes go before the scripts: the page names no script
 * to preload (only its styles), and its start-up and typeface wait for the clip's first frame
 * and some seconds in hand (lib/server/pages/replay-first), so a slow link carries the poster
 * and the clip first. The player plays without them (the browser's own controls until they
 * arrive). Measured in bench:network.
 */
const REPLAY_ROUTE = '/(patient)/replay/[id=id]';
const replayFirst: Handle = ({ event, resolve }) =>
	event.route.id === REPLAY_ROUTE
		? resolve(event, {
				preload: ({ type }) => type === 'css',
				transformPageChunk: ({ html }) => holdForFirstFrame(html)
			})
		: resolve(event);

/** Pages and JSON gzipped for browsers that accept it (lib/server/compress). */
const compression: Handle = async ({ event, resolve }) => {
	withStrongPageValidator(event.request);
	return compressed(event.request, await resolve(event));
};

const securityHeaders: Handle = async ({ event, resolve }) => {
	let response = await resolve(event);
	// Responses made by Auth.js (redirects) come with immutable headers; copy them to add ours.
	if (isImmutable(response)) response = new Response(response.body, response);
	response.headers.set('X-Content-Type-Options', 'nosniff');
	// Recordings go from the browser straight to storage, and media and pictures come back from
	// it (the media endpoints redirect there), so pages may reach its origin for those alone.
	const csp = response.headers.get('Content-Security-Policy');
	if (csp) response.headers.set('Content-Security-Policy', withStorageOrigin(csp, storageOrigin()));
	response.headers.set('Referrer-Policy', 'strict-origin-when-cross-origin');
	response.headers.set('X-Frame-Options', 'DENY');
	response.headers.set('Permissions-Policy', 'camera=(), microphone=(), geolocation=()');
	// Served over https (ORIGIN says so): browsers must never come back over plain http.
	if (event.url.protocol === 'https:') {
		response.headers.set('Strict-Transport-Security', 'max-age=31536000; includeSubDomains');
	}
	if (event.locals.user && !response.headers.has('Cache-Control')) {
		response.headers.set('Cache-Control', 'private, no-store');
	}
	return response;
};

function isImmutable(response: Response): boolean {
	try {
		response.headers.set('X-Content-Type-Options', 'nosniff');
		return false;
	} catch {
		return true;
	}
}

export const handle = sequence(
	replayFirst,
	compression,
	securityHeaders,
	requestContext,
	contentTypeRequired,
	authRoutes,
	authHandle,
	authentication,
	authorization
);

export const handleError: HandleServerError = ({ error: err, event, status }) => {
	if (status !== 404) console.error(`[${event.request.method} ${event.url.pathname}]`, err);
	return {
		message: status === 404 ? 'Not found.' : 'Something went wrong on our side. Please try again.'
	};
};
