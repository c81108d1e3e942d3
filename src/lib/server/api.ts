import { json } from '@sveltejs/kit';
import { getRequestEvent } from '$app/server';
import type { Role } from '$lib/auth/roles';
import type { Principal } from './auth/principal';

/** The one shape every JSON error from /api takes. */
export interface ApiError {
	error: { status: number; message: string };
}

export function apiError(status: number, message: string): Response {
	return json({ error: { status, message } } satisfies ApiError, { status });
}

/**
 * The caller of an endpoint, who must hold one of `roles`; otherwise the JSON error to return
 * (401 signed out, 403 wrong role). Endpoints return it as is: `if (caller instanceof Response)`.
 */
export function apiCaller(...roles: Role[]): Principal | Response {
	const user = getRequestEvent().locals.user;
	if (!user) return apiError(401, 'Sign in to continue.');
	if (!roles.includes(user.role)) return apiError(403, 'Your role does not give access to this.');
	return user;
}
