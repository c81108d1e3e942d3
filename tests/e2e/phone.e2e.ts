/**
 * The patient's phone (390 × 844): the next exercise on Today's first screen, the video at the top
 * and in view after the safety notes and while the transcript is used, focus on Play, and a portrait
 * clip drawn in its own shape. The clips are made here by ffmpeg; the words are invented.
 */
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { expect, test, type Page, type Route } from '@playwright/test';
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

// A clinician's note long enough to push anything below it off a phone's first screen.
const LONG_NOTE = Array.from(
	{ length: 6 },
	(_, i) => `Point ${i + 1}: take the movements gently and keep to the dosage we agreed.`
).join('\n');

/**
 * A fixed-offset zone whose clock now reads 22:xx: the patient's day then shows its longest
 * "Next" wording (every suggested time has passed and it is late), the first screen's worst case.
 */
function lateEveningZone(): string {
	let offset = (((22 - new Date().getUTCHours()) % 24) + 24) % 24;
	if (offset > 14) offset -= 24;
	// IANA's Etc zones count the other way: Etc/GMT-3 is three hours ahead of UTC.
	return offset === 0 ? 'Etc/GMT' : `Etc/GMT${offset > 0 ? '-' : '+'}${Math.abs(offset)}`;
}

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
	const patient = await seedSignInPatient(ACCOUNTS.clinician, {
		name: `Rosa Penn ${run_}`,
		timeZone: lateEveningZone()
	});
	patientEmail = patient.email;
	({
		itemIds: [itemId]
	} = seedProgramme(
		patient.patientId,
		[
			{
				title: 'Wall slide',
				segmentId,
				safetyNotes: 'Stop if the shoulder pain is sharp.',
				sets: 1,
				reps: 8
			},
			{ title: 'Ankle circles', sets: 1, reps: 10 }
		],
		{
			// Started a week ago, so today is an ordinary day of it on the patient's clock.
			startDate: new Date(Date.now() - 7 * 86_400_000).toISOString().slice(0, 10),
			note: LONG_NOTE
		}
	));
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
	await expect(page.getByTestId('next-session')).toContainText('start fresh tomorrow');
	await expect(page.getByText(LONG_NOTE.split('\n')[5])).toBeVisible();
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

test('on a replay the page’s scripts and typeface wait for the clip', async ({ page }) => {
	await signInWithPassword(page, patientEmail);
	// The notes read (in the test before, or now), so the page opens on the video.
	await open(page, `/replay/${itemId}`);
	const gate = page.getByRole('button', { name: /I have read these notes/ });
	if (await gate.isVisible()) {
		await gate.click();
		await expect(page.getByTestId('replay-video')).toBeVisible();
	}

	// The clip's requests are held: the page must not ask for its scripts meanwhile.
	const held: Route[] = [];
	let released = false;
	await page.route('**/api/segments/*/clip.mp4*', (route) => {
		if (released) void route.continue();
		else held.push(route);
	});
	await page.goto(`/replay/${itemId}`);
	await expect.poll(() => held.length).toBeGreaterThan(0);
	// A window in which an unheld start-up would long have asked (it asks as the page is read).
	await page.waitForTimeout(1500);
	const scriptsAsked = () =>
		page.evaluate(
			() =>
				performance
					.getEntriesByType('resource')
					.filter((entry) => entry.name.includes('/_app/immutable/entry/')).length
		);
	expect(await scriptsAsked()).toBe(0);
	await expect(page.locator('html')).toHaveAttribute('data-fonts-held');
	await expect(page.locator('html')).not.toHaveAttribute('data-started');

	// The clip comes: the page starts, in its own typeface.
	released = true;
	for (const route of held) await route.continue();
	await expect(page.locator('html')).toHaveAttribute('data-started');
	expect(await scriptsAsked()).toBeGreaterThan(0);
	await expect(page.locator('html')).not.toHaveAttribute('data-fonts-held');
	await expect(page.getByRole('button', { name: 'Play' })).toBeVisible();
});
