import { testEnv } from './env';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';

// A database of this file's own, so other files' rows cannot change what is counted here.
process.env.DATABASE_PATH = join(mkdtempSync(join(tmpdir(), 'kinelume-accounts-')), 'accounts.db');

const { db, schema } = await import('../../src/lib/server/db');
const { acceptInvitation, findInvitation, InvitationError, sendInvitation } = await import(
	'../../src/lib/server/invitations'
);
const { changeRole, MemberError, removeMember } = await import('../../src/lib/server/members');
const { invitePatient } = await import('../../src/lib/server/patients');
const { loadPrincipal } = await import('../../src/lib/server/auth/principal');
const { verifyPassword } = await import('../../src/lib/server/auth/passwords');
const { attemptLockout, clearPasswordFailures, countLinkRequest, countPasswordAttempt } =
	await import('../../src/lib/server/auth/sign-in-limits');
const { createSession, endSessionsOf, sessionIsAlive } = await import(
	'../../src/lib/server/auth/sessions'
);
const signInLockout = (email: string, address: string) =>
	attemptLockout('password-failure', email, address);
const recordSignInFailure = (email: string, address: string) =>
	countPasswordAttempt(email, address);
const recordLinkRequest = (email: string, address: string) => countLinkRequest(email, address);
const linkRequestAllowed = (email: string, now = Date.now()) =>
	!attemptLockout('link-request', email, '192.0.2.200', now).locked;
const { listInbox, readInboxMessage } = await import('../../src/lib/server/mail/inbox');
const { getClinicTimeZone, setClinicTimeZone } = await import('../../src/lib/server/clinics');
const factories = await import('./factories');
const { makeClinic } = factories;

type Principal = NonNullable<ReturnType<typeof loadPrincipal>>;
type Role = import('./factories').Staff['role'];

/** A staff member at `email`, as the app sees them signed in. */
const makeStaff = (clinicId: string, email: string, role: Role): Principal =>
	loadPrincipal(factories.makeStaff(clinicId, role, { email }).id)!;

/** The invitation link's token, read back from the mail fake like a person reading their e-mail. */
async function tokenMailedTo(email: string, clinicId = clinic.id): Promise<string> {
	const summary = (await listInbox(clinicId)).find((m) => m.to.includes(email));
	expect(summary, `an e-mail to ${email}`).toBeDefined();
	const message = await readInboxMessage(clinicId, summary!.id);
	const link = message!.text!.match(/https?:\/\/\S+\/invite\/([A-Za-z0-9_-]+)/);
	expect(link).not.toBeNull();
	return link![1];
}

let clinic: { id: string; name: string };
let admin: Principal;

beforeAll(() => {
	expect(testEnv.DEV_INBOX_URL).toMatch(/^http/);
	clinic = makeClinic('Invented Test Clinic');
	admin = makeStaff(clinic.id, 'boss@test-clinic.example', 'admin');
});

/** An invitation's expiry worded by Intl directly, independently of the app's formatter. */
function expiryAsShown(email: string, timeZone: string): string {
	const stored = db()
		.query.invitations.findFirst({ where: eq(schema.invitations.email, email) })
		.sync()!;
	return new Intl.DateTimeFormat('en-GB', {
		timeZone,
		day: 'numeric',
		month: 'short',
		year: 'numeric',
		hour: '2-digit',
		minute: '2-digit',
		hourCycle: 'h23',
		timeZoneName: 'short'
	}).format(stored.expiresAt);
}

