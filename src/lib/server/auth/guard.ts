import { error, redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { getRequestEvent } from '$app/server';
import type { Role } from '$lib/auth/roles';
import type { Principal } from './principal';

function isEndpoint(routeId: string | null): boolean {
	return routeId === '/api' || (routeId?.startsWith('/api/') ?? false);
}

/**
 * The signed-in caller, or a stop: pages send the signed-out to the sign-in page (coming back
 * afterwards), endpoints answer 401. Call it in every load, action and endpoint that touches data,
 * even when the hook already checked the route group.
 */
export function requireUser(): Principal {
	const event = getRequestEvent();
	const user = event.locals.user;
	if (user) return user;
	if (isEndpoint(event.route.id)) error(401, 'Sign in to continue.');
	const next = event.url.pathname + event.url.search;
	redirect(303, resolve(`/signin?next=${encodeURIComponent(next)}`));
}

/** The caller, who must hold one of `roles`; otherwise 403. */
export function requireRole(...roles: Role[]): Principal {
	const user = requireUser();
	if (!roles.includes(user.role)) error(403, 'Your role does not give access to this page.');
	return user;
}

/**
 * Stops a request for a record of another clinic. Answers 404 rather than 403 so that one clinic
 * cannot learn which ids exist in another.
 */
export function requireSameClinic(user: Principal, clinicId: string | null | undefined): void {
	if (!clinicId || clinicId !== user.clinicId) error(404, 'Not found.');
}
