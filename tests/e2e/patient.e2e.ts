import { expect, request, test, type Page } from '@playwright/test';
import { PutObjectCommand } from '@aws-sdk/client-s3';
import { execFile } from 'node:child_process';
import { mkdirSync } from 'node:fs';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { promisify } from 'node:util';
import {
	ACCOUNTS,
	database,
	expectNoAxeViolations,
	seedReadyRecording,
	signedInRequest,
	signInWithPassword,
	visit,
	storageClient,
	open,
	reload
} from './support';
import { seedReadySegment } from './segments-support';
import { seedProgramme, seedSignInPatient, sessionLogsOf } from './programme-fixtures';
import { E2E } from './ports';
import { FFMPEG } from '../integration/recordings-support';

/*
 * The patient's journey on the production build: Today → one exercise's replay → its safety
 * notes first → play with captions → caption style (a faint pair refused) → count reps by
 * keyboard → log a session with pain 3 → log one offline and see it sent once back online.
 * Another patient's replay answers 404. Screens are saved for a look at phone and desk sizes.
 */

const run = promisify(execFile);
// The ffmpeg the app chooses (Debian's when installed), as in the integration tests.
const ffmpeg = FFMPEG;
const SCREENS = resolve(import.meta.dirname, '../.run/screens');
const CUES = [
	{ id: 'c1', start: 0, end: 2.5, text: 'Lie on your back with both legs straight.' },
	{ id: 'c2', start: 2.5, end: 5, text: 'Slide your heel towards you, slowly.' },
	{ id: 'c3', start: 5, end: 8, text: 'Hold, then slide it back down.' }
];
const SAFETY = [
	'Stop and call the clinic if your knee becomes **hot, red or more swollen**.',
	'',
	'- Move only as far as feels like a stretch.',
	'- Keep the other leg relaxed.'
].join('\n');

let dir: string;
let patient: { patientId: string; email: string };
let itemId: string;
let segmentId: string;
let otherPatientEmail: string;
let otherItemId: string;

async function screens(page: Page, name: string) {
	mkdirSync(SCREENS, { recursive: true });
	for (const [label, size] of [
		['phone', { width: 390, height: 844 }],
		['desk', { width: 1280, height: 800 }]
	] as const) {
		await page.setViewportSize(size);
		await page.screenshot({ path: join(SCREENS, `${name}-${label}.png`), fullPage: true });
	}
}

/** Replaces the seeded segment's stand-in poster with a real picture, so the pages show one. */
async function putPoster(recordingId: string, id: string, jpeg: Uint8Array) {
	const db = database();
	const { clinicId } = db
		.prepare('select clinic_id as clinicId from recording where id = ?')
		.get(recordingId) as { clinicId: string };
	db.close();
	const s3 = storageClient();
	await s3.send(
		new PutObjectCommand({
			Bucket: 'kinelume',
			Key: `clinics/${clinicId}/recordings/${recordingId}/segments/${id}/posters/0.jpg`,
			Body: jpeg,
			ContentType: 'image/jpeg'
		})
	);
	s3.destroy();
}

// Radio buttons are drawn as big labels with the input itself visually hidden, so the label
// takes the click (as it does for a person); `force` lets Playwright click through to it.

/** The video's state, read from the page. */
const videoState = (page: Page) =>
	page.getByTestId('replay-video').evaluate((v: HTMLVideoElement) => ({
		time: v.currentTime,
		paused: v.paused,
		loop: v.loop,
		rate: v.playbackRate
	}));

test.beforeAll(async () => {
	test.setTimeout(120_000);
	dir = await mkdtemp(join(tmpdir(), 'kinelume-e2e-patient-'));
	const clip = join(dir, 'clip.mp4');
	// A playable 8-second clip: a test pattern with a tone, keyframes every second.
	await run(ffmpeg, [
		...['-hide_banner', '-loglevel', 'error', '-y'],
		...['-f', 'lavfi', '-i', 'testsrc=size=320x180:rate=12'],
		...['-f', 'lavfi', '-i', 'sine=frequency=440:sample_rate=44100'],
		...['-t', '8', '-c:v', 'libx264', '-pix_fmt', 'yuv420p', '-g', '12'],
		...['-c:a', 'aac', '-movflags', '+faststart', clip]
	]);
	const poster = join(dir, 'poster.jpg');
	await run(ffmpeg, [
		'-hide_banner',
		'-loglevel',
		'error',
		'-y',
		'-i',
		clip,
		'-frames:v',
		'1',
		poster
	]);
	const bytes = await readFile(clip);
	const recordingId = await seedReadyRecording(ACCOUNTS.clinician, {
		rendition: bytes,
		durationSeconds: 8,
		title: 'Heel slide demonstration'
	});
	segmentId = await seedReadySegment(recordingId, {
		title: 'Heel slides',
		start: 0,
		end: 8,
		cues: CUES,
		clip: bytes
	});
	await putPoster(recordingId, segmentId, await readFile(poster));
	patient = await seedSignInPatient(ACCOUNTS.clinician, { name: 'Mabel Quinn' });
	({
		itemIds: [itemId]
	} = seedProgramme(
		patient.patientId,
		[
			{ title: 'Heel slides', segmentId, safetyNotes: SAFETY, sets: 2, reps: 3, restSeconds: 30 },
			{ title: 'Ankle pumps', sets: 1, reps: 10 }
		],
		{ note: 'Little and often. Ice after if the knee feels warm.' }
	));
	const other = await seedSignInPatient(ACCOUNTS.clinician, { name: 'Other Patient' });
	otherPatientEmail = other.email;
	otherItemId = seedProgramme(other.patientId, [{ title: 'Sit to stand', segmentId }]).itemIds[0];
});