describe('time zones', () => {
	it("show a clinic's staff their clinic's zone and a patient their own, in the e-mails too", async () => {
		const far = makeClinic('Invented Clinic Far Away');
		expect(getClinicTimeZone(far.id)).toBe('Europe/London');
		setClinicTimeZone(far.id, 'Pacific/Auckland');
		const farAdmin = makeStaff(far.id, 'boss@far-clinic.example', 'admin');
		expect(farAdmin.timeZone).toBe('Pacific/Auckland');

		const email = 'new.educator@far-clinic.example';
		await sendInvitation({ clinicId: far.id, email, role: 'educator', invitedBy: farAdmin });
		const summary = (await listInbox(far.id)).find((m) => m.to.includes(email))!;
		const text = (await readInboxMessage(far.id, summary.id))!.text!;
		// The expiry as Auckland's clocks show it, with the zone's short name: UTC+13 in the
		// southern summer, UTC+12 in winter (tz database), whichever today is.
		const expected = expiryAsShown(email, 'Pacific/Auckland');
		expect(text).toContain(`until ${expected}.`);
		expect(expected).toMatch(/(GMT\+1[23]|NZ[DS]T)$/);

		// A patient of that clinic who lives elsewhere sees their own zone, in the e-mail and after.
		const physio = makeStaff(far.id, 'physio@far-clinic.example', 'clinician');
		const patient = await invitePatient(physio, {
			fullName: 'Orla Pennant',
			email: 'orla@far-clinic.example',
			affectedSide: 'right',
			condition: 'Right knee replacement',
			timeZone: 'Europe/Lisbon'
		});
		const patientMail = (await listInbox(far.id)).find((m) =>
			m.to.includes('orla@far-clinic.example')
		)!;
		const patientText = (await readInboxMessage(far.id, patientMail.id))!.text!;
		expect(patientText).toContain(
			`until ${expiryAsShown('orla@far-clinic.example', 'Europe/Lisbon')}.`
		);
		const token = await tokenMailedTo('orla@far-clinic.example', far.id);
		const accepted = await acceptInvitation(token, { name: 'Orla Pennant', password: null });
		expect(loadPrincipal(accepted.userId)).toMatchObject({
			patientId: patient.id,
			timeZone: 'Europe/Lisbon'
		});
	});
});

describe('staff invitations', () => {
	it('mail a link that works once, creating the account and its role in one step', async () => {
		const email = 'new.clinician@test-clinic.example';
		await sendInvitation({
			clinicId: clinic.id,
			email: 'New.Clinician@Test-Clinic.example ',
			role: 'clinician',
			invitedBy: admin
		});
		const token = await tokenMailedTo(email);

		// Only a hash of the token is stored.
		const stored = db()
			.query.invitations.findFirst({ where: eq(schema.invitations.email, email) })
			.sync()!;
		expect(stored.tokenHash).not.toContain(token);
		expect(findInvitation(token)?.status).toBe('pending');

		const accepted = await acceptInvitation(token, {
			name: 'Nell Ortega',
			password: 'long-enough-secret'
		});
		const principal = loadPrincipal(accepted.userId)!;
		expect(principal).toMatchObject({
			role: 'clinician',
			clinicId: clinic.id,
			name: 'Nell Ortega',
			email
		});
		const user = db()
			.query.users.findFirst({ where: eq(schema.users.id, accepted.userId) })
			.sync()!;
		expect(await verifyPassword(user.passwordHash, 'long-enough-secret')).toBe(true);

		await expect(
			acceptInvitation(token, { name: 'Again', password: 'long-enough-secret' })
		).rejects.toThrow(InvitationError);
		expect(findInvitation(token)?.status).toBe('accepted');
		const kinds = db()
			.select()
			.from(schema.auditEvents)
			.where(eq(schema.auditEvents.subject, email))
			.all()
			.map((e) => e.kind);
		expect(kinds).toEqual(['invitation-sent', 'invitation-accepted']);
	});

	it('refuse an expired link and create nothing', async () => {
		const email = 'late@test-clinic.example';
		await sendInvitation({ clinicId: clinic.id, email, role: 'educator', invitedBy: admin });
		const token = await tokenMailedTo(email);
		db()
			.update(schema.invitations)
			.set({ expiresAt: new Date(Date.now() - 1) })
			.where(eq(schema.invitations.email, email))
			.run();
		await expect(
			acceptInvitation(token, { name: 'Late', password: 'long-enough-secret' })
		).rejects.toThrow('expired');
		expect(
			db()
				.query.users.findFirst({ where: eq(schema.users.email, email) })
				.sync()
		).toBeUndefined();
	});

	it('withdraw the older link when a newer invitation goes to the same address', async () => {
		const email = 'twice@test-clinic.example';
		await sendInvitation({ clinicId: clinic.id, email, role: 'clinician', invitedBy: admin });
		const first = await tokenMailedTo(email);
		await new Promise((r) => setTimeout(r, 20));
		await sendInvitation({ clinicId: clinic.id, email, role: 'educator', invitedBy: admin });
		expect(findInvitation(first)?.status).toBe('revoked');
		const pending = db()
			.select()
			.from(schema.invitations)
			.where(eq(schema.invitations.email, email))
			.all()
			.filter((i) => !i.revokedAt);
		expect(pending).toHaveLength(1);
		expect(pending[0].role).toBe('educator');
	});
});

