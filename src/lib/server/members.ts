import { and, desc, eq, isNull, ne } from 'drizzle-orm';
import { db, schema } from './db';
import type { StaffRole } from './db/schema/clinics';
import { recordAudit } from './audit';
import { invitationStatus } from './invitations';
import type { Principal } from './auth/principal';
import { endSessionsOf } from './auth/sessions';

export class MemberError extends Error {}

/** The clinic's staff with their roles, admins first. */
export function listMembers(clinicId: string) {
	return db()
		.select({
			membershipId: schema.memberships.id,
			userId: schema.users.id,
			name: schema.users.name,
			email: schema.users.email,
			role: schema.memberships.role,
			joinedAt: schema.memberships.createdAt
		})
		.from(schema.memberships)
		.innerJoin(schema.users, eq(schema.users.id, schema.memberships.userId))
		.where(eq(schema.memberships.clinicId, clinicId))
		.orderBy(schema.memberships.role, schema.users.name)
		.all();
}

/** Staff invitations of the clinic that are not yet accepted, newest first, with their status. */
export function listStaffInvitations(clinicId: string) {
	return db()
		.select()
		.from(schema.invitations)
		.where(
			and(
				eq(schema.invitations.clinicId, clinicId),
				ne(schema.invitations.role, 'patient'),
				isNull(schema.invitations.acceptedAt),
				isNull(schema.invitations.revokedAt)
			)
		)
		.orderBy(desc(schema.invitations.createdAt))
		.all()
		.map((i) => ({ ...i, status: invitationStatus(i) }));
}

function membershipInClinic(actor: Principal, membershipId: string) {
	const membership = db()
		.query.memberships.findFirst({
			where: and(
				eq(schema.memberships.id, membershipId),
				eq(schema.memberships.clinicId, actor.clinicId)
			)
		})
		.sync();
	if (!membership) throw new MemberError('That member is not in your clinic.');
	return membership;
}

function adminCount(clinicId: string): number {
	return db()
		.select({ id: schema.memberships.id })
		.from(schema.memberships)
		.where(and(eq(schema.memberships.clinicId, clinicId), eq(schema.memberships.role, 'admin')))
		.all().length;
}

/** Changes a member's role; a clinic always keeps at least one admin. */
export function changeRole(actor: Principal, membershipId: string, role: StaffRole): void {
	const membership = membershipInClinic(actor, membershipId);
	if (membership.role === role) return;
	if (membership.role === 'admin' && adminCount(actor.clinicId) <= 1) {
		throw new MemberError('A clinic needs at least one admin. Make someone else admin first.');
	}
	db()
		.update(schema.memberships)
		.set({ role })
		.where(eq(schema.memberships.id, membershipId))
		.run();
	recordAudit({
		kind: 'role-changed',
		clinicId: actor.clinicId,
		actorUserId: actor.id,
		subject: membership.userId,
		detail: { from: membership.role, to: role }
	});
	// Their sessions were opened under the old role; they sign in again under the new one.
	endSessionsOf(membership.userId, 'role-changed', { by: actor });
}

/** Removes a member from the clinic (their account stays, without a role). */
export function removeMember(actor: Principal, membershipId: string): void {
	const membership = membershipInClinic(actor, membershipId);
	if (membership.userId === actor.id) throw new MemberError('You cannot remove yourself.');
	if (membership.role === 'admin' && adminCount(actor.clinicId) <= 1) {
		throw new MemberError('A clinic needs at least one admin.');
	}
	db().delete(schema.memberships).where(eq(schema.memberships.id, membershipId)).run();
	recordAudit({
		kind: 'member-removed',
		clinicId: actor.clinicId,
		actorUserId: actor.id,
		subject: membership.userId,
		detail: { role: membership.role }
	});
	endSessionsOf(membership.userId, 'removed', { by: actor });
}

/** Withdraws a pending invitation of the actor's clinic. */
export function revokeInvitation(actor: Principal, invitationId: string): void {
	const result = db()
		.update(schema.invitations)
		.set({ revokedAt: new Date() })
		.where(
			and(
				eq(schema.invitations.id, invitationId),
				eq(schema.invitations.clinicId, actor.clinicId),
				isNull(schema.invitations.acceptedAt)
			)
		)
		.run();
	if (result.changes === 0) throw new MemberError('That invitation is not pending in your clinic.');
	recordAudit({
		kind: 'invitation-revoked',
		clinicId: actor.clinicId,
		actorUserId: actor.id,
		subject: invitationId
	});
}

/**
 * Whether an address already has a role in this clinic. Another clinic's people are not looked
 * at: an invitation to them is made and answered like any other (it cannot be accepted, since a
 * person belongs to one clinic, and its owner is told so), so the form never reveals that an
 * address is known elsewhere.
 */
export function emailHasRoleIn(email: string, clinicId: string): boolean {
	const user = db()
		.query.users.findFirst({ where: eq(schema.users.email, email) })
		.sync();
	if (!user) return false;
	const m = db()
		.query.memberships.findFirst({
			where: and(eq(schema.memberships.userId, user.id), eq(schema.memberships.clinicId, clinicId))
		})
		.sync();
	const p = db()
		.query.patients.findFirst({
			where: and(eq(schema.patients.userId, user.id), eq(schema.patients.clinicId, clinicId))
		})
		.sync();
	return Boolean(m || p);
}
