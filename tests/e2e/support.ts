import {
	expect,
	request,
	type APIRequestContext,
	type Page,
	type Response
} from '@playwright/test';
import { EXERCISE_TAGS, PRECAUTIONS } from '../../src/lib/clinical/precautions';
import { PROTOCOL_IDS } from '../../src/lib/clinical/phases';
import { MOTIONS } from '../../src/lib/clinical/rom';
import AxeBuilder from '@axe-core/playwright';
import Database from 'better-sqlite3';
import { PutObjectCommand, S3Client } from '@aws-sdk/client-s3';
import { E2E } from './ports';
import { DEMO_PASSWORD } from '../../src/scripts/demo/seed';

export { DEMO_PASSWORD };

/** A client for the e2e storage fake, set up as the app sets up its own (see STACK.md on s3rver). */
export function storageClient(): S3Client {
	return new S3Client({
		region: 'us-east-1',
		endpoint: `http://127.0.0.1:${E2E.storagePort}`,
		forcePathStyle: true,
		credentials: { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' },
		requestChecksumCalculation: 'WHEN_REQUIRED',
		responseChecksumValidation: 'WHEN_REQUIRED'
	});
}

/** The seeded demo accounts the tests sign in as (all invented; see src/scripts/demo/seed.ts). */
export const ACCOUNTS = {
	admin: 'admin@alder-street.example',
	clinician: 'clinician@alder-street.example',
	educator: 'educator@alder-street.example',
	patient: 'patient@alder-street.example',
	/** Same clinic, another patient: the one the first patient must never read. */
	otherPatient: 'edna.marsh@alder-street.example',
	otherClinicAdmin: 'admin@harbour-lane.example',
	otherClinicClinician: 'clinician@harbour-lane.example',
	otherClinicPatient: 'patient@harbour-lane.example'
} as const;

export type MatrixRole = 'public' | 'patient' | 'clinician' | 'educator' | 'admin';
export const MATRIX_ROLES: MatrixRole[] = ['public', 'patient', 'clinician', 'educator', 'admin'];

/** Reads the e2e database directly, for ids and for arranging states (an expired link). */
export function database(): Database.Database {
	return new Database(E2E.databasePath);
}

export function idOf(sql: string, ...params: unknown[]): string {
	const db = database();
	try {
		const row = db.prepare(sql).get(...params) as { id: string } | undefined;
		if (!row) throw new Error(`No row for ${sql} ${JSON.stringify(params)}`);
		return row.id;
	} finally {
		db.close();
	}
}

/** A request context signed in with a password through the real sign-in form action. */
export async function signedInRequest(
	email: string,
	password = DEMO_PASSWORD
): Promise<APIRequestContext> {
	const context = await request.newContext({ baseURL: E2E.origin });
	const response = await context.post('/signin?/password', {
		form: { providerId: 'credentials', email, password, redirectTo: '/home' },
		headers: { Origin: E2E.origin, Accept: 'text/html' },
		maxRedirects: 0
	});
	expect(response.status(), `password sign-in for ${email}`).toBe(303);
	return context;
}

export async function contextFor(role: MatrixRole): Promise<APIRequestContext> {
	if (role === 'public') return request.newContext({ baseURL: E2E.origin });
	return signedInRequest(ACCOUNTS[role]);
}

/**
 * Signs in through the page, as a person would, and waits until the app has moved on from the
 * sign-in page (pass `expectSuccess: false` for attempts that should fail).
 */
export async function signInWithPassword(
	page: Page,
	email: string,
	password = DEMO_PASSWORD,
	expectSuccess = true
) {
	await page.goto('/signin');
	const form = page.locator('form[action="?/password"]');
	await form.getByLabel('E-mail address').fill(email);
	await form.getByLabel('Password').fill(password);
	await form.getByRole('button', { name: 'Sign in' }).click();
	if (expectSuccess) await page.waitForURL((url) => !url.pathname.startsWith('/signin'));
	else await expect(page.getByRole('alert')).toBeVisible();
}

async function started(page: Page, response: Response | null) {
	const html = (response?.headers()['content-type'] ?? '').startsWith('text/html');
	if (html) await page.locator('html[data-started]').waitFor({ state: 'attached' });
	return response;
}

/**
 * Opens a page and, when it is one of the app's pages, waits until its script has started.
 * Until then its forms work as plain HTML (by design), so a test that presses Enter too soon gets
 * a full-page answer without what the script adds (focus moved, a live message) and fails on some
 * runs only. Pages in a context without scripts must use `page.goto` directly.
 */
export async function open(page: Page, path: string, options?: Parameters<Page['goto']>[1]) {
	const response = await page.goto(path, options);
	return started(page, response);
}

/** Loads the page again and waits for its script, as `open` does. */
export async function reload(page: Page) {
	const response = await page.reload();
	return started(page, response);
}

/** Opens a page and checks the app did not send us elsewhere (e.g. back to sign in). */
export async function visit(page: Page, path: string) {
	await open(page, path);
	expect(new URL(page.url()).pathname, `visiting ${path}`).toBe(path.split('?')[0]);
}

interface MessageSummary {
	id: string;
	to: string[];
	subject: string;
	date: string;
}

/**
 * Waits for the newest message to `email` that arrived after `since` (and whose subject
 * contains `subject`, when given), and returns its text.
 */
export async function waitForMail(
	email: string,
	since: number,
	subject = ''
): Promise<{ id: string; subject: string; text: string }> {
	for (let attempt = 0; attempt < 50; attempt++) {
		const list = (await (await fetch(`${E2E.mailApi}/messages`)).json()) as MessageSummary[];
		const found = list.find(
			(m) =>
				m.to.includes(email) &&
				m.subject.includes(subject) &&
				new Date(m.date).getTime() >= since - 1000
		);
		if (found) {
			const full = (await (await fetch(`${E2E.mailApi}/messages/${found.id}`)).json()) as {
				text: string;
				subject: string;
			};
			return { id: found.id, subject: full.subject, text: full.text };
		}
		await new Promise((r) => setTimeout(r, 200));
	}
	throw new Error(`No e-mail to ${email} arrived`);
}

export function firstLink(text: string, pathPart: string): string {
	const link = text.match(/https?:\/\/[^\s<>"]+/g)?.find((url) => url.includes(pathPart));
	if (!link) throw new Error(`No link containing ${pathPart} in: ${text}`);
	return link;
}

/**
 * The words Kinelume stores as ids (precautions, exercise tags, motions, protocols): a screen
 * shows their labels, never these. Only the hyphenated ones, which no sentence contains by chance.
 */
const RAW_IDS = [
	...Object.keys(PRECAUTIONS),
	...Object.keys(EXERCISE_TAGS),
	...Object.keys(MOTIONS),
	...PROTOCOL_IDS
].filter((id) => id.includes('-'));

/** Expects the page's visible text to hold no raw vocabulary id. */
export async function expectNoRawIds(page: Page) {
	const text = await page.locator('body').innerText();
	const found = RAW_IDS.filter((id) => new RegExp(`(^|[^\\w-])${id}($|[^\\w-])`).test(text));
	expect(found, `raw vocabulary ids on ${page.url()}`).toEqual([]);
}

/**
 * Runs axe-core on the current page and expects no violations at WCAG 2.x A/AA, and (every page
 * a test scans this way) no raw vocabulary id in its text.
 */
export async function expectNoAxeViolations(page: Page) {
	await expectNoRawIds(page);
	const results = await new AxeBuilder({ page })
		.withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa', 'best-practice'])
		.analyze();
	const summary = results.violations.map(
		(v) => `${v.id}: ${v.help} (${v.nodes.map((n) => n.target.join(' ')).join(', ')})`
	);
	expect(summary, `axe on ${page.url()}`).toEqual([]);
}

/**
 * Puts a ready recording straight into the e2e database and storage for `clinicianEmail`'s
 * clinic (a few bytes stand in for the rendition and the poster, unless a real rendition is
 * given), and returns its id.
 */
export async function seedReadyRecording(
	clinicianEmail: string,
	real?: { rendition: Uint8Array; durationSeconds: number; title: string }
): Promise<string> {
	const db = database();
	const id = crypto.randomUUID();
	let clinicId: string;
	try {
		const member = db
			.prepare(
				'select m.clinic_id as clinicId, u.id as userId from membership m join user u on u.id = m.user_id where u.email = ?'
			)
			.get(clinicianEmail) as { clinicId: string; userId: string };
		clinicId = member.clinicId;
		db.prepare(
			`insert into recording (id, clinic_id, uploaded_by, title, original_filename, content_type, size_bytes, status,
			 duration_seconds, width, height, video_codec, poster_count, created_at, ready_at)
			 values (?, ?, ?, ?, 'seeded.mp4', 'video/mp4', 16, 'ready', ?, 320, 240, 'h264', 1, ?, ?)`
		).run(
			id,
			clinicId,
			member.userId,
			real?.title ?? 'Seeded recording',
			real?.durationSeconds ?? 1,
			Date.now(),
			Date.now()
		);
	} finally {
		db.close();
	}
	const s3 = storageClient();
	const prefix = `clinics/${clinicId}/recordings/${id}/`;
	for (const [key, type] of [
		['rendition.mp4', 'video/mp4'],
		['posters/0.jpg', 'image/jpeg']
	]) {
		await s3.send(
			new PutObjectCommand({
				Bucket: 'kinelume',
				Key: prefix + key,
				Body: key === 'rendition.mp4' && real ? real.rendition : 'seeded bytes',
				ContentType: type
			})
		);
	}
	s3.destroy();
	return id;
}

/** Puts a track with one version of `cues` on a recording, and returns the track's id. */
export function seedCaptionTrack(
	recordingId: string,
	cues: { id: string; start: number; end: number; text: string }[] = [
		{ id: '1', start: 0, end: 1, text: 'Seeded cue.' }
	],
	{ kind = 'captions', language = 'en-GB' } = {}
): string {
	const db = database();
	const id = crypto.randomUUID();
	try {
		const { clinicId } = db
			.prepare('select clinic_id as clinicId from recording where id = ?')
			.get(recordingId) as { clinicId: string };
		const now = Date.now();
		db.prepare(
			`insert into caption_track (id, recording_id, clinic_id, kind, language, label, current_version, created_at, updated_at)
			 values (?, ?, ?, ?, ?, 'Seeded', 1, ?, ?)`
		).run(id, recordingId, clinicId, kind, language, now, now);
		db.prepare(
			`insert into caption_track_version (id, track_id, version, cues, source, note, created_at)
			 values (?, ?, 1, ?, 'import', 'seeded', ?)`
		).run(crypto.randomUUID(), id, JSON.stringify(cues), now);
	} finally {
		db.close();
	}
	return id;
}
