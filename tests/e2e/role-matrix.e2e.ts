import { expect, test, type APIRequestContext, type Browser, type Page } from '@playwright/test';
import { readdirSync, statSync } from 'node:fs';
import { join, relative, resolve, sep } from 'node:path';
import {
	ACCOUNTS,
	contextFor,
	idOf,
	MATRIX_ROLES,
	seedCaptionTrack,
	seedReadyRecording,
	open,
	type MatrixRole
} from './support';
import { E2E } from './ports';
import { studio } from './matrix/studio';
import { segmentsPart } from './matrix/segments';
import { followupPart } from './matrix/followup';
import { patientPart } from './matrix/patient';
import { programmesPart } from './matrix/programmes';
import { libraryPart } from './matrix/library';
import { speechPart } from './matrix/speech';
import { replayCodesPart } from './matrix/replay-codes';
import {
	clinicianApi,
	everyone,
	MEDIA_OK,
	onlyPage,
	type Fixture,
	type MatrixPart,
	type Row
} from './matrix/types';

/** Each domain keeps its rows in its own file under matrix/; list it here. */
const PARTS: MatrixPart[] = [
	studio,
	segmentsPart,
	followupPart,
	patientPart,
	libraryPart,
	programmesPart,
	speechPart,
	replayCodesPart
];

/**
 * The role matrix: every route that exists × every role (and the signed-out public) → the
 * status the server must answer. A route added under src/routes without a row here fails the
 * first test, so nobody can add a page or endpoint without deciding who may reach it.
 *
 * Statuses: 200 allowed; 303 a page sending the signed-out to sign in (or a signed-in person on
 * to their home); 401 an endpoint refusing the signed-out; 403 the wrong role; 404 another
 * person's or clinic's record (answered as "not found" so ids cannot be probed); 410 a spent link.
 */

