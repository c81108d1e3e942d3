/**
 * The doors an attacker tries first, each tried against the running production build: every way
 * into a sign-in is limited and audited, a copied session token dies with its session, caption
 * data cannot break out of its field, the development inbox stays inside its clinic, and no
 * `next`/`redirectTo`/`callbackUrl` can send anyone off the site.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { resolve } from 'node:path';
import { expect, request, test, type APIRequestContext } from '@playwright/test';
import { E2E } from './ports';
import getPort from 'get-port';
import { seedProgramme, seedSignInPatient } from './programme-fixtures';
import {
	ACCOUNTS,
	database,
	DEMO_PASSWORD,
	firstLink,
	seedCaptionTrack,
	seedReadyRecording,
	signedInRequest,
	waitForMail,
	open
} from './support';

const SESSION_COOKIE = 'authjs.session-token';

/** A clinic member made for one test, signing in with the demo password. */
function seedStaff(role: 'admin' | 'clinician' | 'educator', clinicOf = ACCOUNTS.admin): string {
	const db = database();
	const email = `${role}-${crypto.randomUUID().slice(0, 8)}@security-test.example`;
	try {
		const { clinicId, passwordHash } = db
			.prepare(
				'select m.clinic_id as clinicId, u.password_hash as passwordHash from membership m join user u on u.id = m.user_id where u.email = ?'
			)
			.get(clinicOf) as { clinicId: string; passwordHash: string };
		const userId = crypto.randomUUID();
		db.prepare(
			'insert into user (id, name, email, password_hash, created_at) values (?, ?, ?, ?, ?)'
		).run(userId, `Test ${role}`, email, passwordHash, Date.now());
		db.prepare(
			'insert into membership (id, user_id, clinic_id, role, created_at) values (?, ?, ?, ?, ?)'
		).run(crypto.randomUUID(), userId, clinicId, role, Date.now());
	} finally {
		db.close();
	}
	return email;
}

function count(sql: string, ...params: unknown[]): number {
	const db = database();
	try {
		return (db.prepare(sql).get(...params) as { n: number }).n;
	} finally {
		db.close();
	}
}

/** The limits count by client address too; these tests must not lock out the rest of the suite. */
test.afterEach(() => {
	const db = database();
	try {
		db.prepare("delete from sign_in_attempt where email like '%@security-test.example'").run();
	} finally {
		db.close();
	}
});

async function tokenOf(context: APIRequestContext): Promise<string> {
	const cookie = (await context.storageState()).cookies.find((c) => c.name === SESSION_COOKIE);
	expect(cookie, 'a session cookie').toBeDefined();
	return cookie!.value;
}

/** A fresh client that presents only a copied session token, as a thief would. */
function withCopiedToken(token: string): Promise<APIRequestContext> {
	return request.newContext({
		baseURL: E2E.origin,
		extraHTTPHeaders: { Cookie: `${SESSION_COOKIE}=${token}` }
	});
}

const form = (fields: Record<string, string>) => ({
	form: fields,
	headers: { Origin: E2E.origin, Accept: 'text/html' },
	maxRedirects: 0
});
/** The sign-in page's two forms, as the page posts them. */
const passwordSignIn = (fields: Record<string, string>) =>
	form({ providerId: 'credentials', ...fields });
const linkRequest = (fields: Record<string, string>) =>
	form({ providerId: 'nodemailer', ...fields });

