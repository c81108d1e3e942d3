import {
	error,
	redirect,
	type Handle,
	type HandleServerError,
	type RequestEvent
} from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { accessForRoute, decide } from '$lib/auth/access';
import { loadPrincipal } from '$lib/server/auth/principal';
import { readSessionUserId } from '$lib/server/auth/session';
import { config } from '$lib/server/config';
import { db } from '$lib/server/db';
import { startBackgroundWork, stopBackgroundWork } from '$lib/server/jobs';
import { storageOrigin } from '$lib/server/storage/multipart';
import { authHandle } from './auth';

/** Fails start-up early with a sentence when configuration or the database is wrong. */
export function init() {
	config();
	db();
	if (config().WORKER_IN_APP) {
		startBackgroundWork();
		// adapter-node emits this on SIGTERM/SIGINT: running jobs go back to the queue at once
		// instead of waiting for their heartbeat to go stale.
		process.once('sveltekit:shutdown', () => void stopBackgroundWork());
	}
}

/**
 * Who is asking: fills `locals.user` from the session token and the database. Reads of API
 * files (captions, transcripts, posters, media ranges, progress) only read the token; pages and
 * every change go through Auth.js, which also renews the session.
 */
const authentication: Handle = async ({ event, resolve }) => {
	const userId = await sessionUserId(event);
	event.locals.user = userId ? loadPrincipal(userId) : null;
	return resolve(event);
};

async function sessionUserId(event: RequestEvent): Promise<string | null> {
	const method = event.request.method;
	if ((method === 'GET' || method === 'HEAD') && event.url.pathname.startsWith('/api/')) {
		const read = await readSessionUserId(event.cookies, event.url);
		if (read !== 'chunked') return read;
	}
	return (await event.locals.auth())?.user?.id ?? null;
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
		redirect(303, `/signin?next=${encodeURIComponent(next)}`);
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

const securityHeaders: Handle = async ({ event, resolve }) => {
	let response = await resolve(event);
	// Responses made by Auth.js (redirects) come with immutable headers; copy them to add ours.
	if (isImmutable(response)) response = new Response(response.body, response);
	response.headers.set('X-Content-Type-Options', 'nosniff');
	// Recordings go from the browser straight to storage, so pages may connect to its origin.
	const csp = response.headers.get('Content-Security-Policy');
	if (csp?.includes("connect-src 'self'")) {
		response.headers.set(
			'Content-Security-Policy',
			csp.replace("connect-src 'self'", `connect-src 'self' ${storageOrigin()}`)
		);
	}
	response.headers.set('Referrer-Policy', 'strict-origin-when-cross-origin');
	response.headers.set('X-Frame-Options', 'DENY');
	response.headers.set('Permissions-Policy', 'camera=(), microphone=(), geolocation=()');
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

export const handle = sequence(securityHeaders, authHandle, authentication, authorization);

export const handleError: HandleServerError = ({ error: err, event, status }) => {
	if (status !== 404) console.error(`[${event.request.method} ${event.url.pathname}]`, err);
	return {
		message: status === 404 ? 'Not found.' : 'Something went wrong on our side. Please try again.'
	};
};
