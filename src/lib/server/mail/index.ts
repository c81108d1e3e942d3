import nodemailer, { type Transporter } from 'nodemailer';
import type SMTPTransport from 'nodemailer/lib/smtp-transport';
import { config } from '../config';

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

/** Sends one message from MAIL_FROM; resolves once the SMTP server has accepted it. */
export async function sendMail(mail: OutgoingMail): Promise<{ messageId: string }> {
	const info = await mailer().sendMail({
		from: config().MAIL_FROM,
		to: mail.to,
		subject: mail.subject,
		text: mail.text,
		html: mail.html,
		// Only for the development inbox's clinic scoping; real recipients never get it.
		...(config().DEV_INBOX_URL ? { headers: { 'X-Kinelume-Clinic': mail.clinicId } } : {})
	});
	return { messageId: info.messageId };
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
