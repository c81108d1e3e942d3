/**
 * The patient's phone (390 × 844): the next exercise on Today's first screen, the video at the top
 * and in view after the safety notes and while the transcript is used, focus on Play, and a portrait
 * clip drawn in its own shape. The clips are made here by ffmpeg; the words are invented.
 */
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { expect, test, type Page } from '@playwright/test';
import { makeUprightClip } from './clips';
import { seedProgramme, seedSignInPatient } from './programme-fixtures';
import { seedReadySegment } from './segments-support';
import {
	ACCOUNTS,
	database,
	expectNoAxeViolations,
	seedReadyRecording,
	signInWithPassword,
	open
} from './support';

const PHONE = { width: 390, height: 844 };
const SHOTS = join(import.meta.dirname, '../.run/e2e-results');

// Sixteen short lines, so the transcript runs well below the first screen.
const CUES = Array.from({ length: 16 }, (_, i) => ({
	id: String(i + 1),
	start: i * 0.5,
	end: i * 0.5 + 0.45,
	text: `Line ${i + 1}: keep the movement slow and smooth.`
}));

let dir: string;
let patientEmail: string;
let itemId: string;

/** The box of an element against the viewport. */
async function box(page: Page, testId: string) {
	const found = await page.getByTestId(testId).boundingBox();
	if (!found) throw new Error(`${testId} has no box`);
	return found;
}

async function fullyInView(page: Page, testId: string) {
	const b = await box(page, testId);
	expect(b.y).toBeGreaterThanOrEqual(0);
	expect(b.y + b.height).toBeLessThanOrEqual(PHONE.height);
}

test.beforeAll(async () => {
	test.setTimeout(120_000);
	dir = await mkdtemp(join(tmpdir(), 'kinelume-e2e-phone-'));
	const clip = join(dir, 'upright.mp4');
	const bytes = await makeUprightClip(clip);
	const recordingId = await seedReadyRecording(ACCOUNTS.clinician, {
		rendition: bytes,
		durationSeconds: 8,
		title: 'Upright demonstration'
	});
	const db = database();
	try {
		db.prepare('update recording set width = 180, height = 320 where id = ?').run(recordingId);
	} finally {
		db.close();
	}
	const segmentId = await seedReadySegment(recordingId, {
		title: 'Wall slide',
		start: 0,
		end: 8,
		cues: CUES,
		clip: bytes
	});
	const run_ = crypto.randomUUID().slice(0, 6);
	const patient = await seedSignInPatient(ACCOUNTS.clinician, { name: `Rosa Penn ${run_}` });
	patientEmail = patient.email;
	({
		itemIds: [itemId]
	} = seedProgramme(patient.patientId, [
		{
			title: 'Wall slide',
			segmentId,
			safetyNotes: 'Stop if the shoulder pain is sharp.',
			sets: 1,
			reps: 8
		},
		{ title: 'Ankle circles', sets: 1, reps: 10 }
	]));
});

test.afterAll(async () => {
	await rm(dir, { recursive: true, force: true });
});

test.use({ viewport: PHONE });

test('on a phone the next exercise is on Today’s first screen, and the upright video stays in view at the top', async ({
	page
}) => {
	await signInWithPassword(page, patientEmail);
	await open(page, '/today');
	const firstCard = page.getByRole('link', { name: /Play exercise.*Wall slide/ });
	const card = await firstCard.boundingBox();
	expect(card && card.y + card.height).toBeLessThanOrEqual(PHONE.height);
	await expectNoAxeViolations(page);
	await page.screenshot({ path: join(SHOTS, 'phone-today.png') });

	await firstCard.click();
	await expect(page).toHaveURL(`/replay/${itemId}`);
	await page.getByRole('button', { name: /I have read these notes/ }).click();
	await expect(page.getByTestId('replay-video')).toBeVisible();
	// The video is at the top and whole, and Play has the focus.
	await expect(page.getByRole('button', { name: 'Play' })).toBeFocused();
	await fullyInView(page, 'replay-picture');
	// Drawn in its own upright shape, not squeezed into a wide box.
	const video = await box(page, 'replay-video');
	const drawn = await page
		.getByTestId('replay-video')
		.evaluate((v: HTMLVideoElement) => getComputedStyle(v).aspectRatio);
	expect(drawn).toBe('180 / 320');
	expect(video.height).toBeGreaterThan(250);
	await expectNoAxeViolations(page);
	await page.screenshot({ path: join(SHOTS, 'phone-replay-upright.png') });

	// A line far down the transcript: the video seeks and is still whole on screen.
	const last = page.getByRole('button', { name: /Line 16/ });
	await last.scrollIntoViewIfNeeded();
	await last.click();
	await expect
		.poll(() => page.getByTestId('replay-video').evaluate((v: HTMLVideoElement) => v.currentTime))
		.toBeGreaterThan(7);
	await fullyInView(page, 'replay-picture');
	await page.screenshot({ path: join(SHOTS, 'phone-replay-after-seek.png') });
});