const BASE_ROWS: Row[] = [
	{ route: '/(public)', path: () => '/', expect: everyone(200) },
	{
		route: '/(public)/signin',
		note: 'signed-in people go to their home',
		path: () => '/signin',
		expect: { ...everyone(303), public: 200 }
	},
	{ route: '/(public)/signin/link-sent', path: () => '/signin/link-sent', expect: everyone(200) },
	{ route: '/(public)/signout', path: () => '/signout', expect: everyone(200) },
	{
		route: '/(public)/invite/[token]',
		note: 'a token that matches nothing',
		path: () => '/invite/AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA',
		expect: everyone(404)
	},
	{
		route: '/(member)/home',
		note: 'everyone is sent on (to sign in, or home)',
		path: () => '/home',
		expect: everyone(303)
	},
	{ route: '/(member)/account', path: () => '/account', expect: { ...everyone(200), public: 303 } },
	{ route: '/(admin)/clinic', path: () => '/clinic', expect: onlyPage('admin') },
	{ route: '/(admin)/inbox', path: () => '/inbox', expect: onlyPage('admin') },
	{ route: '/(admin)/inbox/[id]', path: (f) => `/inbox/${f.messageId}`, expect: onlyPage('admin') },
	{ route: '/(clinician)/patients', path: () => '/patients', expect: onlyPage('clinician') },
	{
		route: '/(clinician)/patients/[id=id]',
		note: "own clinic's patient",
		path: (f) => `/patients/${f.patientId}`,
		expect: onlyPage('clinician')
	},
	{
		route: '/(clinician)/patients/[id=id]',
		note: "another clinic's patient",
		path: (f) => `/patients/${f.otherClinicPatientId}`,
		expect: { ...onlyPage('clinician'), clinician: 404 }
	},
	{ route: '/(clinician)/recordings', path: () => '/recordings', expect: onlyPage('clinician') },
	{
		route: '/(clinician)/recordings',
		note: 'sorted, filtered, paged',
		path: () => '/recordings?sort=length&dir=asc&status=ready&q=knee&page=2',
		expect: onlyPage('clinician')
	},
	{
		route: '/(clinician)/recordings/[id=id]',
		note: "own clinic's recording",
		path: (f) => `/recordings/${f.recordingId}`,
		expect: onlyPage('clinician')
	},
	{
		route: '/(clinician)/recordings/[id=id]',
		note: "another clinic's recording",
		path: (f) => `/recordings/${f.otherClinicRecordingId}`,
		expect: { ...onlyPage('clinician'), clinician: 404 }
	},
	{
		route: '/api/uploads',
		note: "the caller's unfinished uploads",
		path: () => '/api/uploads',
		expect: clinicianApi(200)
	},
	{
		route: '/api/uploads/[id=id]',
		note: "an upload that is not in the caller's clinic",
		path: () => `/api/uploads/${crypto.randomUUID()}`,
		expect: clinicianApi(404)
	},
	{
		route: '/api/uploads/[id=id]/parts',
		note: 'POST only (its roles are checked in recordings.e2e.ts)',
		path: () => `/api/uploads/${crypto.randomUUID()}/parts`,
		expect: everyone(405)
	},
	{
		route: '/api/uploads/[id=id]/complete',
		note: 'POST only (its roles are checked in recordings.e2e.ts)',
		path: () => `/api/uploads/${crypto.randomUUID()}/complete`,
		expect: everyone(405)
	},
	{
		route: '/api/recordings',
		note: "the clinic's recordings list, polled by /recordings",
		path: () => '/api/recordings?sort=length&dir=asc&status=processing&page=1',
		expect: clinicianApi(200)
	},
	{
		route: '/api/recordings/[id=id]',
		note: "own clinic's recording",
		path: (f) => `/api/recordings/${f.recordingId}`,
		expect: clinicianApi(200)
	},
	{
		route: '/api/recordings/[id=id]',
		note: "another clinic's recording",
		path: (f) => `/api/recordings/${f.otherClinicRecordingId}`,
		expect: clinicianApi(404)
	},
	{
		route: '/api/recordings/[id=id]/media/[asset]',
		note: "own clinic's rendition",
		path: (f) => `/api/recordings/${f.recordingId}/media/rendition.mp4`,
		expect: clinicianApi(MEDIA_OK)
	},
	{
		route: '/api/recordings/[id=id]/media/[asset]',
		note: "own clinic's poster",
		path: (f) => `/api/recordings/${f.recordingId}/media/poster-0.jpg`,
		expect: clinicianApi(MEDIA_OK)
	},
	{
		route: '/api/recordings/[id=id]/media/[asset]',
		note: "another clinic's rendition",
		path: (f) => `/api/recordings/${f.otherClinicRecordingId}/media/rendition.mp4`,
		expect: clinicianApi(404)
	},
	{
		route: '/api/recordings/[id=id]/media/[asset]',
		note: 'a name that is no asset',
		path: (f) => `/api/recordings/${f.recordingId}/media/original`,
		expect: clinicianApi(404)
	},
	{
		route: '/(clinician)/recordings/[id=id]/captions',
		note: "own clinic's recording",
		path: (f) => `/recordings/${f.recordingId}/captions`,
		expect: onlyPage('clinician')
	},
	{
		route: '/(clinician)/recordings/[id=id]/captions',
		note: "another clinic's recording",
		path: (f) => `/recordings/${f.otherClinicRecordingId}/captions`,
		expect: { ...onlyPage('clinician'), clinician: 404 }
	},
	{
		route: '/api/recordings/[id=id]/tracks',
		note: "own clinic's recording",
		path: (f) => `/api/recordings/${f.recordingId}/tracks`,
		expect: clinicianApi(200)
	},
	{
		route: '/api/recordings/[id=id]/tracks',
		note: "another clinic's recording",
		path: (f) => `/api/recordings/${f.otherClinicRecordingId}/tracks`,
		expect: clinicianApi(404)
	},
	{
		route: '/api/tracks/[id=id]/versions',
		note: "own clinic's track",
		path: (f) => `/api/tracks/${f.trackId}/versions`,
		expect: clinicianApi(200)
	},
	{
		route: '/api/tracks/[id=id]/versions',
		note: "another clinic's track",
		path: (f) => `/api/tracks/${f.otherClinicTrackId}/versions`,
		expect: clinicianApi(404)
	},
	{
		route: '/api/tracks/[id=id]/import',
		note: 'POST only (its roles are checked in captions.e2e.ts)',
		path: (f) => `/api/tracks/${f.trackId}/import`,
		expect: everyone(405)
	},
	{
		route: '/api/tracks/[id=id]/captions.vtt',
		note: "own clinic's track",
		path: (f) => `/api/tracks/${f.trackId}/captions.vtt`,
		expect: clinicianApi(200)
	},
	{
		route: '/api/tracks/[id=id]/captions.vtt',
		note: "another clinic's track",
		path: (f) => `/api/tracks/${f.otherClinicTrackId}/captions.vtt`,
		expect: clinicianApi(404)
	},
	{
		route: '/api/tracks/[id=id]/captions.srt',
		note: "own clinic's track",
		path: (f) => `/api/tracks/${f.trackId}/captions.srt`,
		expect: clinicianApi(200)
	},
	{
		route: '/api/tracks/[id=id]/captions.srt',
		note: "another clinic's track",
		path: (f) => `/api/tracks/${f.otherClinicTrackId}/captions.srt`,
		expect: clinicianApi(404)
	},
	{
		route: '/api/tracks/[id=id]/transcript.json',
		note: "own clinic's track",
		path: (f) => `/api/tracks/${f.trackId}/transcript.json`,
		expect: clinicianApi(200)
	},
	{
		route: '/api/tracks/[id=id]/transcript.json',
		note: "another clinic's track",
		path: (f) => `/api/tracks/${f.otherClinicTrackId}/transcript.json`,
		expect: clinicianApi(404)
	},
	{
		route: '/api/tracks/[id=id]/captions.vtt',
		note: 'a version that does not exist',
		path: (f) => `/api/tracks/${f.trackId}/captions.vtt?version=99`,
		expect: clinicianApi(404)
	},
	{ route: '/(patient)/today', path: () => '/today', expect: onlyPage('patient') },
	{ route: '/(educator)/curate', path: () => '/curate', expect: onlyPage('educator') },
	{ route: '/api/health', path: () => '/api/health', expect: everyone(200) },
	{
		route: '/api/ping',
		note: 'an upload waiting for the network asks it; empty, for anyone',
		path: () => '/api/ping',
		expect: everyone(204)
	},
	{
		route: '/api/patients/[id=id]',
		note: 'the signed-in patient themself',
		path: (f) => `/api/patients/${f.patientId}`,
		expect: { public: 401, patient: 200, clinician: 200, educator: 403, admin: 403 }
	},
	{
		route: '/api/patients/[id=id]',
		note: 'another patient of the same clinic',
		path: (f) => `/api/patients/${f.otherPatientId}`,
		expect: { public: 401, patient: 404, clinician: 200, educator: 403, admin: 403 }
	},
	{
		route: '/api/patients/[id=id]',
		note: "another clinic's patient",
		path: (f) => `/api/patients/${f.otherClinicPatientId}`,
		expect: { public: 401, patient: 404, clinician: 404, educator: 403, admin: 403 }
	},
	{
		route: '/api/clinics/[id=id]/members',
		note: 'own clinic',
		path: (f) => `/api/clinics/${f.clinicId}/members`,
		expect: { public: 401, patient: 403, clinician: 403, educator: 403, admin: 200 }
	},
	{
		route: '/api/clinics/[id=id]/members',
		note: 'another clinic',
		path: (f) => `/api/clinics/${f.otherClinicId}/members`,
		expect: { public: 401, patient: 403, clinician: 403, educator: 403, admin: 404 }
	}
];

