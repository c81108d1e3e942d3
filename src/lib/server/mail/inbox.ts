import { z } from 'zod';
import { config } from '../config';

/**
 * Client for the development inbox: the mail fake's JSON API, where every message the app sends
 * in development and tests can be read back. DEV_INBOX_URL empty (the production default) turns
 * it off.
 */

const summarySchema = z.object({
	id: z.string(),
	from: z.string(),
	to: z.array(z.string()),
	subject: z.string(),
	date: z.string(),
	clinic: z.string().nullable().default(null)
});

const messageSchema = summarySchema.extend({
	text: z.string(),
	html: z.string().nullable()
});

export type InboxSummary = z.infer<typeof summarySchema>;
export type InboxMessage = z.infer<typeof messageSchema>;

export function inboxEnabled(): boolean {
	return config().DEV_INBOX_URL !== '';
}

async function request(path: string): Promise<Response> {
	const base = config().DEV_INBOX_URL;
	if (!base) {
		throw new Error('The development inbox is disabled: DEV_INBOX_URL is empty.');
	}
	const url = new URL(path, base.endsWith('/') ? base : `${base}/`);
	try {
		return await fetch(url, { signal: AbortSignal.timeout(5000) });
	} catch (error) {
		throw new Error(
			`The development inbox at ${base} is not answering; start the fakes with \`npm run fakes\`.`,
			{ cause: error }
		);
	}
}

async function parse<T>(response: Response, schema: z.ZodType<T>, what: string): Promise<T> {
	if (!response.ok) {
		throw new Error(`The development inbox answered ${response.status} to ${what}.`);
	}
	const parsed = schema.safeParse(await response.json());
	if (!parsed.success) {
		throw new Error(
			`The development inbox sent an unexpected ${what} answer: ${parsed.error.message}`
		);
	}
	return parsed.data;
}

/**
 * The messages sent for one clinic, newest first. A message that names no clinic (sent before
 * the inbox was on, or by something else) is shown to nobody: an admin must never open another
 * clinic's sign-in links or invitations.
 */
export async function listInbox(clinicId: string): Promise<InboxSummary[]> {
	const all = await parse(await request('messages'), z.array(summarySchema), 'list');
	return all.filter((m) => m.clinic === clinicId);
}

/** One message of the clinic with its text and HTML bodies, or null (no such id, or another clinic's). */
export async function readInboxMessage(clinicId: string, id: string): Promise<InboxMessage | null> {
	const response = await request(`messages/${encodeURIComponent(id)}`);
	if (response.status === 404 || response.status === 400) return null;
	const message = await parse(response, messageSchema, 'message');
	return message.clinic === clinicId ? message : null;
}