test.describe('every sign-in path is limited and audited', () => {
	test("Auth.js's raw routes are closed: only Kinelume's forms reach a sign-in", async () => {
		const email = seedStaff('clinician');
		const api = await request.newContext({ baseURL: E2E.origin });
		for (const path of [
			'/auth/callback/credentials',
			'/auth/signin/credentials',
			'/auth/signin/nodemailer',
			'/auth/signout'
		]) {
			const response = await api.post(path, {
				form: { email, password: 'wrong-password', csrfToken: 'x' },
				headers: { Origin: E2E.origin },
				maxRedirects: 0
			});
			expect(response.status(), `POST ${path}`).toBe(404);
		}
		// The built-in pages and JSON are gone too; the e-mailed link's landing stays.
		for (const path of [
			'/auth/signin',
			'/auth/signout',
			'/auth/csrf',
			'/auth/session',
			'/auth/providers',
			'/auth/error',
			'/auth/verify-request'
		]) {
			expect((await api.get(path, { maxRedirects: 0 })).status(), `GET ${path}`).toBe(404);
		}
		const link = await api.get('/auth/callback/nodemailer?token=nope&email=x%40y.example', {
			maxRedirects: 0
		});
		expect(link.status()).toBe(302);
		expect(link.headers().location).toContain('/signin?error=Verification');
		// None of the refused attempts spent a link or a password check.
		expect(count('select count(*) as n from sign_in_attempt where email = ?', email)).toBe(0);
		await api.dispose();
	});

	test('five wrong passwords lock the account, even for the right one, each audited', async () => {
		const email = seedStaff('clinician');
		const api = await request.newContext({ baseURL: E2E.origin });
		for (let i = 0; i < 5; i++) {
			const wrong = await api.post(
				'/signin?/password',
				passwordSignIn({ email, password: `guess-${i}` })
			);
			expect(wrong.status()).toBe(400);
		}
		const right = await api.post(
			'/signin?/password',
			passwordSignIn({ email, password: DEMO_PASSWORD })
		);
		expect(right.status()).toBe(429);
		expect(Number(right.headers()['retry-after'])).toBeGreaterThan(0);
		expect(await right.text()).toMatch(/Wait \d+ minutes? and try again/);
		expect(
			count(
				"select count(*) as n from sign_in_attempt where kind = 'password-failure' and email = ?",
				email
			)
		).toBe(5);
		expect(
			count(
				"select count(*) as n from audit_event where kind = 'sign-in-failed' and subject = ?",
				email
			)
		).toBe(5);
		await api.dispose();
	});

	test('sign-in links: at most five an address, and only the newest one works', async ({
		browser
	}) => {
		const email = seedStaff('clinician');
		const api = await request.newContext({ baseURL: E2E.origin });
		const since = Date.now();
		for (let i = 0; i < 7; i++) {
			const asked = await api.post('/signin?/link', linkRequest({ email, redirectTo: '/home' }));
			// Past the limit the answer is the same as ever, so the form reveals nothing.
			expect(asked.status()).toBe(303);
			expect(asked.headers().location).toBe('/signin/link-sent');
		}
		const list = (await (await fetch(`${E2E.mailApi}/messages`)).json()) as {
			to: string[];
			date: string;
		}[];
		const sent = list.filter(
			(m) => m.to.includes(email) && new Date(m.date).getTime() >= since - 1000
		);
		expect(sent).toHaveLength(5);
		expect(count('select count(*) as n from verificationToken where identifier = ?', email)).toBe(
			1
		);
		expect(
			count(
				"select count(*) as n from audit_event where kind = 'sign-in-link-requested' and subject = ?",
				email
			)
		).toBe(5);

		// The newest link signs in; an older one was retired when the next was made.
		const newest = await waitForMail(email, since);
		const link = firstLink(newest.text, '/auth/callback/nodemailer');
		const context = await browser.newContext({ baseURL: E2E.origin });
		const page = await context.newPage();
		await open(page, link);
		await expect(page).toHaveURL(/\/patients$/);
		await context.close();
		await api.dispose();
	});
});

