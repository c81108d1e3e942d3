import { and, desc, eq } from 'drizzle-orm';
import { db, schema } from './db';
import type { Patient } from './db/schema/patients';
import {
	invitationStatus,
	normaliseEmail,
	sendInvitation,
	type InvitationStatus
} from './invitations';
import type { Delivery } from './mail';
import type { Principal } from './auth/principal';

export type PatientAccess = 'active' | InvitationStatus | 'not invited';

function latestInvitation(patientId: string) {
	return db()
		.query.invitations.findFirst({
			where: eq(schema.invitations.patientId, patientId),
			orderBy: desc(schema.invitations.createdAt)
		})
		.sync();
}

/** Whether the patient can sign in yet, or where their invitation stands. */
export function patientAccess(patient: Patient): { status: PatientAccess; invitedAt: Date | null } {
	const invitation = latestInvitation(patient.id);
	if (patient.userId) return { status: 'active', invitedAt: invitation?.createdAt ?? null };
	if (!invitation) return { status: 'not invited', invitedAt: null };
	return { status: invitationStatus(invitation), invitedAt: invitation.createdAt };
}

/** The clinic's patients with their clinicians' names and sign-in status. */
export function listPatients(clinicId: string) {
	const rows = db()
		.select()
		.from(schema.patients)
		.where(eq(schema.patients.clinicId, clinicId))
		.orderBy(schema.patients.fullName)
		.all();
	return rows.map((p) => ({ ...p, ...patientAccess(p), clinicians: cliniciansOf(p.id) }));
}

export function cliniciansOf(patientId: string): string[] {
	return db()
		.select({ name: schema.users.name, email: schema.users.email })
		.from(schema.patientClinicians)
		.innerJoin(schema.users, eq(schema.users.id, schema.patientClinicians.clinicianUserId))
		.where(eq(schema.patientClinicians.patientId, patientId))
		.all()
		.map((c) => c.name ?? c.email);
}

/** One patient of the caller's clinic, or undefined (also when it belongs to another clinic). */
export function findPatientInClinic(clinicId: string, patientId: string): Patient | undefined {
	return db()
		.query.patients.findFirst({
			where: and(eq(schema.patients.id, patientId), eq(schema.patients.clinicId, clinicId))
		})
		.sync();
}

export class PatientError extends Error {}

/** The clinical details a clinician keeps up to date on a patient's record. */
export type PatientDetailsUpdate = Pick<
	Patient,
	| 'fullName'
	| 'affectedSide'
	| 'condition'
	| 'operationDate'
	| 'protocol'
	| 'precautions'
	| 'precautionDetails'
	| 'protocolShiftWeeks'
	| 'slingUntil'
	| 'birthYear'
	| 'sex'
	| 'timeZone'
>;

/**
 * Adds a patient under the inviting clinician and e-mails the invitation. The patient record is
 * written first; a mail failure leaves it in place with the invitation to resend, never half made.
 */
export async function invitePatient(
	clinician: Principal,
	input: Pick<PatientDetailsUpdate, 'fullName' | 'affectedSide' | 'condition'> & {
		email: string;
	} & Partial<PatientDetailsUpdate>
): Promise<Patient & { invitationMail: Delivery['status'] }> {
	const email = normaliseEmail(input.email);
	const existing = db()
		.query.patients.findFirst({
			where: and(eq(schema.patients.clinicId, clinician.clinicId), eq(schema.patients.email, email))
		})
		.sync();
	if (existing)
		throw new PatientError('A patient with that e-mail address is already in your clinic.');
	const patient = db().transaction((tx) => {
		const created = tx
			.insert(schema.patients)
			.values({
				clinicId: clinician.clinicId,
				fullName: input.fullName,
				email,
				affectedSide: input.affectedSide,
				condition: input.condition,
				operationDate: input.operationDate ?? null,
				protocol: input.protocol ?? '',
				precautions: input.precautions ?? [],
				precautionDetails: input.precautionDetails ?? {},
				protocolShiftWeeks: input.protocolShiftWeeks ?? 0,
				slingUntil: input.slingUntil ?? null,
				birthYear: input.birthYear ?? null,
				sex: input.sex ?? null,
				...(input.timeZone ? { timeZone: input.timeZone } : {})
			})
			.returning()
			.get();
		tx.insert(schema.patientClinicians)
			.values({ patientId: created.id, clinicianUserId: clinician.id })
			.run();
		return created;
	});
	const invitation = await sendInvitation({
		clinicId: clinician.clinicId,
		email,
		role: 'patient',
		patientId: patient.id,
		invitedBy: clinician
	});
	return { ...patient, invitationMail: invitation.mail };
}

/** Sends a fresh invitation to a patient who has not signed in yet. */
export async function resendPatientInvitation(
	clinician: Principal,
	patientId: string
): Promise<Delivery['status']> {
	const patient = findPatientInClinic(clinician.clinicId, patientId);
	if (!patient) throw new PatientError('That patient is not in your clinic.');
	if (patient.userId) throw new PatientError('This patient already has an account.');
	const invitation = await sendInvitation({
		clinicId: clinician.clinicId,
		email: patient.email,
		role: 'patient',
		patientId,
		invitedBy: clinician
	});
	return invitation.mail;
}

/** Saves a patient's details; null when the patient is not in the clinician's clinic. */
export function updatePatientDetails(
	clinician: Principal,
	patientId: string,
	details: PatientDetailsUpdate
): Patient | null {
	return (
		db()
			.update(schema.patients)
			.set(details)
			.where(
				and(eq(schema.patients.id, patientId), eq(schema.patients.clinicId, clinician.clinicId))
			)
			.returning()
			.get() ?? null
	);
}
