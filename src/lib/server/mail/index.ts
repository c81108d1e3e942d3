import nodemailer, { type Transporter } from 'nodemailer';
import type SMTPTransport from 'nodemailer/lib/smtp-transport';
import { and, asc, count, eq, isNull, lte } from 'drizzle-orm';
import { config } from '../config';
import { db, schema } from '../db';
import type { OutboxMessage } from '../db/schema/mail';

export interface OutgoingMail {
	/** The clinic the message is sent for; only that clinic's admins see it in a development inbox. */
	clinicId: string;
	to: string | string[];
	subject: string;
	text: string;
	html?: string;
}

export interface HealthCheck {
	ok: boolean;
	detail: string;
}

/** SMTP settings from the environment, shared by the app's transport and Auth.js's e-mail provider. */
export function smtpOptions(timeoutMs = 10_000): SMTPTransport.Options {
	const c = config();
	return {
		host: c.SMTP_HOST,
		port: c.SMTP_PORT,
		secure: c.SMTP_SECURE,
		// An empty user must mean no AUTH at all: servers that do not offer it reject the attempt.
		...(c.SMTP_USER ? { auth: { user: c.SMTP_USER, pass: c.SMTP_PASSWORD } } : {}),
		connectionTimeout: timeoutMs,
		greetingTimeout: timeoutMs,
		socketTimeout: timeoutMs
	};
}

let transporter: Transporter<SMTPTransport.SentMessageInfo> | undefined;

/** The shared transport, created on first use so that importing this module opens nothing. */
export function mailer(): Transporter<SMTPTransport.SentMessageInfo> {
	transporter ??= nodemailer.createTransport(smtpOptions());
	return transporter;
}

/** What became of a message: taken by the mail server now, or kept in the outbox for a later try. */
export type Delivery = { status: 'sent'; messageId: string } | { status: 'queued'; reason: string };

/** How long a try owns a message before another process may try it (a send takes seconds). */
const CLAIM_MS = 2 * 60_000;
/** Waits between tries: 30 s, then 2 min, 8 min, capped at an hour, for as long as it takes. */
export function retryDelayMs(attempts: number): number {
	return Math.min(60 * 60_000, 30_000 * 4 ** Math.max(0, attempts - 1));
}

/** Hands one message to SMTP from MAIL_FROM; resolves once the server has accepted it. */
async function deliver(message: OutboxMessage): Promise<string> {
	const info = await mailer().sendMail({
		from: config().MAIL_FROM,
		to: message.recipients,
		subject: message.subject,
		text: message.text ?? '',
		html: message.html ?? undefined,
		// Only for the development inbox's clinic scoping; real recipients never get it.
		...(config().DEV_INBOX_URL ? { headers: { 'X-Kinelume-Clinic': message.clinicId } } : {})
	});
	return info.messageId;
}

/** One try of a message this process has claimed; records the outcome. */
async function attempt(message: OutboxMessage, now = new Date()): Promise<Delivery> {
	const outbox = schema.mailOutbox;
	try {
		const messageId = await deliver(message);
		db()
			.update(outbox)
			.set({ sentAt: new Date(), text: null, html: null, attempts: message.attempts + 1 })
			.where(eq(outbox.id, message.id))
			.run();
		return { status: 'sent', messageId };
	} catch (error) {
		const attempts = message.attempts + 1;
		const reason = error instanceof Error ? error.message : String(error);
		db()
			.update(outbox)
			.set({
				attempts,
				lastError: reason.slice(0, 500),
				nextAttemptAt: new Date(now.getTime() + retryDelayMs(attempts))
			})
			.where(eq(outbox.id, message.id))
			.run();
		return { status: 'queued', reason };
	}
}

/**
 * Sends one message: written to the outbox first, then handed to the mail server. When the
 * server cannot take it now, the message stays in the outbox and `sendDueMail` tries again until
 * it goes: the answer says which, so the page can tell the person it is on its way.
 */
export async function sendMail(mail: OutgoingMail): Promise<Delivery> {
	const message = db()
		.insert(schema.mailOutbox)
		.values({
			clinicId: mail.clinicId,
			recipients: Array.isArray(mail.to) ? mail.to : [mail.to],
			subject: mail.subject,
			text: mail.text,
			html: mail.html ?? null,
			// Claimed by this try, so the outbox schedule of another process leaves it alone.
			nextAttemptAt: new Date(Date.now() + CLAIM_MS)
		})
		.returning()
		.get();
	return attempt(message);
}

/**
 * Tries the messages whose next try is due, oldest first; each is claimed with one UPDATE so that
 * two processes never send the same message. Answers how many went.
 */
export async function sendDueMail(now = new Date(), limit = 20): Promise<number> {
	const outbox = schema.mailOutbox;
	const due = db()
		.select()
		.from(outbox)
		.where(and(isNull(outbox.sentAt), lte(outbox.nextAttemptAt, now)))
		.orderBy(asc(outbox.createdAt))
		.limit(limit)
		.all();
	let sent = 0;
	for (const message of due) {
		const claimed = db()
			.update(outbox)
			.set({ nextAttemptAt: new Date(now.getTime() + CLAIM_MS) })
			.where(
				and(
					eq(outbox.id, message.id),
					isNull(outbox.sentAt),
					eq(outbox.nextAttemptAt, message.nextAttemptAt)
				)
			)
			.run();
		if (claimed.changes !== 1) continue;
		const result = await attempt(message, now);
		if (result.status === 'sent') sent++;
		// The server is still away: the rest would only wait for the same timeout.
		else break;
	}
	return sent;
}

/** Messages still waiting in the outbox (for the admins' health page). */
export function waitingMailCount(): number {
	const outbox = schema.mailOutbox;
	return db().select({ n: count() }).from(outbox).where(isNull(outbox.sentAt)).get()?.n ?? 0;
}

/** Tries the outbox every `intervalMs` in this process; returns the function that stops it. */
export function startOutboxSchedule(intervalMs = 15_000): () => void {
	let busy = false;
	const timer = setInterval(() => {
		if (busy) return;
		busy = true;
		sendDueMail()
			.catch((error: unknown) => console.error('mail outbox:', error))
			.finally(() => (busy = false));
	}, intervalMs);
	timer.unref();
	return () => clearInterval(timer);
}

/** Connects to the SMTP server and greets it (and logs in, if configured); never throws. */
export async function checkMail(timeoutMs = 3000): Promise<HealthCheck> {
	let where = 'mail';
	let probe: Transporter | undefined;
	let timer: NodeJS.Timeout | undefined;
	try {
		const options = smtpOptions(timeoutMs);
		where = `mail at ${options.host}:${options.port}`;
		probe = nodemailer.createTransport(options);
		const verified = probe.verify();
		// Once the timeout has won, a late failure must not surface as an unhandled rejection.
		verified.catch(() => {});
		const timedOut = new Promise<never>((_, reject) => {
			timer = setTimeout(() => reject(new Error(`no answer within ${timeoutMs} ms`)), timeoutMs);
		});
		await Promise.race([verified, timedOut]);
		return { ok: true, detail: `${where}: SMTP server ready` };
	} catch (error) {
		const code = (error as NodeJS.ErrnoException).code;
		const message = error instanceof Error ? error.message : String(error);
		return { ok: false, detail: `${where}: ${code ? `${code}: ` : ''}${message}` };
	} finally {
		clearTimeout(timer);
		probe?.close();
	}
}
