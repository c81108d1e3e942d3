import { randomBytes } from 'node:crypto';
import { createWriteStream } from 'node:fs';
import { mkdir, readdir, readFile, rename, rm, writeFile } from 'node:fs/promises';
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo, Server } from 'node:net';
import { join } from 'node:path';
import { pipeline } from 'node:stream/promises';
import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';

export interface MailFakeOptions {
	host?: string;
	smtpPort: number;
	apiPort: number;
	directory: string;
}

export interface MailFake {
	smtpPort: number;
	apiUrl: string;
	close(): Promise<void>;
}

export interface MessageSummary {
	id: string;
	from: string;
	to: string[];
	subject: string;
	date: string;
	/**
	 * The sender's `X-Kinelume-Clinic` header, which the app adds only while a development inbox
	 * is on, so the inbox page can show each clinic's admin only their own clinic's messages.
	 */
	clinic: string | null;
}

export interface StoredMessage extends MessageSummary {
	text: string;
	html: string | null;
}

const ID_PATTERN = /^\d{13}-[0-9a-f]{8}$/;
const MAX_MESSAGE_BYTES = 25 * 1024 * 1024;

let lastStamp = 0;

// Ids sort by arrival even when two messages land in the same millisecond, across restarts too.
function newId(): string {
	lastStamp = Math.max(Date.now(), lastStamp + 1);
	return `${String(lastStamp).padStart(13, '0')}-${randomBytes(4).toString('hex')}`;
}

async function storeMessage(
	directory: string,
	id: string,
	source: NodeJS.ReadableStream,
	envelope: { from: string; to: string[] }
): Promise<{ sizeExceeded: boolean }> {
	const emlPath = join(directory, `${id}.eml`);
	await pipeline(source, createWriteStream(`${emlPath}.tmp`));
	if ((source as { sizeExceeded?: boolean }).sizeExceeded) {
		await rm(`${emlPath}.tmp`, { force: true });
		return { sizeExceeded: true };
	}
	await rename(`${emlPath}.tmp`, emlPath);

	const parsed = await simpleParser(await readFile(emlPath));
	const message: StoredMessage = {
		id,
		from: parsed.from?.text || envelope.from,
		// The envelope, not the To header, says who actually received it (Bcc included).
		to: envelope.to,
		subject: parsed.subject ?? '',
		date: (parsed.date ?? new Date()).toISOString(),
		clinic: headerText(parsed.headers.get('x-kinelume-clinic')),
		text: parsed.text ?? '',
		html: typeof parsed.html === 'string' ? parsed.html : null
	};
	const jsonPath = join(directory, `${id}.json`);
	// The listing reads only .json files, so a half-written one must never be visible.
	await writeFile(`${jsonPath}.tmp`, JSON.stringify(message, null, '\t'));
	await rename(`${jsonPath}.tmp`, jsonPath);
	return { sizeExceeded: false };
}

function headerText(value: unknown): string | null {
	return typeof value === 'string' && value.trim() !== '' ? value.trim() : null;
}

async function storedIds(directory: string): Promise<string[]> {
	const names = await readdir(directory);
	return names
		.filter((name) => name.endsWith('.json'))
		.map((name) => name.slice(0, -'.json'.length))
		.filter((id) => ID_PATTERN.test(id))
		.sort()
		.reverse();
}

async function readMessage(directory: string, id: string): Promise<StoredMessage | undefined> {
	try {
		return JSON.parse(await readFile(join(directory, `${id}.json`), 'utf8')) as StoredMessage;
	} catch (error) {
		if ((error as NodeJS.ErrnoException).code === 'ENOENT') return undefined;
		throw error;
	}
}

function sendJson(res: ServerResponse, status: number, body: unknown, headers = {}) {
	const text = JSON.stringify(body);
	res.writeHead(status, {
		'Content-Type': 'application/json; charset=utf-8',
		'Content-Length': Buffer.byteLength(text),
		'Cache-Control': 'no-store',
		...headers
	});
	res.end(text);
}

