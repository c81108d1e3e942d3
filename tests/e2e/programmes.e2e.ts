import { expect, test, type Page } from '@playwright/test';
import { execFile } from 'node:child_process';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { PutObjectCommand } from '@aws-sdk/client-s3';
import { addDays, localDateOf } from '../../src/lib/clinical/calendar';
import {
	ACCOUNTS,
	contextFor,
	database,
	expectNoAxeViolations,
	firstLink,
	seedReadyRecording,
	signInWithPassword,
	waitForMail,
	storageClient,
	open,
	reload
} from './support';
import { seedReadySegment } from './segments-support';
import { E2E } from './ports';
import { FFMPEG } from '../integration/recordings-support';

const run = promisify(execFile);
const SHOTS = join(import.meta.dirname, '../.run/e2e-results');
// What each run makes itself is named per run (Playwright evaluates this once per worker, and a
// repeat runs in a worker of its own), so the suite can run again on the same data.
const RUN = crypto.randomUUID().slice(0, 4).toUpperCase();
const NEW_EXERCISE = `Kneeling reach (e2e) ${RUN}`;
const NEW_PATIENT = `Mabel Quill ${RUN}`;
const SEEDED_EXERCISE = 'Ankle pumps (e2e)';
/** A second ready exercise of this file's own, so no test needs the one another test makes. */
const OTHER_SEEDED_EXERCISE = 'Heel raises (e2e)';

let dir: string;
let segmentId: string;
let secondSegmentId: string;

/** A poster that is a real picture: a plain figure drawn by ffmpeg on our panel colour. */
async function realPoster(path: string) {
	await run(FFMPEG, [
		'-loglevel',
		'error',
		'-y',
		'-f',
		'lavfi',
		'-i',
		'color=c=0xe8eee9:s=640x360',
		'-vf',
		[
			'drawbox=x=300:y=60:w=40:h=40:color=0x1f4d3e:t=fill',
			'drawbox=x=310:y=100:w=20:h=120:color=0x1f4d3e:t=fill',
			'drawbox=x=250:y=130:w=140:h=14:color=0x1f4d3e:t=fill',
			'drawbox=x=290:y=220:w=14:h=100:color=0x1f4d3e:t=fill',
			'drawbox=x=336:y=220:w=14:h=100:color=0x1f4d3e:t=fill'
		].join(','),
		'-frames:v',
		'1',
		path
	]);
}

async function putPoster(segment: string, bytes: Uint8Array) {
	const db = database();
	const { clinicId, recordingId } = db
		.prepare('select clinic_id as clinicId, recording_id as recordingId from segment where id = ?')
		.get(segment) as { clinicId: string; recordingId: string };
	db.close();
	const s3 = storageClient();
	await s3.send(
		new PutObjectCommand({
			Bucket: 'kinelume',
			Key: `clinics/${clinicId}/recordings/${recordingId}/segments/${segment}/posters/0.jpg`,
			Body: bytes,
			ContentType: 'image/jpeg'
		})
	);
	s3.destroy();
}

/** A ready exercise on a segment, straight into the database (the one the form does not make). */
function seedExercise(segment: string, title: string) {
	const db = database();
	try {
		const { clinicId } = db
			.prepare('select clinic_id as clinicId from segment where id = ?')
			.get(segment) as { clinicId: string };
		const now = Date.now();
		db.prepare(
			`insert into exercise (id, clinic_id, segment_id, title, body_region, side, position, movement_type,
			 equipment, phase, coaching_cues, safety_notes, precaution_tags, sets, reps, hold_seconds, rest_seconds,
			 sessions_per_day, days_per_week, dosage_bounds, progression, status, created_at, updated_at)
			 values (?, ?, ?, ?, 'Knee', 'both', 'supine', 'active', '[]', 2, ?, 'Stop if the calf is **hot or swollen**.',
			 '[]', 1, 10, 0, 0, 4, 7, ?, '{"kind":"none"}', 'ready', ?, ?)`
		).run(
			crypto.randomUUID(),
			clinicId,
			segment,
			title,
			JSON.stringify([{ text: 'Point the toes, then pull them up.' }]),
			JSON.stringify({ reps: { min: 5, max: 30 } }),
			now,
			now
		);
	} finally {
		db.close();
	}
}

