import { testEnv, withEnv } from './env';
import { randomBytes } from 'node:crypto';
import { existsSync } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import nodemailer from 'nodemailer';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { startMailFake } from '../../fakes/mail/server';
import { checkMail, sendMail } from '$lib/server/mail';
import { inboxEnabled, listInbox, readInboxMessage } from '$lib/server/mail/inbox';

async function closedPort(): Promise<number> {
	const server = createServer();
	await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
	const address = server.address();
	await new Promise<void>((resolve) => server.close(() => resolve()));
	if (typeof address !== 'object' || !address) throw new Error('no port');
	return address.port;
}

function unique(label: string): string {
	return `${label} ${randomBytes(4).toString('hex')}`;
}

let scratch: string;
beforeAll(async () => {
	scratch = await mkdtemp(join(tmpdir(), 'kinelume-mail-test-'));
});
afterAll(async () => {
	await rm(scratch, { recursive: true, force: true });
});

const CLINIC = 'clinic-mail-test';
const OTHER_CLINIC = 'clinic-mail-other';

describe('sending through the app and reading the development inbox', () => {
	it('delivers a message whose link survives intact in text and HTML', async () => {
		const link = 'http://localhost:3000/invite/abc123?token=Zx9_-q&next=%2Fpatient%2Fhome';
		const subject = unique('Your Kinelume invitation');
		const to = 'patient.one@example.test';

		const sent = await sendMail({
			clinicId: CLINIC,
			to,
			subject,
			text: `Accept your invitation: ${link}\n`,
			html: `<p><a href="${link.replaceAll('&', '&amp;')}">Accept your invitation</a></p>`
		});
		expect(sent).toEqual({ status: 'sent', messageId: expect.stringMatching(/^<.+>$/) });

		expect(inboxEnabled()).toBe(true);
		const summary = (await listInbox(CLINIC)).find((m) => m.subject === subject);
		expect(summary).toMatchObject({
			to: [to],
			from: expect.stringContaining('tests@kinelume.invalid')
		});

		const message = await readInboxMessage(CLINIC, summary!.id);
		expect(message?.text).toContain(link);
		expect(message?.html).toContain(`href="${link.replaceAll('&', '&amp;')}"`);
		expect(new Date(message!.date).getTime()).not.toBeNaN();
	});

	it('shows each clinic only the messages sent for it', async () => {
		const subject = unique('Your sign-in link');
		await sendMail({ clinicId: OTHER_CLINIC, to: 'someone@other.example', subject, text: 'link' });
		const theirs = (await listInbox(OTHER_CLINIC)).find((m) => m.subject === subject);
		expect(theirs?.clinic).toBe(OTHER_CLINIC);
		expect((await listInbox(CLINIC)).some((m) => m.subject === subject)).toBe(false);
		expect(await readInboxMessage(CLINIC, theirs!.id)).toBeNull();
		expect((await readInboxMessage(OTHER_CLINIC, theirs!.id))?.text).toContain('link');
	});

	it('lists the newest message first', async () => {
		const first = unique('first');
		const second = unique('second');
		await sendMail({ clinicId: CLINIC, to: 'order@example.test', subject: first, text: '1' });
		await sendMail({ clinicId: CLINIC, to: 'order@example.test', subject: second, text: '2' });
		const subjects = (await listInbox(CLINIC)).map((m) => m.subject);
		expect(subjects.indexOf(second)).toBeGreaterThanOrEqual(0);
		expect(subjects.indexOf(second)).toBeLessThan(subjects.indexOf(first));
	});

	it('answers null for an unknown id and for an id that tries to leave the inbox', async () => {
		expect(await readInboxMessage(CLINIC, '0000000000000-00000000')).toBeNull();
		expect(await readInboxMessage(CLINIC, '../../etc/passwd')).toBeNull();
		const raw = await fetch(`${testEnv.DEV_INBOX_URL}/messages/..%2F..%2Fetc%2Fpasswd`);
		expect(raw.status).toBe(400);
		expect(await raw.json()).toEqual({ error: 'invalid message id' });
		const missing = await fetch(`${testEnv.DEV_INBOX_URL}/messages/0000000000000-00000000`);
		expect(missing.status).toBe(404);
		expect(await missing.json()).toEqual({ error: 'message not found' });
	});
});

describe('mail fake storage', () => {
	it('keeps messages across a restart on the same directory, and clears them on DELETE', async () => {
		const directory = join(scratch, 'restart');
		let fake = await startMailFake({ smtpPort: 0, apiPort: 0, directory });
		const subject = unique('Survives restarts');
		try {
			const transport = nodemailer.createTransport({ host: '127.0.0.1', port: fake.smtpPort });
			await transport.sendMail({
				from: 'a@example.test',
				to: 'b@example.test',
				subject,
				text: 'still here'
			});
			transport.close();
		} finally {
			await fake.close();
		}

		fake = await startMailFake({ smtpPort: 0, apiPort: 0, directory });
		try {
			const list = (await (await fetch(`${fake.apiUrl}/messages`)).json()) as {
				id: string;
				subject: string;
			}[];
			expect(list).toHaveLength(1);
			expect(list[0].subject).toBe(subject);
			expect(existsSync(join(directory, `${list[0].id}.eml`))).toBe(true);
			const message = (await (await fetch(`${fake.apiUrl}/messages/${list[0].id}`)).json()) as {
				text: string;
			};
			expect(message.text.trim()).toBe('still here');

			const cleared = await fetch(`${fake.apiUrl}/messages`, { method: 'DELETE' });
			expect(cleared.status).toBe(204);
			expect(await (await fetch(`${fake.apiUrl}/messages`)).json()).toEqual([]);
			expect(existsSync(join(directory, `${list[0].id}.eml`))).toBe(false);
		} finally {
			await fake.close();
		}
	});
});

describe('checkMail and the inbox client when things are off', () => {
	async function fresh<T>(changes: Parameters<typeof withEnv>[0], fn: () => Promise<T>) {
		return withEnv(changes, async () => {
			vi.resetModules();
			return fn();
		});
	}

	it('is ok against the running fake', async () => {
		expect(await checkMail()).toEqual({ ok: true, detail: expect.stringContaining('ready') });
	});

	it('is not ok against a closed port, without throwing', async () => {
		const port = await closedPort();
		const result = await fresh({ SMTP_PORT: String(port) }, async () => {
			const mail = await import('$lib/server/mail');
			return mail.checkMail(1500);
		});
		expect(result.ok).toBe(false);
		expect(result.detail).toContain(`127.0.0.1:${port}`);
		expect(result.detail).toMatch(/ECONNREFUSED/);
	});

	it('says clearly when the inbox is down or disabled', async () => {
		const port = await closedPort();
		await fresh({ DEV_INBOX_URL: `http://127.0.0.1:${port}` }, async () => {
			const inbox = await import('$lib/server/mail/inbox');
			await expect(inbox.listInbox(CLINIC)).rejects.toThrow(/not answering; start the fakes/);
		});
		await fresh({ DEV_INBOX_URL: '' }, async () => {
			const inbox = await import('$lib/server/mail/inbox');
			expect(inbox.inboxEnabled()).toBe(false);
			await expect(inbox.readInboxMessage(CLINIC, 'x')).rejects.toThrow(/disabled/);
		});
	});
});
