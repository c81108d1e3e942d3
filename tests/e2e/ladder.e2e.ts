import { expect, test, type BrowserContext, type Page } from '@playwright/test';
import { PutObjectCommand } from '@aws-sdk/client-s3';
import { execFile } from 'node:child_process';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import {
	ACCOUNTS,
	database,
	open,
	seedReadyRecording,
	signInWithPassword,
	storageClient
} from './support';
import { seedReadySegment } from './segments-support';
import { seedProgramme, seedSignInPatient } from './programme-fixtures';
import { FFMPEG } from '../integration/recordings-support';

/*
 * The bitrate ladder on a patient's phone: on a slow 3G-like link (DevTools throttling) the
 * replay plays the smallest version; on a 4G-like one it moves to the largest; the phone keeps
 * the smallest for offline replay, which plays with no connection. The two versions differ in
 * picture size (640 × 360 and 320 × 180), so the size drawn tells which one plays.
 */

const run = promisify(execFile);
// The ffmpeg the app chooses (Debian's when installed), as in the integration tests.
const ffmpeg = FFMPEG;
const RUN = crypto.randomUUID().slice(0, 8);
const SECONDS = 6;

let dir: string;
let itemId: string;
let segmentId: string;
let email: string;
let smallSize: number;

test.use({ viewport: { width: 390, height: 844 } });

async function makeClip(path: string, size: string) {
	await run(ffmpeg, [
		...['-hide_banner', '-loglevel', 'error', '-y'],
		...['-f', 'lavfi', '-i', `testsrc=size=${size}:rate=12`],
		...['-f', 'lavfi', '-i', 'sine=frequency=330:sample_rate=44100'],
		...['-t', String(SECONDS), '-c:v', 'libx264', '-pix_fmt', 'yuv420p', '-g', '12'],
		...['-c:a', 'aac', '-movflags', '+faststart', path]
	]);
}

async function throttle(context: BrowserContext, page: Page, kbps: number, latency: number) {
	const cdp = await context.newCDPSession(page);
	await cdp.send('Network.enable');
	await cdp.send('Network.emulateNetworkConditions', {
		offline: false,
		latency,
		downloadThroughput: (kbps * 1000) / 8,
		uploadThroughput: (kbps * 1000) / 8
	});
}

const video = (page: Page) => page.getByTestId('replay-video');
const pictureWidth = (page: Page) =>
	video(page).evaluate((v: HTMLVideoElement) => (v.currentTime > 0 ? v.videoWidth : 0));

async function playFor(page: Page) {
	await page.getByRole('button', { name: 'Play' }).click();
	await expect
		.poll(() => video(page).evaluate((v: HTMLVideoElement) => v.currentTime))
		.toBeGreaterThan(0.5);
}

test.beforeAll(async () => {
	test.setTimeout(120_000);
	dir = await mkdtemp(join(tmpdir(), 'kinelume-e2e-ladder-'));
	await makeClip(join(dir, 'top.mp4'), '640x360');
	await makeClip(join(dir, 'small.mp4'), '320x180');
	const top = await readFile(join(dir, 'top.mp4'));
	const small = await readFile(join(dir, 'small.mp4'));
	smallSize = small.length;
	const recordingId = await seedReadyRecording(ACCOUNTS.clinician, {
		rendition: top,
		durationSeconds: SECONDS,
		title: `Ladder heel slides ${RUN}`
	});
	segmentId = await seedReadySegment(recordingId, {
		title: `Ladder heel slides ${RUN}`,
		start: 0,
		end: SECONDS,
		clip: top
	});
	const db = database();
	let clinicId: string;
	try {
		({ clinicId } = db
			.prepare('select clinic_id as clinicId from segment where id = ?')
			.get(segmentId) as { clinicId: string });
		// The player chooses by bitrate, which it takes from the sizes listed: list those of a
		// 6-second clip at the ladder's rates (2.3 and 0.3 Mbit/s), as the test clips are tiny.
		db.prepare('update segment set clip_size = ?, clip_versions = ? where id = ?').run(
			(2300 * 1000 * SECONDS) / 8,
			JSON.stringify([{ short: 360, size: (300 * 1000 * SECONDS) / 8 }]),
			segmentId
		);
	} finally {
		db.close();
	}
	const s3 = storageClient();
	await s3.send(
		new PutObjectCommand({
			Bucket: 'kinelume',
			Key: `clinics/${clinicId}/recordings/${recordingId}/segments/${segmentId}/clip-360.mp4`,
			Body: small,
			ContentType: 'video/mp4'
		})
	);
	s3.destroy();
	const patient = await seedSignInPatient(ACCOUNTS.clinician, { name: `Ladder Lorna ${RUN}` });
	email = patient.email;
	({
		itemIds: [itemId]
	} = seedProgramme(patient.patientId, [{ title: `Ladder heel slides ${RUN}`, segmentId }], {
		title: `Ladder programme ${RUN}`,
		publishedAt: Date.now() - 60_000
	}));
});

test.afterAll(async () => {
	await rm(dir, { recursive: true, force: true });
});

test('a slow link plays the smallest version, a 4G-like link the largest', async ({ browser }) => {
	test.setTimeout(120_000);
	const slow = await browser.newContext({ serviceWorkers: 'block' });
	try {
		const page = await slow.newPage();
		await signInWithPassword(page, email);
		await throttle(slow, page, 400, 400);
		await open(page, `/replay/${itemId}`);
		// The markup starts the smallest; on this link the player keeps it.
		await expect(video(page)).toHaveAttribute('data-version', '360');
		await playFor(page);
		expect(await pictureWidth(page)).toBe(320);
		await expect(video(page)).toHaveAttribute('data-version', '360');
		await page.screenshot({
			path: join(import.meta.dirname, '../.run/e2e-results/replay-slow-link.png')
		});
	} finally {
		await slow.close();
	}

	const fast = await browser.newContext({ serviceWorkers: 'block' });
	try {
		const page = await fast.newPage();
		await signInWithPassword(page, email);
		await throttle(fast, page, 9000, 60);
		await open(page, `/replay/${itemId}`);
		await expect(video(page)).toHaveAttribute('data-version', '720');
		await playFor(page);
		expect(await pictureWidth(page)).toBe(640);
	} finally {
		await fast.close();
	}
});

test('the phone keeps the smallest version, which replays offline', async ({ page, context }) => {
	test.setTimeout(120_000);
	await signInWithPassword(page, email);
	await open(page, '/today');
	await page.evaluate(() => navigator.serviceWorker.ready.then(() => undefined));
	await page.reload();
	await open(page, `/replay/${itemId}`);
	const clip = `/api/segments/${segmentId}/clip.mp4`;
	// Saved under the clip's own address, with the smallest version's bytes.
	await expect
		.poll(
			() =>
				page.evaluate(async (clip) => {
					const names = (await caches.keys()).filter((n) => n.startsWith('kinelume-patient-'));
					if (names.length !== 1) return 0;
					const saved = await (await caches.open(names[0])).match(clip);
					return saved ? (await saved.arrayBuffer()).byteLength : 0;
				}, clip),
			{ timeout: 20_000 }
		)
		.toBe(smallSize);

	await context.setOffline(true);
	await page.reload();
	await page.locator('html[data-started]').waitFor({ state: 'attached' });
	await playFor(page);
	expect(await pictureWidth(page)).toBe(320);
	await context.setOffline(false);
});