/** The id of a row found by `sql`, or null. */
function find(sql: string, ...params: unknown[]): string | null {
	const db = database();
	try {
		return (db.prepare(sql).get(...params) as { id: string } | undefined)?.id ?? null;
	} finally {
		db.close();
	}
}

// Playwright runs this again in a fresh worker after a failure: seed only once.
test.beforeAll(async () => {
	dir = await mkdtemp(join(tmpdir(), 'kinelume-e2e-programmes-'));
	const seeded = find("select id from segment where title = 'Kneeling reach segment'");
	if (seeded) {
		segmentId = seeded;
		secondSegmentId = find("select id from segment where title = 'Ankle pumps segment'")!;
		return;
	}
	const posterPath = join(dir, 'poster.jpg');
	await realPoster(posterPath);
	const poster = await readFile(posterPath);
	const recordingId = await seedReadyRecording(ACCOUNTS.clinician, {
		rendition: new Uint8Array([0]),
		durationSeconds: 60,
		title: 'Knee exercises (e2e)'
	});
	segmentId = await seedReadySegment(recordingId, { title: 'Kneeling reach segment', end: 24 });
	secondSegmentId = await seedReadySegment(recordingId, {
		title: 'Ankle pumps segment',
		start: 24,
		end: 44
	});
	await putPoster(segmentId, poster);
	await putPoster(secondSegmentId, poster);
	seedExercise(secondSegmentId, SEEDED_EXERCISE);
	seedExercise(secondSegmentId, OTHER_SEEDED_EXERCISE);
});

test.afterAll(async () => {
	await rm(dir, { recursive: true, force: true });
});

async function shot(page: Page, name: string) {
	await page.screenshot({ path: join(SHOTS, `programmes-${name}.png`), fullPage: true });
}

/**
 * Fills the new exercise form (open at /exercises/new) as a clinician would, through a refused
 * save, key points moved by keyboard and a safety notes preview, and saves it as ready.
 */
async function makeNewExercise(page: Page) {
	await page.getByRole('radio', { name: /Kneeling reach segment/ }).check();
	await page.getByLabel('Title').fill(NEW_EXERCISE);
	await page.getByLabel('Body region').fill('Knee');
	await page.getByLabel('Position').selectOption('supine');
	await page.getByLabel('Movement type').selectOption('active');
	await page.getByLabel('Phase').selectOption('4');
	await page.getByLabel('Equipment').fill('Cushion');

	// A refused save keeps everything typed: reps left empty.
	await page.getByLabel('Reps', { exact: true }).fill('');
	await page.getByRole('button', { name: 'Save the exercise' }).click();
	await expect(page.getByRole('alert')).toContainText('Reps is missing');
	await expect(page.getByLabel('Title')).toHaveValue(NEW_EXERCISE);
	await page.getByLabel('Reps', { exact: true }).fill('8');

	await page.getByRole('button', { name: 'Add a key point' }).click();
	await page
		.getByLabel('Key point 1', { exact: true })
		.fill('Kneel on the cushion, back straight.');
	await page.getByLabel('Time').first().fill('0:03');
	await page.getByRole('button', { name: 'Add a key point' }).click();
	await page.getByLabel('Key point 2', { exact: true }).fill('Reach forward slowly.');
	// Reordering cues by keyboard keeps focus on the moved cue.
	await page.getByRole('button', { name: 'Move key point 2 up' }).focus();
	await page.keyboard.press('Enter');
	await expect(page.getByLabel('Key point 1', { exact: true })).toHaveValue(
		'Reach forward slowly.'
	);
	await expect(page.getByRole('button', { name: 'Move key point 1 down' })).toBeFocused();

	await page
		.getByLabel('Safety notes')
		.fill('Stop if the knee **hurts**.\n\n<script>alert(1)</script>\n\n[bad](javascript:alert(1))');
	await page.getByRole('button', { name: 'Preview as the patient sees it' }).click();
	const preview = page.getByRole('region', { name: 'Safety notes preview' });
	await expect(preview.locator('strong')).toHaveText('hurts');
	await expect(preview.locator('script')).toHaveCount(0);
	await expect(preview.locator('a')).toHaveCount(0);

	await page.getByRole('checkbox', { name: 'needs kneeling' }).check();
	await page.getByRole('radio', { name: /Ready/ }).check();
	await shot(page, 'exercise-form');
	await page.getByRole('button', { name: 'Save the exercise' }).click();
	await expect(page).toHaveURL(/\/exercises\/[0-9a-f-]{36}\?saved=1$/);
	await expect(page.getByText('The exercise is saved.')).toBeVisible();
}

