/**
 * One word and one format per idea, and players in the clip's own shape, on the production build:
 * the replay page writes nothing to the browser's console; pages people read show no ISO dates
 * (2026-11-24) and write a recording's length one way; every player of a clinician or of the
 * library is drawn in its clip's shape (here an upright one). The clip is made here by ffmpeg.
 */
import { mkdirSync } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { expect, test, type Page } from '@playwright/test';
import { seedExercise, seedPublicExercise } from './library-support';
import { makeUprightClip } from './clips';
import { seedProgramme, seedSignInPatient } from './programme-fixtures';
import { seedReadySegment } from './segments-support';
import {
	ACCOUNTS,
	database,
	seedCaptionTrack,
	seedReadyRecording,
	signInWithPassword,
	open,
	visit,
	expectNoAxeViolations
} from './support';

const SHOTS = resolve(import.meta.dirname, '../.run/screens');
const ISO_DATE = /\b\d{4}-\d{2}-\d{2}\b/;
const UPRIGHT = '180 / 320';

const CUES = [
	{ id: '1', start: 0, end: 2.5, text: 'Stand tall beside the wall.' },
	{ id: '2', start: 2.5, end: 5, text: 'Slide your hand up slowly.' },
	{ id: '3', start: 5, end: 7.8, text: 'Lower it back down with control.' }
];

let dir: string;
let recordingId: string;
let segmentId: string;
let exerciseId: string;
let patientId: string;
let patientEmail: string;
let programmeId: string;
let itemId: string;
let librarySlug: string;

test.beforeAll(async () => {
	test.setTimeout(120_000);
	dir = await mkdtemp(join(tmpdir(), 'kinelume-e2e-words-'));
	const clip = join(dir, 'upright.mp4');
	const bytes = await makeUprightClip(clip);
	recordingId = await seedReadyRecording(ACCOUNTS.clinician, {
		rendition: bytes,
		durationSeconds: 158.5,
		title: 'Upright wall slides'
	});
	const db = database();
	let clinicId: string;
	try {
		db.prepare('update recording set width = 180, height = 320 where id = ?').run(recordingId);
		({ clinicId } = db
			.prepare('select clinic_id as clinicId from recording where id = ?')
			.get(recordingId) as { clinicId: string });
	} finally {
		db.close();
	}
	seedCaptionTrack(recordingId, CUES);
	segmentId = await seedReadySegment(recordingId, {
		title: 'Wall slide',
		start: 0,
		end: 8,
		cues: CUES,
		clip: bytes
	});
	exerciseId = seedExercise(segmentId, { title: 'Upright wall slide' });
	const patient = await seedSignInPatient(ACCOUNTS.clinician, {
		name: `Ines Marlow ${crypto.randomUUID().slice(0, 6)}`
	});
	({ patientId, email: patientEmail } = patient);
	({
		programmeId,
		itemIds: [itemId]
	} = seedProgramme(patientId, [
		{ title: 'Wall slide', segmentId, safetyNotes: 'Stop if the pain is sharp.', sets: 1, reps: 3 }
	]));
	const slug = `upright-wall-slide-${crypto.randomUUID().slice(0, 6)}`;
	await seedPublicExercise(clinicId, {
		title: 'Upright wall slide',
		slug,
		shape: { width: 180, height: 320 }
	});
	librarySlug = slug;
});

test.afterAll(async () => {
	await rm(dir, { recursive: true, force: true });
});

/** Collects the console's warnings and errors, and the page's uncaught errors. */
function consoleProblems(page: Page): string[] {
	const problems: string[] = [];
	page.on('console', (message) => {
		if (message.type() === 'warning' || message.type() === 'error') {
			problems.push(`${message.type()}: ${message.text()}`);
		}
	});
	page.on('pageerror', (error) => problems.push(`pageerror: ${error.message}`));
	return problems;
}

async function expectNoIsoDate(page: Page) {
	const text = await page.locator('body').innerText();
	expect(text.match(ISO_DATE)?.[0] ?? null, `an ISO date on ${page.url()}`).toBeNull();
}

async function aspectOf(page: Page, testId: string) {
	return page
		.getByTestId(testId)
		.first()
		.evaluate((element) => getComputedStyle(element).aspectRatio);
}

async function shoot(page: Page, name: string) {
	mkdirSync(SHOTS, { recursive: true });
	for (const [label, size] of [
		['phone', { width: 390, height: 844 }],
		['desk', { width: 1366, height: 900 }]
	] as const) {
		await page.setViewportSize(size);
		await page.screenshot({ path: join(SHOTS, `${name}-${label}.png`), fullPage: true });
	}
}

