import { expect, test, type Locator, type Page } from '@playwright/test';
import { PutObjectCommand } from '@aws-sdk/client-s3';
import { execFile } from 'node:child_process';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { promisify } from 'node:util';
import { shiftAndClip } from '../../src/lib/captions/segment';
import { ffmpegPath } from '../../src/lib/server/media/ffmpeg';
import { ensureDemoClips } from '../../src/scripts/demo/clips/encoding';
import { DEMO_CLIPS } from '../../src/scripts/demo/clips/scripts';
import { E2E } from './ports';
import { seedReadySegment } from './segments-support';
import {
	ACCOUNTS,
	database,
	DEMO_PASSWORD,
	expectNoAxeViolations,
	firstLink,
	seedReadyRecording,
	waitForMail,
	storageClient,
	open
} from './support';

/*
 * The three-person journey of the issue, in chromium, on the demo clinic and its own demo clip:
 * a clinician adds a new patient and builds and publishes a programme → the invitation is read
 * from the mail fake → the patient signs in from its link, replays one exercise, changes the
 * caption style and logs a session with pain 3 → the clinician's caseload and patient page show
 * the adherence and the log. People act by keyboard alone (focus, typing, Enter, Space, arrows —
 * never a click), and axe checks every patient page on the way.
 */

const run = promisify(execFile);
const CLIPS = resolve(import.meta.dirname, '../.run/demo-clips');
const EXERCISE = 'Heel slides';
// Named per run, so the journey can run again on the same data.
const PATIENT = {
	name: `Nora Ashdown ${crypto.randomUUID().slice(0, 4).toUpperCase()}`,
	first: 'Nora'
};

// The demo's own exercise (src/scripts/demo/exercises.ts): title, cues, notes and dosage.
const SAFETY = `Stop and call the clinic if:

- the pain is **sharp** or getting worse,
- the calf becomes hot, red or swollen,
- the wound leaks or looks redder.

Tightness at the end of the movement is normal.`;
const CUES = [
	{ text: 'Slowly slide your heel toward your bottom.' },
	{ text: 'Bend as far as is comfortable, pause, slide back.' },
	{ text: 'Tightness at the end of the bend is normal.' }
];

let dir: string;
let firstCaption: string;
let exerciseId: string;

/** The demo clip "first week at home", drawn once into tests/.run, and its Heel slides part cut out. */
async function demoHeelSlides() {
	const clip = DEMO_CLIPS.find((c) => c.id === 'knee-first-week')!;
	const [made] = await ensureDemoClips(CLIPS, { clips: [clip], width: 320, height: 180 });
	const section = made.sections.find((s) => s.kind === 'exercise' && s.title === EXERCISE)!;
	const cut = join(dir, 'heel-slides.mp4');
	await run(ffmpegPath(), [
		...['-hide_banner', '-loglevel', 'error', '-y', '-i', made.path],
		...['-ss', String(section.start), '-to', String(section.end)],
		...['-c:v', 'libx264', '-pix_fmt', 'yuv420p', '-g', '12', '-c:a', 'aac'],
		...['-movflags', '+faststart', cut]
	]);
	const poster = join(dir, 'poster.jpg');
	await run(ffmpegPath(), [
		...['-hide_banner', '-loglevel', 'error', '-y', '-ss', '3', '-i', cut],
		...['-frames:v', '1', poster]
	]);
	const cues = shiftAndClip(
		made.cues.map((c, i) => ({ id: String(i + 1), ...c })),
		section.start,
		section.end
	);
	return {
		full: await readFile(made.path),
		duration: made.durationSeconds,
		clip: await readFile(cut),
		poster: await readFile(poster),
		section,
		cues
	};
}

async function putPoster(segmentId: string, jpeg: Uint8Array) {
	const db = database();
	const { clinicId, recordingId } = db
		.prepare('select clinic_id as clinicId, recording_id as recordingId from segment where id = ?')
		.get(segmentId) as { clinicId: string; recordingId: string };
	db.close();
	const s3 = storageClient();
	await s3.send(
		new PutObjectCommand({
			Bucket: 'kinelume',
			Key: `clinics/${clinicId}/recordings/${recordingId}/segments/${segmentId}/posters/0.jpg`,
			Body: jpeg,
			ContentType: 'image/jpeg'
		})
	);
	s3.destroy();
}

/** The demo clinic's Heel slides exercise on its segment, as the demo seeds it; answers its id. */
function seedDemoExercise(segmentId: string): string {
	const db = database();
	const id = crypto.randomUUID();
	try {
		const { clinicId } = db
			.prepare('select clinic_id as clinicId from segment where id = ?')
			.get(segmentId) as { clinicId: string };
		const now = Date.now();
		db.prepare(
			`insert into exercise (id, clinic_id, segment_id, title, description, body_region, side, position,
			 movement_type, phase, coaching_cues, safety_notes, sets, reps, hold_seconds, rest_seconds,
			 sessions_per_day, days_per_week, progression, status, created_at, updated_at)
			 values (?, ?, ?, ?, ?, 'Knee', 'either', 'supine', 'active-assisted', 2, ?, ?, 1, 8, 1, 30, 3, 7, ?, 'ready', ?, ?)`
		).run(
			id,
			clinicId,
			segmentId,
			EXERCISE,
			'Slide the heel toward the bottom to bend the knee, then slide it back.',
			JSON.stringify(CUES),
			SAFETY,
			JSON.stringify({ kind: 'reps', addPerWeek: 2, ceiling: 15 }),
			now,
			now
		);
	} finally {
		db.close();
	}
	return id;
}