test.afterAll(async () => {
	await rm(dir, { recursive: true, force: true });
});

test('a patient replays an exercise, sets captions, counts by keyboard and logs sessions, also offline', async ({
	page,
	context
}) => {
	test.setTimeout(120_000);
	await signInWithPassword(page, patient.email);
	await visit(page, '/today');
	await expect(page.getByRole('heading', { level: 1 })).toContainText('Mabel');
	await expect(page.getByRole('heading', { name: 'When to stop' })).toBeVisible();
	await expect(page.getByTestId('day-status')).toHaveText('0 of 6 sessions done today');
	// The suggested time is 09:00; later in the day the first session is due at once.
	await expect(page.getByTestId('next-session')).toHaveText(
		/^Next: your first session of 3, (around 09:00|now is a good time \(suggested for 09:00\)|suggested for 09:00; if it is late for you, start fresh tomorrow)\.$/
	);
	await expect(page.getByText('Little and often.')).toBeVisible();
	await expectNoAxeViolations(page);
	await screens(page, 'today');

	await page.getByRole('link', { name: /Play exercise.*Heel slides/ }).click();
	await expect(page).toHaveURL(`/replay/${itemId}`);

	// Safety notes come before the first play; the player is not on the page yet.
	const gate = page.getByTestId('safety-gate');
	await expect(gate).toContainText('hot, red or more swollen');
	await expect(gate.getByRole('listitem')).toHaveCount(2);
	await expect(page.getByTestId('replay-video')).toHaveCount(0);
	await expect(page.getByRole('heading', { name: 'When to stop' })).toBeVisible();
	await expectNoAxeViolations(page);
	await screens(page, 'replay-safety');
	await gate.getByRole('button', { name: /I have read these notes/ }).click();
	await expect(page.getByTestId('replay-video')).toBeVisible();

	// Acknowledged once: the notes do not stand in the way again.
	await reload(page);
	await expect(page.getByTestId('safety-gate')).toHaveCount(0);
	await expect(page.getByTestId('replay-video')).toBeVisible();
	await expect(page.getByTestId('dosage')).toHaveText(
		'2 sets of 3 reps, rest 30 seconds between sets; 3 times a day, every day.'
	);

	// Space plays, with captions on by default in the band under the picture.
	await page.locator('body').click({ position: { x: 5, y: 5 } });
	await page.keyboard.press('Space');
	await expect(page.getByRole('button', { name: 'Pause' })).toBeVisible();
	await expect
		.poll(async () => (await videoState(page)).time, { timeout: 10_000 })
		.toBeGreaterThan(0.3);
	await expect(page.getByTestId('caption-band')).toContainText(CUES[0].text);

	// Keys for loop and speeds; the state is in the words on the buttons too.
	await page.keyboard.press('l');
	await expect(page.getByRole('button', { name: 'Loop: off' })).toBeVisible();
	expect((await videoState(page)).loop).toBe(false);
	await page.keyboard.press('l');
	expect((await videoState(page)).loop).toBe(true);
	await page.keyboard.press('1');
	expect((await videoState(page)).rate).toBe(0.5);
	await page.keyboard.press('2');
	expect((await videoState(page)).rate).toBe(0.75);
	await page.keyboard.press('3');
	expect((await videoState(page)).rate).toBe(1);

	// The transcript seeks, and marks the line being spoken.
	const transcript = page.getByTestId('transcript');
	await transcript.getByRole('button', { name: new RegExp(CUES[2].text) }).click();
	await expect.poll(async () => (await videoState(page)).time).toBeGreaterThanOrEqual(5);
	await expect(transcript.locator('[aria-current="true"]')).toContainText(CUES[2].text);
	await expect(page.getByTestId('caption-band')).toContainText(CUES[2].text);
	await page.getByRole('button', { name: 'Pause' }).click();

	// Caption style: a faint pair shows its ratio and is refused, here and by the server.
	await page.getByText('Caption size and colours').click();
	const panel = page.getByTestId('caption-style');
	const textColour = panel.getByRole('group', { name: 'Text colour' });
	const background = panel.getByRole('group', { name: 'Background' });
	await textColour.getByRole('radio', { name: 'Yellow' }).check({ force: true });
	await background.getByRole('radio', { name: 'White' }).check({ force: true });
	await expect(panel.getByTestId('contrast-verdict')).toHaveText(
		'Contrast 1.3 : 1 — too faint, choose another'
	);
	await panel.getByRole('button', { name: 'Save caption style' }).click();
	await expect(panel.getByRole('alert')).toContainText('1.3 : 1 — too faint to read');
	await panel.getByTestId('custom-color').fill('#777777');
	await expect(panel.getByTestId('contrast-verdict')).toHaveText(
		'Contrast 4.4 : 1 — too faint, choose another'
	);
	const refused = await page.request.put('/api/me/caption-style', {
		data: { sizePercent: 150, color: '#777777', background: '#ffffff' },
		headers: { Origin: E2E.origin }
	});
	expect(refused.status()).toBe(422);
	expect((await refused.json()).error.message).toContain('4.4 : 1');
	await textColour.getByRole('radio', { name: 'White' }).check({ force: true });
	await background.getByRole('radio', { name: 'Dark grey' }).check({ force: true });
	await panel.getByRole('radio', { name: '200%' }).check({ force: true });
	await expect(panel.getByTestId('contrast-verdict')).toHaveText(
		'Contrast 12.6 : 1 — easy to read'
	);
	await expectNoAxeViolations(page);
	await screens(page, 'caption-style');
	await panel.getByRole('button', { name: 'Save caption style' }).click();
	await expect(panel.getByRole('status')).toContainText('Saved');
	const band = page.getByTestId('caption-band');
	await expect(band).toHaveCSS('background-color', 'rgb(51, 51, 51)');
	await expect(band).toHaveCSS('color', 'rgb(255, 255, 255)');
	// 200% of the 1.2rem caption base, on the 18 px root.
	await expect(band).toHaveCSS('font-size', '43.2px');
	const saved = await page.request.get('/api/me/caption-style');
	expect((await saved.json()).style).toEqual({
		sizePercent: 200,
		color: '#ffffff',
		background: '#333333'
	});

	// Count two sets of three with keys only; every count is announced.
	await page.locator('body').click({ position: { x: 5, y: 5 } });
	const announcer = page.getByTestId('announcer');
	const counter = page.getByTestId('counter-display');
	for (const key of ['r', 'r']) await page.keyboard.press(key);
	await expect(announcer).toHaveText('Rep 2 of 3, set 1 of 2.');
	await page.keyboard.press('r');
	await expect(announcer).toHaveText('Set 1 of 2 done. Rest 30 seconds. Next: set 2 of 2.');
	await page.keyboard.press('+');
	await page.keyboard.press('-');
	await expect(announcer).toHaveText('Rep 0 of 3, set 2 of 2.');
	await page.keyboard.press('r');
	await page.keyboard.press('r');
	await expect(counter).toHaveText('Set 2 of 2 · Rep 2 of 3');
	await page.keyboard.press('s');
	await expect(announcer).toHaveText('All 2 sets done. Press Done to log this session.');
	await expect(counter).toContainText('All 2 sets done');

	// D opens the log with the counts; pain 3; saved.
	await page.keyboard.press('d');
	const form = page.getByTestId('log-form');
	await expect(form.getByRole('heading', { name: 'Log this session' })).toBeFocused();
	await expect(form.getByRole('spinbutton', { name: 'Sets done' })).toHaveValue('2');
	await expect(form.getByRole('spinbutton', { name: 'Reps in each set' })).toHaveValue('3');
	await form.getByRole('button', { name: 'Save session' }).click();
	await expect(form.getByRole('alert')).toContainText('Choose a number for your pain');
	await form.getByRole('radio', { name: '3', exact: true }).check({ force: true });
	await form.getByLabel('A note for your clinician (optional)').fill('Tight at the end, fine.');
	await expectNoAxeViolations(page);
	await screens(page, 'log-step');
	await form.getByRole('button', { name: 'Save session' }).click();
	await expect(page.getByTestId('log-outcome')).toContainText('Session saved');
	await expect(page.getByTestId('done-today')).toHaveText('Today: 1 of 3 sessions done.');
	expect(sessionLogsOf(patient.patientId)).toEqual([
		expect.objectContaining({ setsDone: 2, repsDone: 3, pain: 3, note: 'Tight at the end, fine.' })
	]);

	// Offline: the log waits on the device, in words, and goes once the connection is back.
	await context.setOffline(true);
	await page.getByRole('button', { name: /Done — log this session/ }).click();
	await form.getByRole('radio', { name: '2', exact: true }).check({ force: true });
	await form.getByRole('button', { name: 'Save session' }).click();
	await expect(page.getByTestId('log-outcome')).toContainText(
		'Saved on this device — will send when you are back online'
	);
	await expect(page.getByTestId('pending-sessions')).toContainText('1 session waiting to send');
	expect(sessionLogsOf(patient.patientId)).toHaveLength(1);
	await context.setOffline(false);
	await expect(page.getByTestId('pending-sessions')).toContainText('Sent.', { timeout: 15_000 });
	await expect(page.getByTestId('done-today')).toHaveText('Today: 2 of 3 sessions done.');
	expect(sessionLogsOf(patient.patientId).map((l) => l.pain)).toEqual([2, 3]);

	// A log the server could not take (the request failed) is kept and sent when a page opens.
	await page.route('**/api/sessions', (route) => route.abort('connectionfailed'));
	await page.getByRole('button', { name: /Done — log this session/ }).click();
	await form.getByRole('radio', { name: /^0\b.*No pain/ }).check({ force: true });
	await form.getByRole('button', { name: 'Save session' }).click();
	await expect(page.getByTestId('log-outcome')).toContainText('Saved on this device');
	await page.unroute('**/api/sessions');
	await visit(page, '/today');
	await expect.poll(() => sessionLogsOf(patient.patientId).length, { timeout: 15_000 }).toBe(3);
	await expect(page.getByTestId('day-status')).toHaveText('3 of 6 sessions done today');
	await expect(page.getByText('Done for today: 3 of 3 sessions')).toBeVisible();
});

