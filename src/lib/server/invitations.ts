import { createHash, randomBytes } from 'node:crypto';
import { and, eq, isNull } from 'drizzle-orm';
import { config } from './config';
import { db, schema } from './db';
import type { Invitation, InvitedRole } from './db/schema/invitations';
import { recordAudit } from './audit';
import { hashPassword } from './auth/passwords';
import { sendMail, type Delivery } from './mail';
import { patientInvitationMail, staffInvitationMail } from './mail/templates';

export function normaliseEmail(email: string): string {
	return email.trim().toLowerCase();
}

function tokenHash(token: string): string {
	return createHash('sha256').update(token).digest('hex');
}

export type InvitationStatus = 'pending' | 'accepted' | 'expired' | 'revoked';

export function invitationStatus(invitation: Invitation, now = new Date()): InvitationStatus {
	if (invitation.acceptedAt) return 'accepted';
	if (invitation.revokedAt) return 'revoked';
	if (invitation.expiresAt <= now) return 'expired';
	return 'pending';
}

/**
 * Creates an invitation and e-mails its link. Earlier pending invitations for the same address
 * in the same clinic are revoked, so only the newest link works.
 */
export async function sendInvitation(input: {
	clinicId: string;
	email: string;
	role: InvitedRole;
	patientId?: string;
	invitedBy: { id: string; name: string };
}): Promise<Invitation & { mail: Delivery['status'] }> {
	const email = normaliseEmail(input.email);
	const token = randomBytes(32).toString('base64url');
	const expiresAt = new Date(Date.now() + config().INVITATION_TTL_HOURS * 3_600_000);
	const store = db();
	const clinic = store.query.clinics
		.findFirst({ where: eq(schema.clinics.id, input.clinicId) })
		.sync();
	if (!clinic) throw new Error(`No clinic ${input.clinicId}`);

	const invitation = store.transaction((tx) => {
		tx.update(schema.invitations)
			.set({ revokedAt: new Date() })
			.where(
				and(
					eq(schema.invitations.clinicId, input.clinicId),
					eq(schema.invitations.email, email),
					isNull(schema.invitations.acceptedAt),
					isNull(schema.invitations.revokedAt)
				)
			)
			.run();
		return tx
			.insert(schema.invitations)
			.values({
				clinicId: input.clinicId,
				email,
				role: input.role,
				patientId: input.patientId ?? null,
				tokenHash: tokenHash(token),
				invitedByUserId: input.invitedBy.id,
				expiresAt
			})
			.returning()
			.get();
	});

	const url = new URL(`/invite/${token}`, config().ORIGIN).toString();
	const patient = input.patientId
		? store.query.patients.findFirst({ where: eq(schema.patients.id, input.patientId) }).sync()
		: undefined;
	const content =
		input.role === 'patient'
			? patientInvitationMail({
					clinicName: clinic.name,
					patientName: patient?.fullName || email,
					clinicianName: input.invitedBy.name,
					url,
					expiresAt,
					// The patient reads it at home: their own zone, which starts as the clinic's.
					timeZone: patient?.timeZone ?? clinic.timeZone
				})
			: staffInvitationMail({
					clinicName: clinic.name,
					role: input.role,
					inviterName: input.invitedBy.name,
					url,
					expiresAt,
					timeZone: clinic.timeZone
				});
	const delivery = await sendMail({ clinicId: input.clinicId, to: email, ...content });
	recordAudit({
		kind: 'invitation-sent',
		clinicId: input.clinicId,
		actorUserId: input.invitedBy.id,
		subject: email,
		detail: { role: input.role, invitationId: invitation.id }
	});
	return { ...invitation, mail: delivery.status };
}

export interface InvitationView {
	invitation: Invitation;
	status: InvitationStatus;
	clinicName: string;
	/** Whether an account with this address exists already (it then joins with its own password). */
	accountExists: boolean;
}