const MATRIX: Row[] = [...BASE_ROWS, ...PARTS.flatMap((part) => part.rows)];

/** A ready recording in each clinic, with a tiny rendition and poster in storage and a captions track. */
async function seedRecordings(): Promise<
	Pick<Fixture, 'recordingId' | 'otherClinicRecordingId' | 'trackId' | 'otherClinicTrackId'>
> {
	const recordingId = await seedReadyRecording(ACCOUNTS.clinician);
	const otherClinicRecordingId = await seedReadyRecording(ACCOUNTS.otherClinicClinician);
	return {
		recordingId,
		otherClinicRecordingId,
		trackId: seedCaptionTrack(recordingId),
		otherClinicTrackId: seedCaptionTrack(otherClinicRecordingId)
	};
}

/** Every route id under src/routes, as SvelteKit names them: a folder with a page or endpoint. */
function routeIds(): string[] {
	const root = resolve(import.meta.dirname, '../../src/routes');
	const ids: string[] = [];
	const walk = (dir: string) => {
		const entries = readdirSync(dir);
		if (entries.some((e) => e === '+page.svelte' || e === '+server.ts')) {
			const rel = relative(root, dir).split(sep).join('/');
			ids.push(rel === '' ? '/' : `/${rel}`);
		}
		for (const e of entries) if (statSync(join(dir, e)).isDirectory()) walk(join(dir, e));
	};
	walk(root);
	return ids.sort();
}