test('session logs are idempotent, scoped to the patient, and other patients read as 404', async ({
	page
}) => {
	await signInWithPassword(page, patient.email);
	const body = {
		clientId: crypto.randomUUID(),
		programmeItemId: itemId,
		doneAt: new Date().toISOString(),
		setsDone: 1,
		repsDone: 3,
		pain: 1,
		note: ''
	};
	const headers = { Origin: E2E.origin };
	const first = await page.request.post('/api/sessions', { data: body, headers });
	expect(first.status()).toBe(201);
	const again = await page.request.post('/api/sessions', { data: { ...body, pain: 8 }, headers });
	expect(again.status()).toBe(200);
	expect((await again.json()).log).toEqual((await first.json()).log);
	expect((await again.json()).log.pain).toBe(1);

	const notTheirs = await page.request.post('/api/sessions', {
		data: { ...body, clientId: crypto.randomUUID(), programmeItemId: otherItemId },
		headers
	});
	expect(notTheirs.status()).toBe(404);
	expect((await notTheirs.json()).error).toEqual({
		status: 404,
		message: 'That exercise is not in your programme.'
	});
	const bad = await page.request.post('/api/sessions', {
		data: { ...body, clientId: crypto.randomUUID(), pain: 11 },
		headers
	});
	expect(bad.status()).toBe(400);
	expect((await bad.json()).error.message).toBe('Pain can be at most 10.');

	const signedOut = await request.newContext({ baseURL: E2E.origin });
	expect((await signedOut.post('/api/sessions', { data: body, headers })).status()).toBe(401);
	await signedOut.dispose();

	const other = await open(page, `/replay/${otherItemId}`);
	expect(other?.status()).toBe(404);
	await expectNoAxeViolations(page);

	const calendar = await page.request.get('/today/calendar.ics');
	expect(calendar.status()).toBe(200);
	expect(calendar.headers()['content-type']).toBe('text/calendar; charset=utf-8');
	expect(calendar.headers()['content-disposition']).toBe(
		'attachment; filename="kinelume-reminders.ics"'
	);
	const ics = await calendar.text();
	expect(ics.startsWith('BEGIN:VCALENDAR\r\n')).toBe(true);
	expect(ics).toContain('BEGIN:VALARM');
	// Unfolded (RFC 5545 §3.1: a folded line goes on after CRLF and one space or tab).
	expect(ics.replace(/\r\n[ \t]/g, '')).toContain('Heel slides: 2 sets of 3 reps');
});

test("a patient cannot read another patient's replay or the segment's captions through it", async ({
	page
}) => {
	await signInWithPassword(page, otherPatientEmail);
	expect((await open(page, `/replay/${itemId}`))?.status()).toBe(404);
	// Their own item uses the same segment, so its captions are theirs too; a stranger's are not.
	await visit(page, `/replay/${otherItemId}`);
	const stranger = await seedSignInPatient(ACCOUNTS.clinician, { name: 'Stranger' });
	const context = await signedInRequest(stranger.email);
	expect((await context.get(`/api/segments/${segmentId}/captions.vtt`)).status()).toBe(404);
	expect((await context.get(`/replay/${itemId}`, { maxRedirects: 0 })).status()).toBe(404);
	await context.dispose();
});
