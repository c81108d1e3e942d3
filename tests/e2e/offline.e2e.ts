import { expect, test, type Page } from '@playwright/test';
import { execFile } from 'node:child_process';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import {
	ACCOUNTS,
	expectNoAxeViolations,
	seedReadyRecording,
	signInWithPassword,
	visit
} from './support';
import { seedReadySegment } from './segments-support';
import { seedProgramme, seedSignInPatient, sessionLogsOf } from './programme-fixtures';
import { FFMPEG } from '../integration/recordings-support';

/*
 * Replay offline on a phone: one visit online to Today and an exercise, then with no connection
 * the exercise page opens from the phone, its clip plays with captions, a session logged waits
 * on the phone and is sent once the connection is back. Today opens offline too; an exercise
 * never opened gets the offline page. A new programme drops the old exercise's copies, and
 * signing out deletes the patient's copies.
 */

const run = promisify(execFile);
// The ffmpeg the app chooses (Debian's when installed), as in the integration tests.
const ffmpeg = FFMPEG;
const RUN = crypto.randomUUID().slice(0, 8);
const CUES = [
	{ id: 'o1', start: 0, end: 3, text: 'Sit tall with your back against the chair.' },
	{ id: 'o2', start: 3, end: 6, text: 'Straighten the knee and hold it there.' }
];
const SAVED_LINE =
	'You are offline. This exercise and its captions are saved on this phone; sessions you log are sent when you are back online.';

let dir: string;
let patient: { patientId: string; email: string };
let itemId: string;
let unopenedItemId: string;
let files: { clip: string; captions: string; transcript: string };

test.use({ viewport: { width: 390, height: 844 } });

/** Names of the patient caches in this browser. */
const patientCaches = (page: Page) =>
	page.evaluate(async () =>
		(await caches.keys()).filter((name) => name.startsWith('kinelume-patient-'))
	);

/** Whether every address is saved in a patient cache. */
const allSaved = (page: Page, urls: string[]) =>
	page.evaluate(async (urls) => {
		const names = (await caches.keys()).filter((n) => n.startsWith('kinelume-patient-'));
		if (names.length !== 1) return false;
		const cache = await caches.open(names[0]);
		return (await Promise.all(urls.map((u) => cache.match(u)))).every(Boolean);
	}, urls);

const videoTime = (page: Page) =>
	page.getByTestId('replay-video').evaluate((v: HTMLVideoElement) => v.currentTime);

test.beforeAll(async () => {
	test.setTimeout(120_000);
	dir = await mkdtemp(join(tmpdir(), 'kinelume-e2e-offline-'));
	const clip = join(dir, 'clip.mp4');
	// A playable 6-second clip with keyframes every second, as the media worker cuts them.
	await run(ffmpeg, [
		...['-hide_banner', '-loglevel', 'error', '-y'],
		...['-f', 'lavfi', '-i', 'testsrc=size=320x180:rate=12'],
		...['-f', 'lavfi', '-i', 'sine=frequency=330:sample_rate=44100'],
		...['-t', '6', '-c:v', 'libx264', '-pix_fmt', 'yuv420p', '-g', '12'],
		...['-c:a', 'aac', '-movflags', '+faststart', clip]
	]);
	const bytes = await readFile(clip);
	const recordingId = await seedReadyRecording(ACCOUNTS.clinician, {
		rendition: bytes,
		durationSeconds: 6,
		title: `Offline knee extension ${RUN}`
	});
	const segmentId = await seedReadySegment(recordingId, {
		title: `Seated knee extension ${RUN}`,
		start: 0,
		end: 6,
		cues: CUES,
		clip: bytes
	});
	const base = `/api/segments/${segmentId}`;
	files = {
		clip: `${base}/clip.mp4`,
		captions: `${base}/captions.vtt`,
		transcript: `${base}/transcript.json`
	};
	patient = await seedSignInPatient(ACCOUNTS.clinician, { name: `Offline Olwen ${RUN}` });
	({
		itemIds: [itemId, unopenedItemId]
	} = seedProgramme(
		patient.patientId,
		[
			{ title: `Seated knee extension ${RUN}`, segmentId, sets: 1, reps: 5 },
			{ title: `Ankle circles ${RUN}`, sets: 1, reps: 10 }
		],
		{ title: `Offline programme ${RUN}`, publishedAt: Date.now() - 60_000 }
	));
});

test.afterAll(async () => {
	await rm(dir, { recursive: true, force: true });
});