test('a clinician makes an exercise from a segment, with cues, safety notes and tags', async ({
	page
}) => {
	await signInWithPassword(page, ACCOUNTS.clinician);
	await open(page, '/exercises');
	await expect(page.getByRole('heading', { level: 1, name: 'Exercises' })).toBeVisible();
	await expectNoAxeViolations(page);

	await page.getByRole('link', { name: 'New exercise' }).click();
	await expect(page).toHaveURL(/\/exercises\/new$/);
	await makeNewExercise(page);
	await expect(page.getByLabel('Key point 1', { exact: true })).toHaveValue(
		'Reach forward slowly.'
	);
	await expectNoAxeViolations(page);

	await open(page, '/exercises?q=kneeling&status=ready');
	const row = page.getByRole('row').filter({ hasText: NEW_EXERCISE });
	await expect(row).toContainText('Ready');
	await expect(row).toContainText('4 · Strengthening');
	await open(page, '/exercises');
	await shot(page, 'exercise-table');
});

test('a clinician adds a patient, builds a flagged programme by keyboard, publishes it and prints it', async ({
	page,
	browser
}) => {
	test.setTimeout(120_000);
	const email = `programme.patient.${Date.now()}@alder-street.example`;
	const today = localDateOf(new Date(), 'Europe/London');
	const operationDate = addDays(today, -8);
	await signInWithPassword(page, ACCOUNTS.clinician);
	// Made by the test above; made here when this test runs on its own.
	if (!find('select id from exercise where title = ?', NEW_EXERCISE)) {
		await open(page, '/exercises/new');
		await makeNewExercise(page);
	}
	await open(page, '/patients');
	const invite = page.locator('form[action="?/invite"]');
	await invite.getByLabel('Full name').fill(NEW_PATIENT);
	await invite.getByLabel('E-mail address').fill(email);
	await invite
		.getByLabel('Operation or injury', { exact: true })
		.fill('Right total knee replacement');
	await invite.getByLabel('Affected side').selectOption('right');
	await invite.getByLabel('Date of the operation (or injury)').fill(operationDate);
	await invite.getByLabel('Protocol').selectOption('knee-replacement');
	await invite.locator('summary', { hasText: 'Precautions' }).click();
	await invite.getByRole('checkbox', { name: 'No kneeling' }).check();
	const inviteSince = Date.now();
	await invite.getByRole('button', { name: 'Send invitation' }).click();
	const patientRow = page.getByRole('row').filter({ hasText: NEW_PATIENT });
	await expect(patientRow.getByText('Invited')).toBeVisible();
	await expectNoAxeViolations(page);
	await shot(page, 'patients');

	// The details page shows what the invitation recorded, and edits it.
	await patientRow.getByRole('link', { name: `Details of ${NEW_PATIENT}` }).click();
	await expect(page.getByLabel('Date of the operation (or injury)')).toHaveValue(operationDate);
	await expect(page.getByRole('checkbox', { name: 'No kneeling' })).toBeChecked();
	await page.getByLabel('Other precautions').fill('Avoid long car journeys for now');
	await page.getByRole('button', { name: 'Save details' }).click();
	await expect(page.getByText('The details are saved.')).toBeVisible();
	await expect(page.getByLabel('Other precautions')).toHaveValue('Avoid long car journeys for now');
	await expectNoAxeViolations(page);
	await shot(page, 'patient-details');
	await open(page, '/patients');

	await patientRow.getByRole('link', { name: `New programme for ${NEW_PATIENT}` }).click();
	await expect(page.getByRole('heading', { name: 'New home programme' })).toBeVisible();
	await expectNoAxeViolations(page);
	await page.getByRole('button', { name: 'Start building' }).click();
	await expect(page).toHaveURL(/\/programmes\/[0-9a-f-]{36}$/);

	// The week after the operation, with its basis and its caution.
	const week = page.getByRole('region', { name: /Week after the operation/ });
	await expect(week).toContainText('Week 1 after the operation');
	await expect(week).toContainText(/counted from \d{1,2} [A-Z][a-z]{2} \d{4}/);
	await expect(week).toContainText("the surgeon's protocol and the treating clinician decide");

	await page.getByLabel('Search').fill('e2e');
	await page.getByRole('button', { name: `Add ${SEEDED_EXERCISE}` }).click();
	await page.getByRole('button', { name: `Add ${NEW_EXERCISE}` }).click();
	const items = page.locator('ol > li h3');
	await expect(items).toHaveText([`1. ${SEEDED_EXERCISE}`, `2. ${NEW_EXERCISE}`]);

	// Live figures and flags for the strengthening exercise at week 1, against "no kneeling".
	const second = page.locator('ol > li').filter({ hasText: NEW_EXERCISE });
	await expect(second).toContainText('21 sessions a week · 8 reps a session · 168 reps a week');
	await expect(second).toContainText('Phase flag:');
	await expect(second).toContainText('Precaution flag:');
	await expect(second.getByText(/No kneeling/)).toBeVisible();

	// Override a dosage: outside the seeded exercise's range flags it, inside it is just changed.
	const first = page.locator('ol > li').filter({ hasText: SEEDED_EXERCISE });
	await first.getByLabel('Reps', { exact: true }).fill('40');
	await expect(first).toContainText('Dosage flag: Reps is 40, above');
	await first.getByLabel('Reps', { exact: true }).fill('12');
	await expect(first).toContainText('Changed for this patient (starting dosage 10)');
	await expect(first).toContainText('12 reps a session');
	await expect(first).not.toContainText('Dosage flag');

	// Reorder with the keyboard: focus stays with the moved exercise.
	await page.getByRole('button', { name: `Move ${NEW_EXERCISE} up` }).focus();
	await page.keyboard.press('Enter');
	await expect(items).toHaveText([`1. ${NEW_EXERCISE}`, `2. ${SEEDED_EXERCISE}`]);
	await expect(page.getByRole('button', { name: `Move ${NEW_EXERCISE} down` })).toBeFocused();
	await expect(page.getByText(/All changes saved at/)).toBeVisible({ timeout: 10_000 });
	await expectNoAxeViolations(page);
	await shot(page, 'builder');

	// Saved: a reload shows the order and the override.
	await reload(page);
	await expect(items).toHaveText([`1. ${NEW_EXERCISE}`, `2. ${SEEDED_EXERCISE}`]);
	await expect(
		page.locator('ol > li').filter({ hasText: SEEDED_EXERCISE }).getByLabel('Reps', { exact: true })
	).toHaveValue('12');

	const since = Date.now();
	await page.getByRole('button', { name: 'Publish and e-mail Mabel' }).click();
	await expect(page.getByText(`Published and e-mailed to ${NEW_PATIENT}.`)).toBeVisible();
	await expect(page.getByText('Published', { exact: true })).toBeVisible();
	const mail = await waitForMail(email, since, 'home programme');
	expect(mail.subject).toBe('Your home programme from Alder Street Community Clinic is ready');
	expect(mail.text).toContain(`1. ${NEW_EXERCISE}: 1 set of 8 reps`);
	expect(mail.text).toContain(`2. ${SEEDED_EXERCISE}: 1 set of 12 reps`);

	// The printed sheet: poster, dosage, cues, safety notes and a code per exercise.
	await page.getByRole('link', { name: 'Printable sheet' }).click();
	await expect(page.getByRole('img', { name: /QR code that opens the video/ })).toHaveCount(2);
	await expect(page.getByText('1 set of 12 reps; 4 times a day, every day.')).toBeVisible();
	await expect(page.getByRole('heading', { name: 'Key points' }).first()).toBeVisible();
	const replayLinks = await page.getByText(/Scan to watch, or type/).allTextContents();
	expect(replayLinks).toHaveLength(2);
	await expectNoAxeViolations(page);
	await page.emulateMedia({ media: 'print' });
	await expect(page.getByRole('button', { name: 'Print' })).toBeHidden();
	await shot(page, 'sheet-print');
	await page.emulateMedia({ media: 'screen' });

	// The patient accepts the invitation without a password and lands on Today, signed in; the
	// printed code's address opens the replay of that exercise.
	const invitation = firstLink(
		(await waitForMail(email, inviteSince, 'Kinelume')).text,
		'/invite/'
	);
	const guest = await browser.newContext({ baseURL: E2E.origin });
	const patient = await guest.newPage();
	await open(patient, invitation);
	await patient.getByLabel('Your name').fill(NEW_PATIENT);
	await patient.getByRole('button', { name: 'Accept and create my account' }).click();
	await expect(patient).toHaveURL(/\/today$/);
	const printed = replayLinks[0].match(/https?:\/\/\S+\/r\/[0-9A-Z]{8}/)![0];
	const answer = await open(patient, new URL(printed).pathname);
	expect(answer?.status()).toBe(200);
	await expect(patient).toHaveURL(/\/replay\/[0-9a-f-]{36}$/);
	await guest.close();
});

