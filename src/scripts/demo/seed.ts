import { and, eq } from 'drizzle-orm';
import { db, schema } from '../../lib/server/db';
import type { StaffRole } from '../../lib/server/db/schema/clinics';
import { hashPassword } from '../../lib/server/auth/passwords';
import { sendInvitation } from '../../lib/server/invitations';

/**
 * The demo scenario (DESIGN.md §6): an invented community clinic running knee-replacement
 * rehabilitation and balance classes, plus a second invented clinic so that the separation
 * between clinics can be seen. Every person, address and clinic here is made up; addresses use
 * the reserved `.example` domain.
 */
export const DEMO_PASSWORD = 'demo-kinelume-2026';

export const DEMO_CLINICS = {
	alder: 'Alder Street Community Clinic',
	harbour: 'Harbour Lane Physiotherapy'
} as const;

interface StaffSeed {
	clinic: keyof typeof DEMO_CLINICS;
	name: string;
	email: string;
	role: StaffRole;
}

interface PatientSeed {
	clinic: keyof typeof DEMO_CLINICS;
	name: string;
	email: string;
	side: 'left' | 'right' | 'both' | 'not applicable';
	condition: string;
	clinicianEmail: string;
	/** Whether the patient has already accepted and can sign in. */
	active: boolean;
}

export const DEMO_STAFF: StaffSeed[] = [
	{ clinic: 'alder', name: 'Rowan Hale', email: 'admin@alder-street.example', role: 'admin' },
	{
		clinic: 'alder',
		name: 'Imogen Fenwick',
		email: 'clinician@alder-street.example',
		role: 'clinician'
	},
	{ clinic: 'alder', name: 'Dario Lusk', email: 'educator@alder-street.example', role: 'educator' },
	{ clinic: 'harbour', name: 'Signe Talbot', email: 'admin@harbour-lane.example', role: 'admin' },
	{
		clinic: 'harbour',
		name: 'Kofi Brandt',
		email: 'clinician@harbour-lane.example',
		role: 'clinician'
	}
];

export const DEMO_PATIENTS: PatientSeed[] = [
	{
		clinic: 'alder',
		name: 'Walter Brindle',
		email: 'patient@alder-street.example',
		side: 'left',
		condition: 'Left total knee replacement',
		clinicianEmail: 'clinician@alder-street.example',
		active: true
	},
	{
		clinic: 'alder',
		name: 'Edna Marsh',
		email: 'edna.marsh@alder-street.example',
		side: 'not applicable',
		condition: 'Balance class after a fall',
		clinicianEmail: 'clinician@alder-street.example',
		active: true
	},
	{
		clinic: 'alder',
		name: 'Percy Oakes',
		email: 'percy.oakes@alder-street.example',
		side: 'right',
		condition: 'Right total knee replacement',
		clinicianEmail: 'clinician@alder-street.example',
		active: false
	},
	{
		clinic: 'harbour',
		name: 'Greta Vale',
		email: 'patient@harbour-lane.example',
		side: 'right',
		condition: 'Right knee arthroscopy',
		clinicianEmail: 'clinician@harbour-lane.example',
		active: true
	}
];

export interface DemoAccount {
	role: string;
	name: string;
	email: string;
	clinic: string;
}

function ensureClinic(name: string): string {
	const store = db();
	const found = store.query.clinics.findFirst({ where: eq(schema.clinics.name, name) }).sync();
	return found?.id ?? store.insert(schema.clinics).values({ name }).returning().get().id;
}

function ensureUser(email: string, name: string, passwordHash: string): string {
	const store = db();
	const found = store.query.users.findFirst({ where: eq(schema.users.email, email) }).sync();
	if (found) {
		store
			.update(schema.users)
			.set({ name, passwordHash })
			.where(eq(schema.users.id, found.id))
			.run();
		return found.id;
	}
	return store
		.insert(schema.users)
		.values({ email, name, passwordHash, emailVerified: new Date() })
		.returning()
		.get().id;
}

/**
 * Creates or refreshes the demo data; safe to run again (it never duplicates, and it resets the
 * demo passwords). Invitations are sent through the real mail path, so the mail fake must run.
 */
export async function seedDemo(): Promise<DemoAccount[]> {
	const store = db();
	const passwordHash = await hashPassword(DEMO_PASSWORD);
	const clinicIds = {
		alder: ensureClinic(DEMO_CLINICS.alder),
		harbour: ensureClinic(DEMO_CLINICS.harbour)
	};
	const accounts: DemoAccount[] = [];

	for (const staff of DEMO_STAFF) {
		const userId = ensureUser(staff.email, staff.name, passwordHash);
		const membership = store.query.memberships
			.findFirst({ where: eq(schema.memberships.userId, userId) })
			.sync();
		if (membership) {
			store
				.update(schema.memberships)
				.set({ role: staff.role, clinicId: clinicIds[staff.clinic] })
				.where(eq(schema.memberships.id, membership.id))
				.run();
		} else {
			store
				.insert(schema.memberships)
				.values({ userId, clinicId: clinicIds[staff.clinic], role: staff.role })
				.run();
		}
		accounts.push({
			role: staff.role,
			name: staff.name,
			email: staff.email,
			clinic: DEMO_CLINICS[staff.clinic]
		});
	}

	for (const seed of DEMO_PATIENTS) {
		const clinicId = clinicIds[seed.clinic];
		let patient = store.query.patients
			.findFirst({
				where: and(eq(schema.patients.clinicId, clinicId), eq(schema.patients.email, seed.email))
			})
			.sync();
		patient ??= store
			.insert(schema.patients)
			.values({
				clinicId,
				fullName: seed.name,
				email: seed.email,
				affectedSide: seed.side,
				condition: seed.condition
			})
			.returning()
			.get();
		const clinician = store.query.users
			.findFirst({ where: eq(schema.users.email, seed.clinicianEmail) })
			.sync();
		if (clinician) {
			store
				.insert(schema.patientClinicians)
				.values({ patientId: patient.id, clinicianUserId: clinician.id })
				.onConflictDoNothing()
				.run();
		}
		if (seed.active) {
			const userId = ensureUser(seed.email, seed.name, passwordHash);
			store.update(schema.patients).set({ userId }).where(eq(schema.patients.id, patient.id)).run();
			accounts.push({
				role: 'patient',
				name: seed.name,
				email: seed.email,
				clinic: DEMO_CLINICS[seed.clinic]
			});
		} else if (clinician) {
			const invited = store.query.invitations
				.findFirst({ where: eq(schema.invitations.patientId, patient.id) })
				.sync();
			if (!invited) {
				await sendInvitation({
					clinicId,
					email: seed.email,
					role: 'patient',
					patientId: patient.id,
					invitedBy: { id: clinician.id, name: clinician.name ?? clinician.email }
				});
			}
		}
	}

	// One staff invitation waiting, so the admin's table shows how invitations look.
	const alderAdmin = store.query.users
		.findFirst({ where: eq(schema.users.email, 'admin@alder-street.example') })
		.sync();
	const pendingEmail = 'new.clinician@alder-street.example';
	if (
		alderAdmin &&
		!store.query.invitations.findFirst({ where: eq(schema.invitations.email, pendingEmail) }).sync()
	) {
		await sendInvitation({
			clinicId: clinicIds.alder,
			email: pendingEmail,
			role: 'clinician',
			invitedBy: { id: alderAdmin.id, name: alderAdmin.name ?? 'Admin' }
		});
	}
	return accounts;
}