test('an exercise opened once replays with captions offline, logs wait and go, sign-out forgets', async ({
	page,
	context
}) => {
	test.setTimeout(120_000);
	await signInWithPassword(page, patient.email);
	const today = await page.goto('/today');
	// Patient pages name their sign-in's copies; the policy lets the worker in, as script-src did.
	expect(today?.headers()['x-kinelume-offline-key']).toMatch(/^[0-9a-f]{32}$/);
	expect(today?.headers()['content-security-policy']).toContain("worker-src 'self'");
	// The patient pages install the worker; once it controls the page, navigations go through it.
	await page.evaluate(() => navigator.serviceWorker.ready.then(() => undefined));
	await page.reload();
	expect(await page.evaluate(() => Boolean(navigator.serviceWorker.controller))).toBe(true);
	await expect(page.locator('html[data-started]')).toHaveCount(1);

	await page
		.getByRole('link', { name: new RegExp(`Play exercise.*Seated knee extension ${RUN}`) })
		.click();
	await expect(page).toHaveURL(`/replay/${itemId}`);
	await expect(page.getByTestId('replay-video')).toBeVisible();
	await expect
		.poll(() => allSaved(page, ['/today', `/replay/${itemId}`, ...Object.values(files)]), {
			timeout: 20_000
		})
		.toBe(true);
	expect(await patientCaches(page)).toHaveLength(1);

	// No connection: the exercise page opens from the phone and says so.
	await context.setOffline(true);
	const clipAnswers: { status: number; fromWorker: boolean; range: string | undefined }[] = [];
	page.on('response', (response) => {
		if (new URL(response.url()).pathname === files.clip) {
			clipAnswers.push({
				status: response.status(),
				fromWorker: response.fromServiceWorker(),
				range: response.headers()['content-range']
			});
		}
	});
	await page.reload();
	await expect(page.getByRole('heading', { level: 1 })).toHaveText(`Seated knee extension ${RUN}`);
	await expect(page.locator('html[data-started]')).toHaveCount(1);
	await expect(page.getByTestId('offline-notice')).toHaveText(SAVED_LINE);
	await expect(page.getByTestId('offline-notice')).toHaveAttribute('role', 'status');

	// The clip plays from the saved copy (byte ranges answered by the worker), with its captions.
	await page.getByRole('button', { name: 'Play', exact: true }).click();
	await expect.poll(() => videoTime(page), { timeout: 15_000 }).toBeGreaterThan(0.5);
	await expect(page.getByTestId('caption-band')).toContainText(CUES[0].text);
	expect(
		await page
			.getByTestId('replay-video')
			.evaluate((v: HTMLVideoElement) => v.textTracks[0]?.cues?.length ?? 0)
	).toBe(CUES.length);
	await expect(page.getByTestId('transcript')).toContainText(CUES[1].text);
	expect(clipAnswers.length).toBeGreaterThan(0);
	expect(clipAnswers.every((a) => a.fromWorker && a.status === 206)).toBe(true);
	expect(clipAnswers[0].range).toMatch(/^bytes 0-\d+\/\d+$/);
	await page.getByRole('button', { name: 'Pause' }).click();
	await expectNoAxeViolations(page);

	// A session logged offline waits on the phone.
	await page.getByRole('button', { name: /Done — log this session/ }).click();
	const form = page.getByTestId('log-form');
	await form.getByRole('radio', { name: '1', exact: true }).check({ force: true });
	await form.getByRole('button', { name: 'Save session' }).click();
	await expect(page.getByTestId('log-outcome')).toContainText(
		'Saved on this device — will send when you are back online'
	);
	await expect(page.getByTestId('pending-sessions')).toContainText('1 session waiting to send');
	expect(sessionLogsOf(patient.patientId)).toHaveLength(0);

	// Still offline, back to Today: the app's own navigation falls back to the saved page.
	await page.getByRole('link', { name: 'Back to today' }).first().click();
	await expect(page).toHaveURL('/today');
	await expect(page.getByRole('heading', { level: 1 })).toContainText('Offline');
	await expect(page.getByTestId('offline-notice')).toContainText(
		'This is your programme as it was last saved on this phone.'
	);
	await expect(page.getByTestId('pending-sessions')).toContainText('1 session waiting to send');

	// An exercise never opened is not on the phone: a small page says so and offers Today.
	const unsaved = await page.goto(`/replay/${unopenedItemId}`);
	expect(unsaved?.status()).toBe(503);
	await expect(page.getByRole('heading', { level: 1 })).toHaveText('You are offline');
	await expect(page.getByRole('link', { name: 'Open today’s programme' })).toBeVisible();

	// Back online: the waiting session is sent once.
	await context.setOffline(false);
	await visit(page, '/today');
	await expect(page.getByTestId('offline-notice')).toHaveText('');
	await expect.poll(() => sessionLogsOf(patient.patientId).length, { timeout: 15_000 }).toBe(1);
	await expect(page.getByTestId('pending-sessions')).not.toContainText('waiting to send');

	// A new programme without that exercise: Today's visit drops its page and files.
	seedProgramme(patient.patientId, [{ title: `Heel raises ${RUN}`, sets: 1, reps: 8 }], {
		title: `Next programme ${RUN}`
	});
	await page.reload();
	await expect(page.getByText(`Next programme ${RUN}`)).toBeVisible();
	await expect.poll(() => allSaved(page, [`/replay/${itemId}`])).toBe(false);
	expect(await allSaved(page, [files.clip])).toBe(false);
	expect(await allSaved(page, ['/today'])).toBe(true);

	// Signing out deletes the patient's copies on this phone.
	await page.getByRole('button', { name: 'Sign out' }).click();
	await page.waitForURL((url) => url.pathname === '/signin');
	await expect.poll(() => patientCaches(page)).toEqual([]);
});