/** Looks an invitation up by the token in its link. */
export function findInvitation(token: string): InvitationView | null {
	if (!/^[A-Za-z0-9_-]{20,100}$/.test(token)) return null;
	const store = db();
	const row = store
		.select({ invitation: schema.invitations, clinicName: schema.clinics.name })
		.from(schema.invitations)
		.innerJoin(schema.clinics, eq(schema.clinics.id, schema.invitations.clinicId))
		.where(eq(schema.invitations.tokenHash, tokenHash(token)))
		.get();
	if (!row) return null;
	const account = store.query.users
		.findFirst({ where: eq(schema.users.email, row.invitation.email) })
		.sync();
	return { ...row, status: invitationStatus(row.invitation), accountExists: Boolean(account) };
}

export class InvitationError extends Error {}

/**
 * Accepts an invitation: creates the account (or uses the existing one with this address),
 * gives it its role in the clinic, and marks the link used — all in one transaction, so a
 * failure leaves nothing half made and a second use of the link finds it spent.
 */
export async function acceptInvitation(
	token: string,
	input: { name: string; password: string | null }
): Promise<{ userId: string; email: string }> {
	const found = findInvitation(token);
	if (!found) throw new InvitationError('This invitation link is not valid.');
	if (found.status !== 'pending') throw new InvitationError(statusSentence(found.status));
	const { invitation } = found;
	const passwordHash = input.password ? await hashPassword(input.password) : null;

	return db().transaction((tx) => {
		// Re-read inside the transaction: a parallel acceptance may have won.
		const fresh = tx.query.invitations
			.findFirst({ where: eq(schema.invitations.id, invitation.id) })
			.sync();
		if (!fresh || invitationStatus(fresh) !== 'pending')
			throw new InvitationError(statusSentence('accepted'));

		let user = tx.query.users.findFirst({ where: eq(schema.users.email, invitation.email) }).sync();
		if (user) {
			const hasMembership = tx.query.memberships
				.findFirst({ where: eq(schema.memberships.userId, user.id) })
				.sync();
			const hasPatient = tx.query.patients
				.findFirst({ where: eq(schema.patients.userId, user.id) })
				.sync();
			if (hasMembership || hasPatient) {
				throw new InvitationError(
					'This e-mail address already belongs to a Kinelume account in a clinic. Ask the clinic to invite another address.'
				);
			}
			tx.update(schema.users)
				.set({
					name: input.name,
					emailVerified: new Date(),
					...(passwordHash ? { passwordHash } : {})
				})
				.where(eq(schema.users.id, user.id))
				.run();
		} else {
			user = tx
				.insert(schema.users)
				.values({
					email: invitation.email,
					name: input.name,
					passwordHash,
					emailVerified: new Date()
				})
				.returning()
				.get();
		}

		if (invitation.role === 'patient') {
			if (!invitation.patientId)
				throw new InvitationError('This invitation is missing its patient record.');
			tx.update(schema.patients)
				.set({ userId: user.id })
				.where(
					and(
						eq(schema.patients.id, invitation.patientId),
						eq(schema.patients.clinicId, invitation.clinicId)
					)
				)
				.run();
		} else {
			tx.insert(schema.memberships)
				.values({ userId: user.id, clinicId: invitation.clinicId, role: invitation.role })
				.run();
		}
		tx.update(schema.invitations)
			.set({ acceptedAt: new Date() })
			.where(eq(schema.invitations.id, invitation.id))
			.run();
		tx.insert(schema.auditEvents)
			.values({
				kind: 'invitation-accepted',
				clinicId: invitation.clinicId,
				actorUserId: user.id,
				subject: invitation.email,
				detail: { role: invitation.role, invitationId: invitation.id }
			})
			.run();
		return { userId: user.id, email: invitation.email };
	});
}

export function statusSentence(status: InvitationStatus): string {
	switch (status) {
		case 'accepted':
			return 'This invitation link has already been used. Sign in instead, or ask for a new invitation.';
		case 'expired':
			return 'This invitation link has expired. Ask the clinic to send a new one.';
		case 'revoked':
			return 'This invitation was withdrawn or replaced by a newer one. Use the newest e-mail, or ask the clinic.';
		case 'pending':
			return 'This invitation is waiting to be accepted.';
	}
}