describe('patient invitations', () => {
	it('join the patient record to a new account that may have no password', async () => {
		const clinician = makeStaff(clinic.id, 'physio@test-clinic.example', 'clinician');
		const patient = await invitePatient(clinician, {
			fullName: 'Ida Brook',
			email: 'ida@test-clinic.example',
			affectedSide: 'left',
			condition: 'Left knee replacement'
		});
		const token = await tokenMailedTo('ida@test-clinic.example');
		const accepted = await acceptInvitation(token, { name: 'Ida Brook', password: null });
		expect(loadPrincipal(accepted.userId)).toMatchObject({
			role: 'patient',
			patientId: patient.id,
			clinicId: clinic.id
		});
		const user = db()
			.query.users.findFirst({ where: eq(schema.users.id, accepted.userId) })
			.sync()!;
		expect(user.passwordHash).toBeNull();
		await expect(
			invitePatient(clinician, {
				fullName: 'Ida Again',
				email: 'IDA@test-clinic.example',
				affectedSide: 'left',
				condition: ''
			})
		).rejects.toThrow('already in your clinic');
	});
});

describe('members', () => {
	it('keep at least one admin, and a change of role is audited', () => {
		const own = db()
			.query.memberships.findFirst({ where: eq(schema.memberships.userId, admin.id) })
			.sync()!;
		expect(() => changeRole(admin, own.id, 'clinician')).toThrow('at least one admin');
		const second = makeStaff(clinic.id, 'deputy@test-clinic.example', 'educator');
		const secondMembership = db()
			.query.memberships.findFirst({ where: eq(schema.memberships.userId, second.id) })
			.sync()!;
		changeRole(admin, secondMembership.id, 'admin');
		expect(loadPrincipal(second.id)?.role).toBe('admin');
		const event = db()
			.select()
			.from(schema.auditEvents)
			.where(eq(schema.auditEvents.subject, second.id))
			.get();
		expect(event).toMatchObject({
			kind: 'role-changed',
			detail: { from: 'educator', to: 'admin' }
		});
	});

	it('cannot be removed by themselves or by another clinic', () => {
		const own = db()
			.query.memberships.findFirst({ where: eq(schema.memberships.userId, admin.id) })
			.sync()!;
		expect(() => removeMember(admin, own.id)).toThrow('cannot remove yourself');
		const elsewhere = makeClinic('Another Invented Clinic');
		const foreignAdmin = makeStaff(elsewhere.id, 'boss@another.example', 'admin');
		const victim = makeStaff(clinic.id, 'victim@test-clinic.example', 'clinician');
		const victimMembership = db()
			.query.memberships.findFirst({ where: eq(schema.memberships.userId, victim.id) })
			.sync()!;
		expect(() => removeMember(foreignAdmin, victimMembership.id)).toThrow(MemberError);
		expect(loadPrincipal(victim.id)?.role).toBe('clinician');
		removeMember(admin, victimMembership.id);
		// Removed from the clinic means no role: the person is treated as signed out.
		expect(loadPrincipal(victim.id)).toBeNull();
	});
});