test.beforeAll(async () => {
	test.setTimeout(180_000);
	dir = await mkdtemp(join(tmpdir(), 'kinelume-e2e-journey-'));
	const media = await demoHeelSlides();
	firstCaption = media.cues[0].text.replace(/\s+/g, ' ');
	const recordingId = await seedReadyRecording(ACCOUNTS.clinician, {
		rendition: media.full,
		durationSeconds: media.duration,
		title: 'Knee replacement — first week at home'
	});
	const segmentId = await seedReadySegment(recordingId, {
		title: EXERCISE,
		start: media.section.start,
		end: media.section.end,
		cues: media.cues,
		clip: media.clip
	});
	await putPoster(segmentId, media.poster);
	exerciseId = seedDemoExercise(segmentId);
});

test.afterAll(async () => {
	await rm(dir, { recursive: true, force: true });
});

/** Presses Enter on a control, the way a keyboard user does once focus is on it. */
async function activate(control: Locator) {
	await control.focus();
	await control.press('Enter');
}

/** Password sign-in through the page, typed; waits for the page's script before typing. */
async function signInByKeyboard(page: Page, email: string) {
	await open(page, '/signin');
	await page.waitForLoadState('networkidle');
	const form = page.locator('form[action="?/password"]');
	await form.getByLabel('E-mail address').fill(email);
	await form.getByLabel('Password').fill(DEMO_PASSWORD);
	await expect(form.getByLabel('E-mail address')).toHaveValue(email);
	await form.getByLabel('Password').press('Enter');
	await page.waitForURL((url) => !url.pathname.startsWith('/signin'));
}