test('a failed live save keeps the edits and says so, then saves on retry', async ({ page }) => {
	await signInWithPassword(page, ACCOUNTS.clinician);
	await open(page, '/patients');
	await page
		.getByRole('row')
		.filter({ hasText: 'Percy Oakes' })
		.getByRole('link', { name: /New programme/ })
		.click();
	await page.getByRole('button', { name: 'Start building' }).click();
	await expect(page.getByText('No operation or injury date is recorded')).toBeVisible();
	await page.getByLabel('Search').fill('e2e');
	await page.route('**/api/programmes/*', (route) =>
		route.request().method() === 'PUT' ? route.abort('connectionreset') : route.continue()
	);
	await page.getByRole('button', { name: `Add ${SEEDED_EXERCISE}` }).click();
	await page.getByLabel('Sets', { exact: true }).fill('2');
	await expect(page.getByRole('alert')).toContainText('Not saved');
	await expect(page.getByLabel('Sets', { exact: true })).toHaveValue('2');
	await page.unroute('**/api/programmes/*');
	await page.getByRole('button', { name: 'Try again' }).click();
	await expect(page.getByText(/All changes saved at/)).toBeVisible();
	await reload(page);
	await expect(page.getByLabel('Sets', { exact: true })).toHaveValue('2');
});

