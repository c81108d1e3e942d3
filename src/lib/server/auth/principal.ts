import { eq, sql } from 'drizzle-orm';
import type { Role } from '$lib/auth/roles';
import { prepared, schema } from '../db';

/** The signed-in person as every server check sees them: who, which role, which clinic. */
export interface Principal {
	id: string;
	email: string;
	name: string;
	role: Role;
	clinicId: string;
	clinicName: string;
	/** Set for patients: their patient record. */
	patientId: string | null;
	/** Where times are shown for them: the clinic's time zone, or a patient's own. */
	timeZone: string;
}

/**
 * Reads the user's current role and clinic from the database on every request, so a role change
 * or a removal takes effect at once rather than when a session token expires. A user with no
 * membership and no patient record has no principal and is treated as signed out.
 */
export function loadPrincipal(userId: string): Principal | null {
	const statements = principalStatements();
	const user = statements.user.get({ userId });
	if (!user) return null;
	const staff = statements.staff.get({ userId });
	if (staff) {
		return {
			id: user.id,
			email: user.email,
			name: user.name ?? user.email,
			...staff,
			patientId: null
		};
	}
	const patient = statements.patient.get({ userId });
	if (patient) {
		return {
			id: user.id,
			email: user.email,
			name: user.name ?? patient.fullName,
			role: 'patient',
			clinicId: patient.clinicId,
			clinicName: patient.clinicName,
			patientId: patient.patientId,
			timeZone: patient.timeZone
		};
	}
	return null;
}

// Every request runs these three.
const principalStatements = prepared((store) => {
	const userId = sql.placeholder('userId');
	return {
		user: store
			.select({ id: schema.users.id, email: schema.users.email, name: schema.users.name })
			.from(schema.users)
			.where(eq(schema.users.id, userId))
			.prepare(),
		staff: store
			.select({
				role: schema.memberships.role,
				clinicId: schema.clinics.id,
				clinicName: schema.clinics.name,
				timeZone: schema.clinics.timeZone
			})
			.from(schema.memberships)
			.innerJoin(schema.clinics, eq(schema.clinics.id, schema.memberships.clinicId))
			.where(eq(schema.memberships.userId, userId))
			.prepare(),
		patient: store
			.select({
				patientId: schema.patients.id,
				clinicId: schema.clinics.id,
				clinicName: schema.clinics.name,
				fullName: schema.patients.fullName,
				timeZone: schema.patients.timeZone
			})
			.from(schema.patients)
			.innerJoin(schema.clinics, eq(schema.clinics.id, schema.patients.clinicId))
			.where(eq(schema.patients.userId, userId))
			.prepare()
	};
});
