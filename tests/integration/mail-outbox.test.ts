import { withEnv } from './env';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { startMailFake, type MailFake, type MessageSummary } from '../../fakes/mail/server';
import getPort from 'get-port';

// Mail down when an invitation or a sign-in link goes out: the message waits in the outbox and
// goes once the mail server answers again; nothing is lost and nothing is sent twice.

let scratch: string;
let smtpPort: number;
let fake: MailFake | undefined;
beforeAll(async () => {
	scratch = await mkdtemp(join(tmpdir(), 'kinelume-outbox-test-'));
	smtpPort = await getPort({ host: '127.0.0.1' });
});
afterAll(async () => {
	await fake?.close();
	await rm(scratch, { recursive: true, force: true });
});

/** The app's modules read afresh with SMTP pointed at `smtpPort` (nothing listens there yet). */
function withMailAt<T>(fn: () => Promise<T>): Promise<T> {
	return withEnv({ SMTP_PORT: String(smtpPort) }, async () => {
		vi.resetModules();
		return fn();
	});
}

async function allReceived(): Promise<MessageSummary[]> {
	return (await (await fetch(`${fake!.apiUrl}/messages`)).json()) as MessageSummary[];
}

async function received(subject: string): Promise<MessageSummary[]> {
	return (await allReceived()).filter((m) => m.subject === subject);
}

describe('the mail outbox', () => {
	it('keeps an invitation sent while mail is down, then sends it once, when mail is back', async () => {
		await withMailAt(async () => {
			const { db, schema } = await import('$lib/server/db');
			const { sendMail, sendDueMail, retryDelayMs, waitingMailCount } = await import(
				'$lib/server/mail'
			);
			const { sendInvitation } = await import('$lib/server/invitations');
			// Read afresh like the app's modules, so that they write to the same database.
			const { makeClinic, makeStaff } = await import('./factories');
			const clinic = makeClinic(`Outbox clinic ${Date.now()}`);
			const admin = makeStaff(clinic.id, 'admin', { name: 'Outbox Admin' });
			const email = `outbox.${Date.now()}@example.test`;

			// Down: the invitation is made, and the answer says its e-mail is waiting.
			const waitingBefore = waitingMailCount();
			const invitation = await sendInvitation({
				clinicId: clinic.id,
				email,
				role: 'clinician',
				invitedBy: { id: admin.id, name: 'Outbox Admin' }
			});
			expect(invitation.mail).toBe('queued');
			expect(waitingMailCount()).toBe(waitingBefore + 1);
			const row = db()
				.select()
				.from(schema.mailOutbox)
				.all()
				.find((m) => m.recipients.includes(email))!;
			expect(row).toMatchObject({ recipients: [email], attempts: 1, sentAt: null });
			expect(row.lastError).toMatch(/ECONNREFUSED/);
			expect(row.text).toContain('/invite/');

			// A sign-in link while still down: also kept, not thrown at the person.
			const link = await sendMail({
				clinicId: clinic.id,
				to: email,
				subject: `Sign-in link ${Date.now()}`,
				text: 'http://localhost/auth/callback/nodemailer?token=secret'
			});
			expect(link.status).toBe('queued');

			// Still down at the next try: nothing sent, the wait grows.
			const firstRetry = new Date(Date.now() + retryDelayMs(1) + 1000);
			expect(await sendDueMail(firstRetry)).toBe(0);

			// Mail is back: the next due try sends both, once each, and forgets their words.
			fake = await startMailFake({ smtpPort, apiPort: 0, directory: join(scratch, 'mail') });
			const later = new Date(firstRetry.getTime() + retryDelayMs(2) + 1000);
			expect(await sendDueMail(later)).toBe(2);
			expect(await sendDueMail(new Date(later.getTime() + 3_600_000))).toBe(0);
			expect((await allReceived()).filter((m) => m.to.includes(email))).toHaveLength(2);
			expect(await received(row.subject)).toHaveLength(1);
			const sent = db()
				.select()
				.from(schema.mailOutbox)
				.where(eq(schema.mailOutbox.id, row.id))
				.get();
			expect(sent?.sentAt).toBeInstanceOf(Date);
			expect(sent?.text).toBeNull();
			expect(waitingMailCount()).toBe(waitingBefore);
		});
	});

	it('lets one process only send a due message (the claim is one UPDATE)', async () => {
		await withMailAt(async () => {
			const { db, schema } = await import('$lib/server/db');
			const { sendDueMail } = await import('$lib/server/mail');
			const subject = `Claimed once ${Date.now()}`;
			// A due message written straight into the outbox: the claim is under test, not sendMail.
			db()
				.insert(schema.mailOutbox)
				.values({
					clinicId: 'outbox-claim',
					recipients: ['claim@example.test'],
					subject,
					text: 'once',
					nextAttemptAt: new Date(Date.now() - 1000)
				})
				.run();
			const now = new Date();
			const [a, b] = await Promise.all([sendDueMail(now), sendDueMail(now)]);
			expect(a + b).toBe(1);
			expect(await received(subject)).toHaveLength(1);
		});
	});

	it('waits longer after each failed try, up to an hour (our choice)', async () => {
		const { retryDelayMs } = await import('$lib/server/mail');
		expect([1, 2, 3, 4, 5, 9].map(retryDelayMs)).toEqual([
			30_000, 120_000, 480_000, 1_920_000, 3_600_000, 3_600_000
		]);
	});
});
