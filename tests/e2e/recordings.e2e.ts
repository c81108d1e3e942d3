import { expect, test, type Route } from '@playwright/test';
import { mkdtemp, rm, stat, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { makeClip } from '../integration/recordings-support';
import {
	ACCOUNTS,
	contextFor,
	expectNoAxeViolations,
	MATRIX_ROLES,
	signInWithPassword,
	open,
	reload
} from './support';
import { E2E } from './ports';

let dir: string;

test.beforeAll(async () => {
	dir = await mkdtemp(join(tmpdir(), 'kinelume-e2e-recordings-'));
	await makeClip(join(dir, 'Sit to stand.mp4'), { seconds: 12, size: '640x360' });
	await makeClip(join(dir, 'Step ups.mp4'), { seconds: 2, size: '640x360', heavy: true });
	await writeFile(join(dir, 'notes.mp4'), 'Not a video, only words.\n'.repeat(100));
});

test.afterAll(async () => {
	await rm(dir, { recursive: true, force: true });
});

test('a clinician uploads a clip, sees it get ready, plays it and seeks (206 responses)', async ({
	page
}) => {
	test.setTimeout(180_000);
	await signInWithPassword(page, ACCOUNTS.clinician);
	const response = await open(page, '/recordings');
	// Parts go straight to storage, so the page's policy must let it connect there (and only there).
	expect(response?.headers()['content-security-policy']).toContain(
		`connect-src 'self' http://127.0.0.1:${E2E.storagePort}`
	);
	await expect(page.getByRole('heading', { name: 'Recordings', level: 1 })).toBeVisible();

	await page.locator('#recording-file').setInputFiles(join(dir, 'Sit to stand.mp4'));
	const upload = page.getByRole('listitem', { name: 'Upload of Sit to stand.mp4' });
	await expect(
		upload.getByRole('progressbar', { name: 'Upload of Sit to stand.mp4' })
	).toBeVisible();
	await expect(upload.getByTestId('upload-phase')).toHaveText('Uploaded', { timeout: 60_000 });
	await expect(upload).toContainText('100 %');
	await expectNoAxeViolations(page);

	const partials: number[] = [];
	page.on('response', (response) => {
		// The app redirects to storage, which answers the ranges (its address ends the same way).
		if (response.url().includes('/rendition.mp4') && response.status() === 206) partials.push(206);
	});
	await upload.getByRole('link', { name: 'Open the recording' }).click();
	await expect(page.getByRole('heading', { name: 'Sit to stand', level: 1 })).toBeVisible();
	const recordingPath = new URL(page.url()).pathname;
	await page.screenshot({
		path: join(import.meta.dirname, '../.run/e2e-results/recording-processing.png')
	});
	const player = page.getByTestId('player');
	await expect(player).toBeVisible({ timeout: 120_000 });
	await expect(page.getByText('Ready', { exact: true })).toBeVisible();
	await expect(page.locator('dl')).toContainText('640 × 360');

	await player.evaluate(async (element) => {
		const video = element as HTMLVideoElement;
		video.muted = true;
		await video.play();
	});
	await expect
		.poll(() => player.evaluate((v) => (v as HTMLVideoElement).currentTime), { timeout: 20_000 })
		.toBeGreaterThan(0.2);

	await player.evaluate(
		(element) =>
			new Promise<void>((resolve) => {
				const video = element as HTMLVideoElement;
				video.addEventListener('seeked', () => resolve(), { once: true });
				video.currentTime = 8;
			})
	);
	const afterSeek = await player.evaluate((v) => (v as HTMLVideoElement).currentTime);
	expect(afterSeek).toBeGreaterThanOrEqual(7.9);
	await expect
		.poll(() => player.evaluate((v) => (v as HTMLVideoElement).currentTime), { timeout: 20_000 })
		.toBeGreaterThan(afterSeek + 0.2);
	expect(partials.length).toBeGreaterThan(0);
	await expectNoAxeViolations(page);

	await page.screenshot({
		path: join(import.meta.dirname, '../.run/e2e-results/recording-page.png'),
		fullPage: true
	});
	await open(page, '/recordings');
	// This upload's own entry (an earlier run on the same data may have one of the same name).
	await expect(
		page.getByRole('link', { name: 'Sit to stand' }).and(page.locator(`[href="${recordingPath}"]`))
	).toBeVisible();
	await page.screenshot({
		path: join(import.meta.dirname, '../.run/e2e-results/recordings-page.png'),
		fullPage: true
	});
});

test('an upload interrupted by a reload resumes without re-sending stored parts', async ({
	page
}) => {
	test.setTimeout(120_000);
	await signInWithPassword(page, ACCOUNTS.clinician);
	await open(page, '/recordings');
	const file = join(dir, 'Step ups.mp4');
	const sent: number[] = [];
	page.on('requestfinished', (request) => {
		const part = new URL(request.url()).searchParams.get('partNumber');
		if (request.method() === 'PUT' && part) sent.push(Number(part));
	});
	// Hold every part but the first, so the reload comes with exactly one part stored.
	const held = /[?&]partNumber=[2-9]/;
	const heldRoutes: Route[] = [];
	await page.route(held, (route) => void heldRoutes.push(route));
	await page.locator('#recording-file').setInputFiles(file);
	await expect.poll(() => sent, { timeout: 30_000 }).toEqual([1]);

	await page.screenshot({
		path: join(import.meta.dirname, '../.run/e2e-results/upload-in-progress.png'),
		fullPage: true
	});
	// The connection drops: the held parts never arrive.
	for (const route of heldRoutes) await route.abort('connectionreset');
	await page.unroute(held);
	await reload(page);
	await expect(page.getByRole('heading', { name: 'Unfinished uploads' })).toBeVisible();
	await expect(
		page.getByRole('listitem', { name: 'Unfinished upload of Step ups.mp4' })
	).toContainText('stored');
	sent.length = 0;
	await page.locator('#recording-file').setInputFiles(file);
	const upload = page.getByRole('listitem', { name: 'Upload of Step ups.mp4' });
	await expect(upload).toContainText('1 part already stored, not sent again');
	await expect(upload.getByTestId('upload-phase')).toHaveText('Uploaded', { timeout: 60_000 });
	// 5 MiB parts (src/lib/recordings/upload-plan.ts): every part but the first, once.
	const parts = Math.ceil((await stat(file)).size / (5 * 1024 * 1024));
	expect(sent.sort((a, b) => a - b)).toEqual(Array.from({ length: parts - 1 }, (_, i) => i + 2));
});

test('a text file named .mp4 is refused with its reason, even when chosen before the page has started', async ({
	page
}) => {
	await signInWithPassword(page, ACCOUNTS.clinician);
	// Hold the page's scripts so the file is chosen while nothing listens for the choice yet.
	const heldScripts: Route[] = [];
	let released = false;
	const scripts = '**/_app/immutable/**/*.js';
	await page.route(scripts, (route) => {
		if (!released) heldScripts.push(route);
		else void route.continue();
	});
	await page.goto('/recordings', { waitUntil: 'domcontentloaded' });
	await page.locator('#recording-file').setInputFiles(join(dir, 'notes.mp4'));
	await expect.poll(() => heldScripts.length).toBeGreaterThan(0);
	released = true;
	for (const route of heldScripts) await route.continue();
	await page.unroute(scripts);
	const upload = page.getByRole('listitem', { name: 'Upload of notes.mp4' });
	await expect(upload.getByTestId('upload-phase')).toHaveText('Not accepted', { timeout: 30_000 });
	await expect(upload.getByRole('alert')).toContainText('notes.mp4');
});

test('only clinicians may start, sign or complete uploads', async () => {
	const expected = { public: 401, patient: 403, clinician: 201, educator: 403, admin: 403 };
	for (const role of MATRIX_ROLES) {
		const context = await contextFor(role);
		const created = await context.post('/api/uploads', {
			data: { filename: 'x.mp4', contentType: 'video/mp4', sizeBytes: 1000 }
		});
		expect(created.status(), `${role} POST /api/uploads`).toBe(expected[role]);
		const id = created.ok() ? ((await created.json()) as { id: string }).id : crypto.randomUUID();
		const notOwn = role === 'clinician' ? 200 : expected[role];
		const parts = await context.post(`/api/uploads/${id}/parts`, { data: { partNumbers: [1] } });
		expect(parts.status(), `${role} POST parts`).toBe(notOwn);
		if (role === 'clinician') {
			expect((await context.delete(`/api/uploads/${id}`)).status()).toBe(204);
		}
		const complete = await context.post(`/api/uploads/${crypto.randomUUID()}/complete`);
		expect(complete.status(), `${role} POST complete`).toBe(
			role === 'clinician' ? 404 : expected[role]
		);
		await context.dispose();
	}
});