describe('sign-in lockout', () => {
	it('locks an account after five failures in the window and clears on success', () => {
		const email = 'guessed@test-clinic.example';
		for (let i = 0; i < 4; i++) recordSignInFailure(email, '203.0.113.7');
		expect(signInLockout(email, '203.0.113.7').locked).toBe(false);
		recordSignInFailure(email, '198.51.100.2');
		const locked = signInLockout(email, '192.0.2.1');
		expect(locked.locked).toBe(true);
		expect(locked.retryAfterSeconds).toBeGreaterThan(14 * 60);
		expect(locked.retryAfterSeconds).toBeLessThanOrEqual(15 * 60);
		clearPasswordFailures(email);
		expect(signInLockout(email, '192.0.2.1').locked).toBe(false);
	});

	it('also slows one address walking through many accounts', () => {
		for (let i = 0; i < 25; i++)
			recordSignInFailure(`walker${i}@test-clinic.example`, '203.0.113.99');
		expect(signInLockout('fresh@test-clinic.example', '203.0.113.99').locked).toBe(true);
		expect(signInLockout('fresh@test-clinic.example', '203.0.113.100').locked).toBe(false);
	});

	it('lets at most five sign-in links go to one address in the window', () => {
		const email = 'inbox.flood@test-clinic.example';
		for (let i = 0; i < 4; i++) recordLinkRequest(email, '203.0.113.8');
		expect(linkRequestAllowed(email)).toBe(true);
		recordLinkRequest(email, '198.51.100.9');
		expect(linkRequestAllowed(email)).toBe(false);
		expect(linkRequestAllowed('someone.else@test-clinic.example')).toBe(true);
		// After the window the address may ask again.
		expect(linkRequestAllowed(email, Date.now() + 15 * 60_000 + 1000)).toBe(true);
	});

	it('counts link requests and failed passwords apart', () => {
		const email = 'both.kinds@test-clinic.example';
		for (let i = 0; i < 5; i++) recordLinkRequest(email, '203.0.113.20');
		expect(attemptLockout('link-request', email, '203.0.113.20').locked).toBe(true);
		expect(attemptLockout('password-failure', email, '203.0.113.20').locked).toBe(false);
	});
});

describe('sessions that can be ended', () => {
	it('ends every session of a person on a role change and on removal, and others keep theirs', () => {
		const person = makeStaff(clinic.id, 'ended@test-clinic.example', 'clinician');
		const bystander = makeStaff(clinic.id, 'bystander@test-clinic.example', 'clinician');
		const phone = createSession(person.id, 'clinician');
		const desk = createSession(person.id, 'clinician');
		const theirs = createSession(bystander.id, 'clinician');
		expect(sessionIsAlive(phone, person.id)).toBe(true);
		// A token naming another person's session is no session at all.
		expect(sessionIsAlive(theirs, person.id)).toBe(false);

		const membership = db()
			.query.memberships.findFirst({ where: eq(schema.memberships.userId, person.id) })
			.sync()!;
		changeRole(admin, membership.id, 'educator');
		expect(sessionIsAlive(phone, person.id)).toBe(false);
		expect(sessionIsAlive(desk, person.id)).toBe(false);
		expect(sessionIsAlive(theirs, bystander.id)).toBe(true);

		const again = createSession(person.id, 'educator');
		removeMember(admin, membership.id);
		expect(sessionIsAlive(again, person.id)).toBe(false);
	});

	it('keeps the current session when the others end after a password change', () => {
		const person = makeStaff(clinic.id, 'newpass@test-clinic.example', 'clinician');
		const here = createSession(person.id, 'clinician');
		const there = createSession(person.id, 'clinician');
		expect(endSessionsOf(person.id, 'password-changed', { keep: here })).toBe(1);
		expect(sessionIsAlive(here, person.id)).toBe(true);
		expect(sessionIsAlive(there, person.id)).toBe(false);
	});

	it('ends a session left idle past its limit and one past its absolute end, even if in use', () => {
		const person = makeStaff(clinic.id, 'idle@test-clinic.example', 'clinician');
		const start = Date.now();
		const idle = createSession(person.id, 'clinician', start);
		expect(sessionIsAlive(idle, person.id, start + 11 * 3600_000)).toBe(true);
		// Used at 11 h, so idle until 23 h; 24 h later than that it has gone.
		expect(sessionIsAlive(idle, person.id, start + 36 * 3600_000)).toBe(false);

		const busy = createSession(person.id, 'clinician', start);
		for (let hour = 6; hour < 7 * 24; hour += 6) {
			expect(sessionIsAlive(busy, person.id, start + hour * 3600_000)).toBe(true);
		}
		expect(sessionIsAlive(busy, person.id, start + 7 * 24 * 3600_000)).toBe(false);
	});
});