test('the programme endpoint and the notes preview check the role and the clinic', async () => {
	const db = database();
	const { id: otherProgramme } = (db
		.prepare(
			`select p.id from programme p join clinic c on c.id = p.clinic_id where c.name = 'Harbour Lane Physiotherapy' limit 1`
		)
		.get() as { id: string } | undefined) ?? { id: crypto.randomUUID() };
	db.close();
	const clinician = await contextFor('clinician');
	const patient = await contextFor('patient');
	const put = await clinician.put(`/api/programmes/${otherProgramme}`, {
		data: { title: 'x', startDate: '2026-11-17', endDate: '', note: '', items: [] },
		headers: { Origin: E2E.origin }
	});
	expect(put.status()).toBe(404);
	expect(await put.json()).toEqual({ error: { status: 404, message: 'Not found.' } });
	const preview = await clinician.post('/api/safety-notes/preview', {
		data: { markdown: '**ok** <img src=x onerror=alert(1)>' },
		headers: { Origin: E2E.origin }
	});
	expect(await preview.json()).toEqual({ html: '<p><strong>ok</strong> </p>' });
	const refused = await patient.post('/api/safety-notes/preview', {
		data: { markdown: 'x' },
		headers: { Origin: E2E.origin }
	});
	expect(refused.status()).toBe(403);
	await clinician.dispose();
	await patient.dispose();
});

