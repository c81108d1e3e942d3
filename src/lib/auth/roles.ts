/** Every role a signed-in person can have. The public (signed out) is the absence of a role. */
export const ROLES = ['admin', 'clinician', 'educator', 'patient'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
	admin: 'Clinic admin',
	clinician: 'Clinician',
	educator: 'Educator',
	patient: 'Patient'
};

/** Where each role lands after signing in. */
export const ROLE_HOME: Record<Role, string> = {
	admin: '/clinic',
	clinician: '/patients',
	educator: '/curate',
	patient: '/today'
};
