import type { Pathname } from '$app/types';

/** Every role a signed-in person can have. The public (signed out) is the absence of a role. */
export const ROLES = ['admin', 'clinician', 'educator', 'patient'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
	admin: 'Clinic admin',
	clinician: 'Clinician',
	educator: 'Educator',
	patient: 'Patient'
};

/** Where each role lands after signing in (a page's path: resolve() it for a link). */
export const ROLE_HOME = {
	admin: '/clinic',
	clinician: '/patients',
	educator: '/curate',
	patient: '/today'
} as const satisfies Record<Role, Pathname>;