test('the builder works without scripts: add, reorder and a refused save that keeps the edits', async ({
	browser
}) => {
	const context = await browser.newContext({ baseURL: E2E.origin, javaScriptEnabled: false });
	const page = await context.newPage();
	await signInWithPassword(page, ACCOUNTS.clinician);
	const percy = find("select id from patient where email = 'percy.oakes@alder-street.example'");
	await page.goto(`/programmes/new?patient=${percy}`);
	await page.getByLabel('Title').fill('Without scripts');
	await page.getByRole('button', { name: 'Start building' }).click();
	await expect(page.getByRole('heading', { level: 1 })).toHaveText('Without scripts');

	await page.getByRole('button', { name: `Add ${SEEDED_EXERCISE}` }).click();
	await page.getByRole('button', { name: `Add ${OTHER_SEEDED_EXERCISE}` }).click();
	const items = page.locator('ol > li h3');
	await expect(items).toHaveText([`1. ${SEEDED_EXERCISE}`, `2. ${OTHER_SEEDED_EXERCISE}`]);
	await page.getByRole('button', { name: `Move ${OTHER_SEEDED_EXERCISE} up` }).click();
	await expect(items).toHaveText([`1. ${OTHER_SEEDED_EXERCISE}`, `2. ${SEEDED_EXERCISE}`]);

	const row = page.locator('ol > li').filter({ hasText: SEEDED_EXERCISE });
	await row.getByLabel('Reps', { exact: true }).fill('lots');
	await row.getByLabel('Sets', { exact: true }).fill('some');
	await page.getByLabel('Title').fill('');
	await page.getByRole('button', { name: 'Save draft' }).click();
	await expect(
		page.getByText(`Exercise 2 (${SEEDED_EXERCISE}): Reps must be a whole number from 1 to 100.`)
	).toBeVisible();
	// Each problem is said beside its own field too, and read with it.
	const reps = row.getByLabel('Reps', { exact: true });
	const sets = row.getByLabel('Sets', { exact: true });
	await expect(reps).toHaveValue('lots');
	await expect(sets).toHaveValue('some');
	await expect(reps).toHaveAccessibleDescription(/Reps must be a whole number from 1 to 100\./);
	await expect(sets).toHaveAccessibleDescription(/Sets must be a whole number/);
	await expect(sets).not.toHaveAccessibleDescription(/Reps/);
	await expect(page.getByLabel('Title')).toHaveAccessibleDescription('Give the programme a title.');
	await expect(reps).toHaveAttribute('aria-invalid', 'true');
	await expect(items).toHaveText([`1. ${OTHER_SEEDED_EXERCISE}`, `2. ${SEEDED_EXERCISE}`]);
	await context.close();
});
