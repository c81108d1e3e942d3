import { expect, test, type Page } from '@playwright/test';
import { execFile } from 'node:child_process';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { ACCOUNTS, seedReadyRecording, signInWithPassword, visit } from './support';
import { seedReadySegment } from './segments-support';
import { seedProgramme, seedSignInPatient } from './programme-fixtures';
import { E2E } from './ports';
import { FFMPEG } from '../integration/recordings-support';

/*
 * A clip left open past its storage address's lifetime keeps seeking. Media endpoints answer
 * with a redirect to a presigned storage address that works E2E.mediaUrlLifetimeSeconds here.
 * Chromium keeps reading later byte ranges from that address; once it has run out storage
 * refuses it and Chromium waits for ever (opaque-response blocking hides the refusal, no error
 * is fired). The page's players (lib/media/renew-expired.ts) load the file again from the app's
 * address at the same place when they need bytes after that, and play on. Checked on a patient's
 * replay (its service worker passes media requests on) and a clinician's recording (none).
 */

const run = promisify(execFile);
// The ffmpeg the app chooses (Debian's when installed), as in the integration tests.
const ffmpeg = FFMPEG;
const RUN = crypto.randomUUID().slice(0, 8);
const SECONDS = 40;

let dir: string;
let patientEmail: string;
let itemId: string;
let clipPath: string;
let recordingId: string;

test.beforeAll(async () => {
	test.setTimeout(120_000);
	dir = await mkdtemp(join(tmpdir(), 'kinelume-e2e-expiry-'));
	const clip = join(dir, 'clip.mp4');
	// Large enough (about 25 MB) that Chromium has not read the end when the seek comes: noisy
	// pictures at a high bitrate, keyframes every second.
	await run(ffmpeg, [
		...['-hide_banner', '-loglevel', 'error', '-y'],
		...['-f', 'lavfi', '-i', `testsrc2=size=640x360:rate=25:duration=${SECONDS}`],
		...['-f', 'lavfi', '-i', `sine=frequency=330:sample_rate=44100:duration=${SECONDS}`],
		...['-vf', 'noise=alls=40:allf=t', '-c:v', 'libx264', '-preset', 'ultrafast'],
		...['-b:v', '5M', '-maxrate', '5M', '-bufsize', '2M', '-g', '25', '-pix_fmt', 'yuv420p'],
		...['-c:a', 'aac', '-movflags', '+faststart', '-shortest', clip]
	]);
	const bytes = await readFile(clip);
	recordingId = await seedReadyRecording(ACCOUNTS.clinician, {
		rendition: bytes,
		durationSeconds: SECONDS,
		title: `Long demonstration ${RUN}`
	});
	const segmentId = await seedReadySegment(recordingId, {
		title: `Long knee extension ${RUN}`,
		start: 0,
		end: SECONDS,
		cues: [{ id: 'x1', start: 0, end: 5, text: 'Straighten the knee slowly.' }],
		clip: bytes
	});
	clipPath = `/api/segments/${segmentId}/clip.mp4`;
	const patient = await seedSignInPatient(ACCOUNTS.clinician, { name: `Expiry Ezra ${RUN}` });
	patientEmail = patient.email;
	({
		itemIds: [itemId]
	} = seedProgramme(patient.patientId, [
		{ title: `Long knee extension ${RUN}`, segmentId, sets: 1, reps: 5 }
	]));
});

test.afterAll(async () => {
	await rm(dir, { recursive: true, force: true });
});

const videoState = (page: Page, testId: string) =>
	page.getByTestId(testId).evaluate((v: HTMLVideoElement) => ({
		time: v.currentTime,
		paused: v.paused,
		error: v.error?.code ?? null
	}));

/**
 * Plays the video `testId` of the page, waits past the address's lifetime, seeks to a part not
 * read yet and checks that it plays on from there, having asked the app (`appPath`) again.
 */
async function playSeekAfterLifetime(page: Page, testId: string, appPath: string) {
	const asked: number[] = [];
	const refused: string[] = [];
	page.on('request', (request) => {
		if (request.url().includes(appPath)) asked.push(Date.now());
	});
	page.on('response', (response) => {
		if (response.url().includes(appPath) && response.status() >= 400) {
			refused.push(`${response.status()} ${response.url()}`);
		}
	});
	const video = page.getByTestId(testId);
	await expect(video).toBeVisible();
	await video.evaluate(async (v: HTMLVideoElement) => {
		v.muted = true;
		await v.play();
	});
	await expect.poll(async () => (await videoState(page, testId)).time).toBeGreaterThan(1);

	await page.waitForTimeout((E2E.mediaUrlLifetimeSeconds + 2) * 1000);
	const seekAt = Date.now();
	await video.evaluate((v: HTMLVideoElement) => {
		v.currentTime = 34;
	});
	await expect
		.poll(async () => (await videoState(page, testId)).time, { timeout: 20_000 })
		.toBeGreaterThan(35);
	expect(await videoState(page, testId)).toMatchObject({ paused: false, error: null });
	await expect(page.getByText('could not be loaded')).toHaveCount(0);
	// The player went back to the app's address (checked again, a fresh redirect), never refused.
	expect(asked.filter((at) => at >= seekAt).length).toBeGreaterThan(0);
	expect(refused).toEqual([]);
}

test('a patient’s replay left open past its storage address’s lifetime seeks and plays on', async ({
	page
}) => {
	test.setTimeout(90_000);
	await signInWithPassword(page, patientEmail);
	await visit(page, `/replay/${itemId}`);
	await playSeekAfterLifetime(page, 'replay-video', clipPath);
});

test('a clinician’s recording left open past its storage address’s lifetime seeks and plays on', async ({
	page
}) => {
	// Staff pages have no service worker: Chromium reads the expired address itself.
	test.setTimeout(90_000);
	await signInWithPassword(page, ACCOUNTS.clinician);
	await visit(page, `/recordings/${recordingId}`);
	await playSeekAfterLifetime(page, 'player', `/api/recordings/${recordingId}/media/rendition.mp4`);
});