test('the replay page writes no warning or error to the console, from Today to a logged session and back', async ({
	page
}) => {
	await page.setViewportSize({ width: 390, height: 844 });
	const problems = consoleProblems(page);
	await signInWithPassword(page, patientEmail);
	await open(page, '/today');
	await page.getByRole('link', { name: /Play exercise.*Wall slide/ }).click();
	await expect(page).toHaveURL(`/replay/${itemId}`);
	await page.getByRole('button', { name: /I have read these notes/ }).click();
	await expect(page.getByRole('button', { name: 'Play' })).toBeFocused();

	await page.getByRole('button', { name: /Lower it back down/ }).click();
	await expect
		.poll(() => page.getByTestId('replay-video').evaluate((v: HTMLVideoElement) => v.currentTime))
		.toBeGreaterThan(4.9);
	await page.getByRole('button', { name: 'Add a rep' }).click();
	await page.getByRole('button', { name: 'Add a rep' }).click();
	await page.getByRole('button', { name: /Take a rep off/ }).click();
	await page.getByRole('button', { name: /Done — log this session/ }).click();
	const form = page.getByTestId('log-form');
	// The radio is drawn as its label; a click on the input itself is what a tap on the label does.
	await form
		.getByRole('radio', { name: '2', exact: true })
		.evaluate((radio: HTMLInputElement) => radio.click());
	await form.getByRole('button', { name: 'Save session' }).click();
	await expect(page.getByTestId('log-outcome')).toContainText('Session saved');

	// Back to Today and into the same exercise again: the page is made anew.
	await page.getByRole('link', { name: 'Back to today' }).first().click();
	await expect(page).toHaveURL('/today');
	await page.getByRole('link', { name: /Play exercise.*Wall slide/ }).click();
	await expect(page.getByTestId('replay-video')).toBeVisible();
	await expectNoIsoDate(page);
	expect(problems).toEqual([]);
});

test('clinician and library players are drawn in the clip’s own shape', async ({ browser }) => {
	const clinician = await browser.newPage();
	await signInWithPassword(clinician, ACCOUNTS.clinician);

	await visit(clinician, `/recordings/${recordingId}`);
	expect(await aspectOf(clinician, 'player')).toBe(UPRIGHT);
	await expect(clinician.locator('main')).toContainText('2 min 39 s');
	await shoot(clinician, 'words-recording');

	await visit(clinician, `/recordings/${recordingId}/segments`);
	expect(await aspectOf(clinician, 'player')).toBe(UPRIGHT);
	expect(await aspectOf(clinician, 'segment-player')).toBe(UPRIGHT);
	await expect(clinician.locator('main')).toContainText('2 min 39 s');
	await shoot(clinician, 'words-segments');

	await visit(clinician, `/recordings/${recordingId}/studio`);
	expect(await aspectOf(clinician, 'studio-video')).toBe(UPRIGHT);
	await expect(clinician.locator('main')).toContainText('2 min 39 s');

	await visit(clinician, `/exercises/${exerciseId}`);
	// The segment's still in the exercise form is the clip's shape too.
	const own = clinician
		.locator('label:has(input[name="segmentId"]:checked)')
		.getByTestId('segment-still');
	expect(await own.evaluate((element) => getComputedStyle(element).aspectRatio)).toBe(UPRIGHT);
	await shoot(clinician, 'words-exercise');
	await clinician.close();

	const context = await browser.newContext();
	const visitor = await context.newPage();
	await open(visitor, `/library/exercises/${librarySlug}`);
	expect(await aspectOf(visitor, 'library-player')).toBe(UPRIGHT);
	await expectNoAxeViolations(visitor);
	await shoot(visitor, 'words-library-exercise');
	await context.close();
});

test('pages people read show dates as “24 Nov 2026”, never as ISO dates', async ({ browser }) => {
	const clinician = await browser.newPage();
	await signInWithPassword(clinician, ACCOUNTS.clinician);
	for (const path of [
		'/patients',
		`/patients/${patientId}`,
		`/programmes/${programmeId}`,
		`/programmes/${programmeId}/sheet`,
		'/programmes/new',
		'/caseload',
		'/recordings',
		`/recordings/${recordingId}`,
		`/recordings/${recordingId}/captions`,
		'/exercises',
		`/exercises/${exerciseId}`
	]) {
		await visit(clinician, path);
		await expectNoIsoDate(clinician);
	}
	await clinician.close();

	const admin = await browser.newPage();
	await signInWithPassword(admin, ACCOUNTS.admin);
	for (const path of ['/clinic', '/inbox']) {
		await visit(admin, path);
		await expectNoIsoDate(admin);
	}
	await admin.close();

	const patient = await browser.newPage();
	await signInWithPassword(patient, patientEmail);
	for (const path of ['/today', `/replay/${itemId}`]) {
		await visit(patient, path);
		await expectNoIsoDate(patient);
	}
	await patient.close();

	const visitor = await browser.newPage();
	for (const path of ['/library', `/library/exercises/${librarySlug}`]) {
		await visit(visitor, path);
		await expectNoIsoDate(visitor);
	}
	await visitor.close();
});