async function handleApi(directory: string, req: IncomingMessage, res: ServerResponse) {
	const path = new URL(req.url ?? '/', 'http://inbox').pathname;
	const method = req.method ?? 'GET';

	if (path === '/messages' || path === '/messages/') {
		if (method === 'GET') {
			const summaries: MessageSummary[] = [];
			for (const id of await storedIds(directory)) {
				const message = await readMessage(directory, id);
				if (!message) continue;
				const { from, to, subject, date, clinic } = message;
				summaries.push({ id, from, to, subject, date, clinic: clinic ?? null });
			}
			return sendJson(res, 200, summaries);
		}
		if (method === 'DELETE') {
			const names = await readdir(directory);
			await Promise.all(
				names
					.filter((name) => ID_PATTERN.test(name.replace(/\.(eml|json)(\.tmp)?$/, '')))
					.map((name) => rm(join(directory, name), { force: true }))
			);
			res.writeHead(204).end();
			return;
		}
		return sendJson(res, 405, { error: 'method not allowed' }, { Allow: 'GET, DELETE' });
	}

	const match = /^\/messages\/([^/]+)$/.exec(path);
	if (match) {
		if (method !== 'GET') {
			return sendJson(res, 405, { error: 'method not allowed' }, { Allow: 'GET' });
		}
		let id: string;
		try {
			id = decodeURIComponent(match[1]);
		} catch {
			id = '';
		}
		// The id becomes a file name: anything but the exact format could escape the directory.
		if (!ID_PATTERN.test(id)) return sendJson(res, 400, { error: 'invalid message id' });
		const message = await readMessage(directory, id);
		if (!message) return sendJson(res, 404, { error: 'message not found' });
		return sendJson(res, 200, message);
	}

	return sendJson(res, 404, { error: 'not found' });
}

function listen(server: Server, port: number, host: string) {
	return new Promise<void>((resolve, reject) => {
		server.once('error', reject);
		server.listen(port, host, () => {
			server.off('error', reject);
			resolve();
		});
	});
}

/**
 * Starts an SMTP sink that keeps every message under `directory` (raw .eml plus parsed .json,
 * kept across restarts) and a JSON API to read them back.
 */
export async function startMailFake(opts: MailFakeOptions): Promise<MailFake> {
	const host = opts.host ?? '127.0.0.1';
	const directory = opts.directory;
	await mkdir(directory, { recursive: true });

	const smtp = new SMTPServer({
		// Auth.js's e-mail provider sends empty credentials, which fail if AUTH is advertised.
		disabledCommands: ['AUTH', 'STARTTLS'],
		authOptional: true,
		size: MAX_MESSAGE_BYTES,
		logger: false,
		// A reverse DNS lookup per connection would cost time and reach for the network.
		disableReverseLookup: true,
		closeTimeout: 1000,
		onData(stream, session, callback) {
			const envelope = {
				from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
				to: session.envelope.rcptTo.map((r) => r.address)
			};
			storeMessage(directory, newId(), stream, envelope).then(
				({ sizeExceeded }) => {
					if (!sizeExceeded) return callback();
					const error = new Error('Message exceeds the fixed maximum message size') as Error & {
						responseCode: number;
					};
					error.responseCode = 552;
					callback(error);
				},
				(error: Error) => callback(error)
			);
		}
	});
	// A client that drops mid-session raises an error on the server; it must not end the process.
	smtp.on('error', () => {});

	const api = createServer((req, res) => {
		handleApi(directory, req, res).catch((error: Error) => {
			if (!res.headersSent) sendJson(res, 500, { error: error.message });
			else res.destroy();
		});
	});

	await listen(smtp.server, opts.smtpPort, host);
	try {
		await listen(api, opts.apiPort, host);
	} catch (error) {
		await new Promise<void>((resolve) => smtp.close(resolve));
		throw error;
	}

	const smtpPort = (smtp.server.address() as AddressInfo).port;
	const apiPort = (api.address() as AddressInfo).port;
	const hostInUrl = host.includes(':') ? `[${host}]` : host;
	let closing: Promise<void> | undefined;

	return {
		smtpPort,
		apiUrl: `http://${hostInUrl}:${apiPort}`,
		close() {
			closing ??= Promise.all([
				new Promise<void>((resolve) => smtp.close(resolve)),
				new Promise<void>((resolve, reject) => {
					api.close((error) => (error ? reject(error) : resolve()));
					api.closeAllConnections();
				})
			]).then(() => undefined);
			return closing;
		}
	};
}