test.describe('sign-in under attack', () => {
	test('requests sent all at once cannot pass the password limit', async () => {
		const email = seedStaff('clinician');
		const api = await request.newContext({ baseURL: E2E.origin });
		// Twenty guesses at once: each arrives while the others are still being hashed.
		await Promise.all(
			Array.from({ length: 20 }, (_, i) =>
				api.post('/signin?/password', passwordSignIn({ email, password: `parallel-${i}` }))
			)
		);
		expect(
			count(
				"select count(*) as n from sign_in_attempt where kind = 'password-failure' and email = ?",
				email
			)
		).toBe(5);
		await api.dispose();
	});

	test('a forged Host header cannot send the e-mailed link to another site', async () => {
		const email = seedStaff('clinician');
		const since = Date.now();
		const api = await request.newContext({ baseURL: E2E.origin });
		const asked = await api.post('/signin?/link', {
			...linkRequest({ email, redirectTo: '/home' }),
			headers: {
				Origin: E2E.origin,
				Accept: 'text/html',
				'X-Forwarded-Host': 'evil.example',
				'X-Forwarded-Proto': 'https'
			}
		});
		expect(asked.status()).toBe(303);
		const mail = await waitForMail(email, since);
		const links = mail.text.match(/https?:\/\/[^\s<>"]+/g) ?? [];
		expect(links.length).toBeGreaterThan(0);
		for (const link of links) expect(new URL(link).origin).toBe(E2E.origin);
		expect(mail.text).not.toContain('evil.example');
		await api.dispose();
	});

	test('refusals made before any page runs carry the security headers too', async () => {
		const api = await request.newContext({ baseURL: E2E.origin });
		const closed = await api.get('/auth/signin', { maxRedirects: 0 });
		expect(closed.status()).toBe(404);
		expect(closed.headers()['x-content-type-options']).toBe('nosniff');
		expect(closed.headers()['x-frame-options']).toBe('DENY');
		await api.dispose();
	});
});

test.describe('sessions that can be ended', () => {
	test('a copied token stops working after sign-out', async () => {
		const { patientId, email } = await seedSignInPatient(ACCOUNTS.clinician);
		const patient = await signedInRequest(email);
		const token = await tokenOf(patient);
		const thief = await withCopiedToken(token);
		for (const path of ['/today', `/api/patients/${patientId}`, '/api/me/caption-style']) {
			expect((await thief.get(path, { maxRedirects: 0 })).status(), `before: ${path}`).toBe(200);
		}
		const out = await patient.post('/signout', form({}));
		expect(out.status()).toBe(303);
		expect((await thief.get('/today', { maxRedirects: 0 })).status()).toBe(303);
		expect((await thief.get(`/api/patients/${patientId}`, { maxRedirects: 0 })).status()).toBe(401);
		expect((await thief.get('/api/me/caption-style', { maxRedirects: 0 })).status()).toBe(401);
		await Promise.all([patient.dispose(), thief.dispose()]);
	});

	test('a password change ends the other sessions and keeps this one', async () => {
		const email = seedStaff('clinician');
		const desk = await signedInRequest(email);
		const phone = await signedInRequest(email);
		const since = Date.now();
		const changed = await phone.post(
			'/account?/password',
			form({
				current: DEMO_PASSWORD,
				password: 'a-new-password-2026',
				confirm: 'a-new-password-2026'
			})
		);
		expect(changed.status()).toBe(200);
		expect((await desk.get('/account', { maxRedirects: 0 })).status()).toBe(303);
		expect((await phone.get('/account', { maxRedirects: 0 })).status()).toBe(200);
		// The owner hears of it, in case the session that changed it was not theirs.
		const notice = await waitForMail(email, since, 'Your Kinelume password was changed');
		expect(notice.text).toContain('Your other sessions were signed out.');
		expect(notice.text).toContain('“Sign out everywhere”');
		await Promise.all([desk.dispose(), phone.dispose()]);
	});

	test('"sign out everywhere" ends every session, this one included', async () => {
		const email = seedStaff('educator');
		const one = await signedInRequest(email);
		const two = await signedInRequest(email);
		const copied = await withCopiedToken(await tokenOf(two));
		const ended = await one.post('/account?/everywhere', form({}));
		expect(ended.status()).toBe(303);
		expect(ended.headers().location).toBe('/signin?ended=everywhere');
		for (const context of [one, two, copied]) {
			expect((await context.get('/curate', { maxRedirects: 0 })).status()).toBe(303);
		}
		await Promise.all([one.dispose(), two.dispose(), copied.dispose()]);
	});

	test('removing a member and changing a role end their sessions at once', async () => {
		const removed = seedStaff('clinician');
		const promoted = seedStaff('clinician');
		const admin = await signedInRequest(ACCOUNTS.admin);
		const removedSession = await signedInRequest(removed);
		const promotedSession = await signedInRequest(promoted);
		const membershipOf = (email: string) => {
			const db = database();
			try {
				return (
					db
						.prepare(
							'select m.id from membership m join user u on u.id = m.user_id where u.email = ?'
						)
						.get(email) as { id: string }
				).id;
			} finally {
				db.close();
			}
		};
		const roleChange = await admin.post(
			'/clinic?/role',
			form({ membershipId: membershipOf(promoted), role: 'educator' })
		);
		expect(roleChange.status()).toBe(200);
		expect((await promotedSession.get('/patients', { maxRedirects: 0 })).status()).toBe(303);
		const removal = await admin.post('/clinic?/remove', form({ id: membershipOf(removed) }));
		expect(removal.status()).toBe(200);
		expect((await removedSession.get('/patients', { maxRedirects: 0 })).status()).toBe(303);
		await Promise.all([admin.dispose(), removedSession.dispose(), promotedSession.dispose()]);
	});
});

test.describe('caption data cannot break out of its field', () => {
	test('a region holding a newline and a cue is refused by save; a bad file by import', async () => {
		const recordingId = await seedReadyRecording(ACCOUNTS.clinician);
		const trackId = seedCaptionTrack(recordingId);
		const clinician = await signedInRequest(ACCOUNTS.clinician);
		const smuggle = {
			id: '1',
			start: 0,
			end: 2,
			text: 'Slide your heel.',
			settings: { region: 'r\n\n00:00:02.600 --> 00:00:05.500\nSMUGGLED TEXT' }
		};
		const saved = await clinician.post(`/api/tracks/${trackId}/versions`, {
			data: { baseVersion: 1, cues: [smuggle] },
			headers: { Origin: E2E.origin }
		});
		expect(saved.status()).toBe(400);
		expect(JSON.stringify(await saved.json())).toMatch(/region name cannot hold/);

		const longId = `${'x'.repeat(600)}\n00:00:00.000 --> 00:00:01.000\nA cue with a very long name.\n`;
		const imported = await clinician.post(`/api/tracks/${trackId}/import`, {
			multipart: {
				file: { name: 'long.vtt', mimeType: 'text/vtt', buffer: Buffer.from(`WEBVTT\n\n${longId}`) }
			},
			headers: { Origin: E2E.origin }
		});
		expect(imported.status()).toBe(422);
		expect((await imported.json()).error.message).toMatch(/cue name can be at most 500/);

		// Nothing was stored: the served file is still the seeded one cue.
		const served = await (await clinician.get(`/api/tracks/${trackId}/captions.vtt`)).text();
		expect(served).not.toContain('SMUGGLED');
		expect(served.match(/-->/g)).toHaveLength(1);
		await clinician.dispose();
	});
});

test.describe('the development inbox stays inside its clinic', () => {
	test("another clinic's admin sees none of this clinic's messages", async () => {
		const email = seedStaff('clinician');
		const since = Date.now();
		const anyone = await request.newContext({ baseURL: E2E.origin });
		await anyone.post('/signin?/link', linkRequest({ email }));
		const mail = await waitForMail(email, since);

		const own = await signedInRequest(ACCOUNTS.admin);
		expect(await (await own.get('/inbox')).text()).toContain(email);
		expect((await own.get(`/inbox/${mail.id}`)).status()).toBe(200);

		const foreign = await signedInRequest(ACCOUNTS.otherClinicAdmin);
		const list = await foreign.get('/inbox');
		expect(list.status()).toBe(200);
		expect(await list.text()).not.toContain(email);
		expect((await foreign.get(`/inbox/${mail.id}`)).status()).toBe(404);
		await Promise.all([anyone.dispose(), own.dispose(), foreign.dispose()]);
	});
});

test.describe('no redirect leaves the site', () => {
	// The vectors of the WHATWG URL parser's quirks (tab and newline stripping, backslashes as
	// slashes) and the usual open-redirect lists; the unit tests hold the full list.
	const vectors = [
		'/\t/evil.example/phish',
		'/%09/evil.example/phish',
		'/\n/evil.example',
		'//evil.example/',
		'/\\evil.example',
		'/%2f%2fevil.example',
		'/%5cevil.example',
		'https://evil.example/',
		'javascript:alert(1)',
		'/é/../..//evil.example'
	];

	test('after a password sign-in, and on the sign-in page when already signed in', async () => {
		const email = seedStaff('clinician');
		for (const vector of vectors) {
			const api = await request.newContext({ baseURL: E2E.origin });
			const signedIn = await api.post(
				'/signin?/password',
				passwordSignIn({ email, password: DEMO_PASSWORD, redirectTo: vector })
			);
			expect(signedIn.status(), JSON.stringify(vector)).toBe(303);
			const target = new URL(signedIn.headers().location, E2E.origin);
			expect(target.origin, JSON.stringify(vector)).toBe(E2E.origin);

			const again = await api.get(`/signin?next=${encodeURIComponent(vector)}`, {
				maxRedirects: 0
			});
			expect(again.status(), JSON.stringify(vector)).toBe(303);
			expect(new URL(again.headers().location, E2E.origin).origin).toBe(E2E.origin);
			await api.dispose();
		}
	});

	test('through an e-mailed link whose callbackUrl is hostile', async ({ browser }) => {
		const email = seedStaff('clinician');
		const since = Date.now();
		const api = await request.newContext({ baseURL: E2E.origin });
		await api.post('/signin?/link', linkRequest({ email, redirectTo: '/\t/evil.example/phish' }));
		const link = firstLink((await waitForMail(email, since)).text, '/auth/callback/nodemailer');
		const context = await browser.newContext({ baseURL: E2E.origin });
		const page = await context.newPage();
		await open(page, link);
		expect(new URL(page.url()).origin).toBe(E2E.origin);
		await context.close();
		await api.dispose();
	});
});

test.describe('the smaller holes', () => {
	test('the public health check says only up or down; an admin sees the details', async () => {
		const anyone = await request.newContext({ baseURL: E2E.origin });
		expect(await (await anyone.get('/api/health')).json()).toEqual({ status: 'ok' });
		const admin = await signedInRequest(ACCOUNTS.admin);
		const detailed = await (await admin.get('/api/health')).json();
		expect(detailed.storage.ok).toBe(true);
		expect(detailed.mail.detail).toContain('127.0.0.1');
		await Promise.all([anyone.dispose(), admin.dispose()]);
	});

	test('a post with a body and no content type gets a 400 in words', async () => {
		const response = await fetch(`${E2E.origin}/signin?/password`, {
			method: 'POST',
			body: new Uint8Array(Buffer.from('email=a%40b.example&password=x')),
			headers: { Origin: E2E.origin }
		});
		expect(response.status).toBe(400);
		expect(await response.text()).toContain('no Content-Type');
	});

	test('the live save cannot change a published programme behind the patient’s back', async () => {
		const { patientId } = await seedSignInPatient(ACCOUNTS.clinician);
		const { programmeId } = seedProgramme(patientId, [{ title: 'Heel slides' }]);
		const clinician = await signedInRequest(ACCOUNTS.clinician);
		const before = await (await clinician.get(`/api/programmes/${programmeId}`)).json();
		const put = await clinician.put(`/api/programmes/${programmeId}`, {
			data: { ...before, title: 'Changed quietly' },
			headers: { Origin: E2E.origin }
		});
		expect(put.status()).toBe(409);
		expect((await put.json()).error.message).toMatch(/Save changes and e-mail/);
		const after = await (await clinician.get(`/api/programmes/${programmeId}`)).json();
		expect(after.title).toBe(before.title);
		await clinician.dispose();
	});

	test("inviting another clinic's member answers as if the address were new", async () => {
		const admin = await signedInRequest(ACCOUNTS.admin);
		const elsewhere = await admin.post(
			'/clinic?/invite',
			form({ email: ACCOUNTS.otherClinicClinician, role: 'clinician' })
		);
		const unknown = await admin.post(
			'/clinic?/invite',
			form({
				email: `new-${crypto.randomUUID().slice(0, 8)}@security-test.example`,
				role: 'clinician'
			})
		);
		expect(elsewhere.status()).toBe(unknown.status());
		expect(elsewhere.status()).toBe(200);
		const own = await admin.post(
			'/clinic?/invite',
			form({ email: ACCOUNTS.clinician, role: 'clinician' })
		);
		expect(own.status()).toBe(409);
		await admin.dispose();
	});
});

test.describe('served over https', () => {
	const origin = 'https://kinelume-tls.example';
	let port: number;
	let server: ChildProcess;

	test.beforeAll(async () => {
		port = await getPort({ host: '127.0.0.1' });
		// The same build, data and fakes as the main stack, told that it is served over https
		// (as behind a TLS proxy); it shares the database, so it runs no background work.
		server = spawn(process.execPath, [resolve(import.meta.dirname, '../../build')], {
			env: {
				...process.env,
				PORT: String(port),
				HOST: '127.0.0.1',
				ORIGIN: origin,
				DATABASE_PATH: E2E.databasePath,
				S3_ENDPOINT: `http://127.0.0.1:${E2E.storagePort}`,
				SMTP_PORT: String(E2E.smtpPort),
				DEV_INBOX_URL: E2E.mailApi,
				AUTH_SECRET: 'e2e-only-secret-that-is-long-enough-0123456789',
				WORKER_IN_APP: 'false',
				DIGEST_ENABLED: 'false',
				// adapter-node waits this long for open connections at shutdown (seconds).
				SHUTDOWN_TIMEOUT: '1'
			},
			stdio: ['ignore', 'ignore', 'pipe']
		});
		let said = '';
		server.stderr?.on('data', (chunk: Buffer) => (said += chunk.toString()));
		for (let i = 0; i < 300 && server.exitCode === null; i++) {
			const up = await fetch(`http://127.0.0.1:${port}/api/health`).catch(() => null);
			if (up?.ok) return;
			await new Promise((r) => setTimeout(r, 100));
		}
		throw new Error(`the https-origin server did not start: ${said.slice(-2000)}`);
	});

	test.afterAll(async () => {
		if (!server || server.exitCode !== null) return;
		const exited = new Promise((done) => server.once('exit', done));
		server.kill('SIGTERM');
		await exited;
	});

	test('sends HSTS and sets only Secure session cookies', async () => {
		const page = await fetch(`http://127.0.0.1:${port}/signin`);
		expect(page.headers.get('strict-transport-security')).toMatch(/max-age=\d{7,}/);
		const email = seedStaff('clinician');
		const signedIn = await fetch(`http://127.0.0.1:${port}/signin?/password`, {
			method: 'POST',
			body: new URLSearchParams({
				providerId: 'credentials',
				email,
				password: DEMO_PASSWORD,
				redirectTo: '/home'
			}),
			headers: { Origin: origin, Accept: 'text/html' },
			redirect: 'manual'
		});
		expect(signedIn.status).toBe(303);
		const cookies = signedIn.headers.getSetCookie();
		const session = cookies.find((c) => c.includes('authjs.session-token='));
		expect(session).toMatch(/^__Secure-authjs\.session-token=/);
		expect(session).toMatch(/;\s*Secure/i);
		for (const cookie of cookies) expect(cookie, cookie.split('=')[0]).toMatch(/;\s*Secure/i);
	});
});
