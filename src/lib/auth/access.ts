import type { Role } from './roles';

/**
 * Who may reach a route, decided from its SvelteKit route id alone. Pages are grouped by who uses
 * them — `(public)`, `(patient)`, `(clinician)`, `(educator)`, `(admin)`, and `(member)` for any
 * signed-in person — so the hook can refuse a request before any load runs. Endpoints under
 * `/api` check the caller themselves (they answer JSON, not redirects). Anything else is refused,
 * so a new route outside the groups cannot be public by accident.
 */
export type Access =
	| { kind: 'public' }
	| { kind: 'signed-in' }
	| { kind: 'roles'; roles: readonly Role[] }
	| { kind: 'endpoint' }
	| { kind: 'deny' };

const GROUP_ACCESS: Record<string, Access> = {
	public: { kind: 'public' },
	member: { kind: 'signed-in' },
	patient: { kind: 'roles', roles: ['patient'] },
	clinician: { kind: 'roles', roles: ['clinician'] },
	educator: { kind: 'roles', roles: ['educator'] },
	admin: { kind: 'roles', roles: ['admin'] }
};

export function accessForRoute(routeId: string | null): Access {
	// No route matched: SvelteKit answers 404 itself.
	if (routeId === null) return { kind: 'public' };
	if (routeId === '/api' || routeId.startsWith('/api/')) return { kind: 'endpoint' };
	const group = /^\/\(([a-z-]+)\)/.exec(routeId)?.[1];
	return (group && GROUP_ACCESS[group]) || { kind: 'deny' };
}

export type Decision = 'allow' | 'sign-in' | 'forbidden';

/** Applies an access rule to the caller's role (null when signed out). */
export function decide(access: Access, role: Role | null): Decision {
	switch (access.kind) {
		case 'public':
		case 'endpoint':
			return 'allow';
		case 'signed-in':
			return role ? 'allow' : 'sign-in';
		case 'roles':
			if (!role) return 'sign-in';
			return access.roles.includes(role) ? 'allow' : 'forbidden';
		case 'deny':
			return 'forbidden';
	}
}