test('clinician builds a programme, the patient replays, restyles captions and logs pain 3, the caseload shows it', async ({
	browser
}) => {
	test.setTimeout(180_000);
	const email = `nora.ashdown.${Date.now()}@alder-street.example`;

	// 1. The clinician adds a new patient (the invitation goes out) and builds a programme.
	const clinicianContext = await browser.newContext({ baseURL: E2E.origin });
	const clinician = await clinicianContext.newPage();
	await signInByKeyboard(clinician, ACCOUNTS.clinician);
	await open(clinician, '/patients');
	const invite = clinician.locator('form[action="?/invite"]');
	await invite.getByLabel('Full name').fill(PATIENT.name);
	await invite.getByLabel('E-mail address').fill(email);
	await invite
		.getByLabel('Operation or injury', { exact: true })
		.fill('Left total knee replacement');
	await invite.getByLabel('Affected side').selectOption('left');
	const inviteSince = Date.now();
	await invite.getByRole('button', { name: 'Send invitation' }).press('Enter');
	const row = clinician.getByRole('row').filter({ hasText: PATIENT.name });
	await expect(row.getByText('Invited')).toBeVisible();

	await activate(row.getByRole('link', { name: PATIENT.name, exact: true }));
	await expect(clinician.getByRole('heading', { level: 1, name: PATIENT.name })).toBeVisible();
	await expect(clinician.getByText('No programme yet.')).toBeVisible();
	await activate(clinician.getByRole('link', { name: 'New programme' }));
	await expect(clinician.getByRole('heading', { name: 'New home programme' })).toBeVisible();
	await activate(clinician.getByRole('button', { name: 'Start building' }));
	await expect(clinician).toHaveURL(/\/programmes\/[0-9a-f-]{36}$/);
	await clinician.getByLabel('Search').fill(EXERCISE);
	// Other tests' exercises share the name: this one is the demo's, on the demo clip.
	const add = clinician.locator(`button[value="add:${exerciseId}"]`);
	await expect(add).toHaveAccessibleName(`Add ${EXERCISE}`);
	await activate(add);
	await expect(clinician.locator('ol > li h3')).toHaveText([`1. ${EXERCISE}`]);
	await expect(clinician.getByText(/All changes saved at/)).toBeVisible({ timeout: 10_000 });
	const publishedSince = Date.now();
	await activate(clinician.getByRole('button', { name: `Publish and e-mail ${PATIENT.first}` }));
	await expect(clinician.getByText(`Published and e-mailed to ${PATIENT.name}.`)).toBeVisible();
	const published = await waitForMail(email, publishedSince, 'home programme');
	expect(published.text).toContain(`1. ${EXERCISE}: 1 set of 8 reps`);

	// 2. The invitation, read from the mail fake.
	const invitation = await waitForMail(email, inviteSince, 'set up Kinelume');
	const link = firstLink(invitation.text, '/invite/');

	// 3. The patient opens the link in their own browser and signs in by accepting it.
	const patientContext = await browser.newContext({ baseURL: E2E.origin });
	const patient = await patientContext.newPage();
	await open(patient, link);
	await patient.waitForLoadState('networkidle');
	await expectNoAxeViolations(patient);
	await patient.getByLabel('Your name').fill(PATIENT.name);
	await patient.getByLabel('Your name').press('Enter');
	await expect(patient).toHaveURL(/\/today$/);
	await expect(patient.getByRole('heading', { level: 1 })).toContainText(PATIENT.first);
	await expect(patient.getByRole('heading', { name: 'When to stop' })).toBeVisible();
	await expect(patient.getByTestId('day-status')).toHaveText('0 of 3 sessions done today');
	await expectNoAxeViolations(patient);

	// 4. One exercise: its safety notes first, then the demo clip with its captions.
	await activate(patient.getByRole('link', { name: new RegExp(`Play exercise.*${EXERCISE}`) }));
	await expect(patient).toHaveURL(/\/replay\/[0-9a-f-]{36}$/);
	const gate = patient.getByTestId('safety-gate');
	await expect(gate).toContainText('the calf becomes hot, red or swollen');
	await expectNoAxeViolations(patient);
	await activate(gate.getByRole('button', { name: /I have read these notes/ }));
	await expect(patient.getByTestId('replay-video')).toBeVisible();
	await expect(patient.getByTestId('dosage')).toContainText('1 set of 8 reps');
	await activate(patient.getByRole('button', { name: 'Play', exact: true }));
	await expect(patient.getByRole('button', { name: 'Pause', exact: true })).toBeVisible();
	await expect
		.poll(
			() => patient.getByTestId('replay-video').evaluate((v: HTMLVideoElement) => v.currentTime),
			{
				timeout: 15_000
			}
		)
		.toBeGreaterThan(0.5);
	await expect(patient.getByTestId('caption-band')).toContainText(firstCaption, {
		timeout: 15_000
	});
	await activate(patient.getByRole('button', { name: 'Pause', exact: true }));
	await expectNoAxeViolations(patient);

	// 5. Caption style: bigger, white on dark grey, saved for next time.
	const panel = patient.getByTestId('caption-style');
	await activate(panel.locator('summary'));
	const textColour = panel.getByRole('group', { name: 'Text colour' });
	const background = panel.getByRole('group', { name: 'Background' });
	await textColour.getByRole('radio', { name: 'White' }).press('Space');
	await background.getByRole('radio', { name: 'Dark grey' }).press('Space');
	await panel.getByRole('radio', { name: '200%' }).press('Space');
	await expect(panel.getByTestId('contrast-verdict')).toHaveText(
		'Contrast 12.6 : 1 — easy to read'
	);
	await expectNoAxeViolations(patient);
	await activate(panel.getByRole('button', { name: 'Save caption style' }));
	await expect(panel.getByRole('status')).toContainText('Saved');
	const band = patient.getByTestId('caption-band');
	await expect(band).toHaveCSS('background-color', 'rgb(51, 51, 51)');
	await expect(band).toHaveCSS('color', 'rgb(255, 255, 255)');

	// 6. Done: a session logged with pain 3.
	await activate(patient.getByRole('button', { name: /Done — log this session/ }));
	const form = patient.getByTestId('log-form');
	await expect(form.getByRole('heading', { name: 'Log this session' })).toBeFocused();
	await form.getByRole('radio', { name: '3', exact: true }).press('Space');
	await expect(form.getByRole('radio', { name: '3', exact: true })).toBeChecked();
	await expectNoAxeViolations(patient);
	await activate(form.getByRole('button', { name: 'Save session' }));
	await expect(patient.getByTestId('log-outcome')).toContainText('Session saved');
	await expect(patient.getByTestId('done-today')).toHaveText('Today: 1 of 3 sessions done.');
	await expectNoAxeViolations(patient);

	// 7. The clinician's caseload shows the adherence and the log, each with its basis.
	await open(clinician, `/caseload?q=${encodeURIComponent(PATIENT.name)}`);
	const caseloadRow = clinician
		.getByRole('row')
		.filter({ has: clinician.getByRole('rowheader', { name: PATIENT.name }) });
	await expect(caseloadRow).toContainText('100%');
	await expect(caseloadRow).toContainText('1 of 1 session, ');
	await expect(caseloadRow).toContainText('Today');
	await expect(caseloadRow).toContainText(`${EXERCISE} · pain 3/10`);
	await expect(caseloadRow).toContainText('Not compared yet');
	await expectNoAxeViolations(clinician);
	await activate(caseloadRow.getByRole('link', { name: PATIENT.name, exact: true }));
	const logs = clinician.getByRole('table', { name: 'Session logs (1)' });
	await expect(logs.locator('tbody tr')).toHaveCount(1);
	await expect(logs.locator('tbody tr').first()).toContainText(EXERCISE);
	await expect(logs.locator('tbody tr').first().locator('td').nth(2)).toHaveText('3');
	await expect(clinician.getByText('1 of 1 session (100%) over').first()).toBeVisible();

	await patientContext.close();
	await clinicianContext.close();
});