test('every route has a row in the role matrix, and every row names a real route', () => {
	const routes = routeIds();
	const covered = new Set(MATRIX.map((r) => r.route));
	expect(
		routes.filter((r) => !covered.has(r)),
		'routes without a row'
	).toEqual([]);
	expect(
		[...covered].filter((r) => !routes.includes(r)),
		'rows without a route'
	).toEqual([]);
});

test.describe('role matrix', () => {
	let fixture: Fixture;
	const contexts = new Map<MatrixRole, APIRequestContext>();

	test.beforeAll(async () => {
		const messages = (await (await fetch(`${E2E.mailApi}/messages`)).json()) as { id: string }[];
		fixture = {
			patientId: idOf('select id from patient where email = ?', ACCOUNTS.patient),
			otherPatientId: idOf('select id from patient where email = ?', ACCOUNTS.otherPatient),
			otherClinicPatientId: idOf(
				'select id from patient where email = ?',
				ACCOUNTS.otherClinicPatient
			),
			clinicId: idOf("select id from clinic where name = 'Alder Street Community Clinic'"),
			otherClinicId: idOf("select id from clinic where name = 'Harbour Lane Physiotherapy'"),
			messageId: messages[0].id,
			...(await seedRecordings()),
			extra: {}
		};
		for (const part of PARTS) {
			if (part.seed) Object.assign(fixture.extra, await part.seed(fixture));
		}
		for (const role of MATRIX_ROLES) contexts.set(role, await contextFor(role));
	});

	test.afterAll(async () => {
		for (const context of contexts.values()) await context.dispose();
	});

	/**
	 * Every page each role may open, at a phone's width (390 × 844), scrolls only up and down:
	 * a wide table or a long word scrolls inside its own box, never the whole page sideways.
	 */
	test('every page a role may open fits a phone’s width', async ({ browser }) => {
		test.setTimeout(15 * 60_000);
		const wider: string[] = [];
		for (const role of MATRIX_ROLES) {
			const phone = await phoneFor(browser, contexts.get(role)!);
			const page = await phone.newPage();
			for (const row of MATRIX.filter((r) => r.expect[role] === 200 && !isEndpoint(r.route))) {
				const path = row.path(fixture);
				await open(page, path);
				const width = await page.evaluate(() => document.documentElement.scrollWidth);
				if (width > 390) wider.push(`${role} ${path}: ${width} px (${await widest(page)})`);
			}
			await phone.close();
		}
		expect(wider, 'pages wider than the phone').toEqual([]);
	});

	for (const row of MATRIX) {
		test(`${row.route}${row.note ? ` (${row.note})` : ''}`, async () => {
			const path = row.path(fixture);
			const seen: Record<string, number> = {};
			for (const role of MATRIX_ROLES) {
				const response = await contexts.get(role)!.get(path, { maxRedirects: 0 });
				seen[role] = response.status();
				if (response.status() === 303 && role === 'public' && row.expect.public === 303) {
					expect(response.headers().location).toMatch(/^\/signin/);
				}
			}
			expect(seen, `GET ${path}`).toEqual(row.expect);
		});
	}
});

/** A phone-sized browser signed in as the request context is (its cookies carried over). */
async function phoneFor(browser: Browser, signedIn: APIRequestContext) {
	return browser.newContext({
		viewport: { width: 390, height: 844 },
		isMobile: true,
		hasTouch: true,
		storageState: await signedIn.storageState()
	});
}

/** Endpoints and files (an `api/` route, or a route serving a file by its name) are not pages. */
function isEndpoint(route: string): boolean {
	return route.startsWith('/api/') || /\.[a-z0-9]+$/.test(route);
}

/** The outermost elements that reach past the screen's right edge, named for the message. */
function widest(page: Page): Promise<string> {
	return page.evaluate(() => {
		// A phone widens its layout to fit what is too wide, so the edge is the screen's 390 px.
		const past = (el: Element) => el.getBoundingClientRect().right > 391;
		return [...document.body.querySelectorAll('*')]
			.filter((el) => past(el) && el.parentElement && !past(el.parentElement))
			.map((el) => {
				const classes = [...el.classList].slice(0, 3).join('.');
				const words = (el.textContent ?? '').trim().replace(/\s+/g, ' ').slice(0, 30);
				return `${el.tagName.toLowerCase()}${el.id ? `#${el.id}` : ''}${classes ? `.${classes}` : ''} “${words}”`;
			})
			.join('; ');
	});
}
