import { expect, test } from '@playwright/test';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { renderDemoClip } from '../../src/scripts/demo/clips/encoding';
import { DEMO_CLIPS, type DemoClip } from '../../src/scripts/demo/clips/scripts';
import { planDemoClip } from '../../src/scripts/demo/clips/timeline';
import {
	ACCOUNTS,
	expectNoAxeViolations,
	seedCaptionTrack,
	seedReadyRecording,
	signedInRequest,
	signInWithPassword,
	open
} from './support';
import { seedPatientWithProgramme } from './segments-support';

// A two-exercise version of the first demo script, drawn small: its plan says where each exercise
// starts and which cue is spoken when, which is what the page and the cut clips are checked against.
const SOURCE = DEMO_CLIPS[0];
const CLIP: DemoClip = { ...SOURCE, id: 'e2e-segments', exercises: SOURCE.exercises.slice(0, 2) };
const plan = planDemoClip(CLIP);
const exercises = plan.sections.filter((s) => s.kind === 'exercise');
const cues = plan.cues.map((c, i) => ({ id: `cue-${i + 1}`, ...c }));

let dir: string;
let recordingId: string;

test.beforeAll(async () => {
	test.setTimeout(120_000);
	dir = await mkdtemp(join(tmpdir(), 'kinelume-e2e-segments-'));
	const path = join(dir, 'clip.mp4');
	await renderDemoClip(CLIP, path, { width: 320, height: 180, fps: 12 });
	recordingId = await seedReadyRecording(ACCOUNTS.clinician, {
		rendition: await readFile(path),
		durationSeconds: plan.durationSeconds,
		title: 'Knee exercises to split'
	});
	seedCaptionTrack(recordingId, cues);
});

test.afterAll(async () => {
	await rm(dir, { recursive: true, force: true });
});

test('a clinician accepts the suggested segments, confirms, and plays a cut segment with its captions', async ({
	page
}) => {
	test.setTimeout(180_000);
	await signInWithPassword(page, ACCOUNTS.clinician);
	await open(page, `/recordings/${recordingId}`);
	await page.getByRole('link', { name: 'Exercise segments' }).click();
	await expect(page.getByRole('heading', { name: 'Segments', level: 1 })).toBeVisible();

	// The suggestions arrive once the detectors have read the rendition; each says why.
	const suggestions = page.getByTestId('suggestion');
	await expect(suggestions).toHaveCount(exercises.length, { timeout: 60_000 });
	for (const [i, exercise] of exercises.entries()) {
		await expect(suggestions.nth(i)).toContainText(exercise.title);
		await expect(suggestions.nth(i)).toContainText('scene change');
		await expect(suggestions.nth(i)).toContainText('silence');
		await expect(suggestions.nth(i)).toContainText(/phrase|counting word/);
	}
	await expectNoAxeViolations(page);

	await page.getByRole('button', { name: 'Accept all suggestions' }).click();
	await expect(suggestions.first()).toContainText('Accepted');
	const parts = page.getByTestId('plan').getByRole('listitem');
	await expect(parts).toHaveCount(exercises.length + 1);
	// The welcome before the first exercise is left out; the exercises are named from the captions.
	await expect(parts.nth(0)).toContainText('Left out');
	for (const [i, exercise] of exercises.entries()) {
		await expect(page.getByLabel(`Name of part ${i + 2}`)).toHaveValue(exercise.title);
	}

	// A boundary moves by keyboard, and back.
	const handle = page.getByRole('slider', { name: 'Boundary 1' });
	const before = Number(await handle.getAttribute('aria-valuenow'));
	await handle.focus();
	await page.keyboard.press('ArrowRight');
	await expect(handle).toHaveAttribute(
		'aria-valuenow',
		String(Math.round((before + 0.1) * 10) / 10)
	);
	await page.keyboard.press('ArrowLeft');
	await expect(handle).toHaveAttribute('aria-valuenow', String(before));
	await expect(page.getByTestId('selected-boundary')).toContainText('Boundary 1 selected');
	await expectNoAxeViolations(page);

	await page.getByRole('button', { name: 'Confirm segments' }).click();
	await expect(page.getByText(`Confirmed ${exercises.length} segments`)).toBeVisible();
	const confirmed = page.getByTestId('confirmed-segment');
	await expect(confirmed).toHaveCount(exercises.length);
	for (let i = 0; i < exercises.length; i++) {
		await expect(confirmed.nth(i)).toHaveAttribute('data-status', 'ready', { timeout: 90_000 });
		await expect(confirmed.nth(i)).toContainText('Ready');
	}
	await expectNoAxeViolations(page);

	// The second exercise's clip plays its own captions: the cue spoken 2 s into the segment.
	const second = exercises[1];
	const inside = cues.filter((c) => c.start >= second.start && c.end <= second.end);
	const player = confirmed.nth(1).getByTestId('segment-player');
	await player.evaluate(
		(video: HTMLVideoElement) =>
			new Promise<void>((resolve) => {
				if (video.readyState >= 1) resolve();
				else video.addEventListener('loadedmetadata', () => resolve(), { once: true });
			})
	);
	for (const cue of [inside[0], inside[3]]) {
		const at = (cue.start + cue.end) / 2 - second.start;
		await player.evaluate((video: HTMLVideoElement, t: number) => {
			video.textTracks[0].mode = 'showing';
			video.currentTime = t;
		}, at);
		await expect
			.poll(
				() =>
					player.evaluate((video: HTMLVideoElement) =>
						[...(video.textTracks[0].activeCues ?? [])].map((c) => (c as VTTCue).text)
					),
				{ timeout: 10_000, message: `the cue active at ${at.toFixed(2)} s` }
			)
			.toEqual([cue.text]);
	}
	const duration = await player.evaluate((video: HTMLVideoElement) => video.duration);
	expect(Math.abs(duration - (plan.durationSeconds - second.start))).toBeLessThan(0.2);

	// The recording's chapters track names the segments in order.
	const chapters = await page.request.get(`/api/recordings/${recordingId}/chapters.vtt`);
	expect(chapters.status()).toBe(200);
	const text = await chapters.text();
	expect(text.startsWith('WEBVTT')).toBe(true);
	expect(text.indexOf(exercises[0].title)).toBeLessThan(text.indexOf(exercises[1].title));
});

test('segment files: ranges, captions with ETags, a transcript; a patient only through a published programme', async () => {
	test.setTimeout(60_000);
	const clinician = await signedInRequest(ACCOUNTS.clinician);
	// Its own segments, confirmed through the API (this test does not rely on the one before).
	const confirmed = await clinician.post(`/api/recordings/${recordingId}/segments`, {
		data: { segments: exercises.map(({ title, start, end }) => ({ title, start, end })) }
	});
	expect(confirmed.status()).toBe(201);
	type Listed = { segments: { id: string; status: string; title: string }[] };
	let segments: Listed['segments'] = [];
	await expect
		.poll(
			async () => {
				const listed = await clinician.get(`/api/recordings/${recordingId}/segments`);
				({ segments } = (await listed.json()) as Listed);
				return segments.map((s) => s.status);
			},
			{ timeout: 90_000, message: 'the confirmed segments are cut' }
		)
		.toEqual(exercises.map(() => 'ready'));
	const segment = segments[0];
	const base = `/api/segments/${segment.id}`;

	// RFC 9110: a single range answers 206 with Content-Range; a range past the end 416.
	const ranged = await clinician.get(`${base}/clip.mp4`, { headers: { Range: 'bytes=0-99' } });
	expect(ranged.status()).toBe(206);
	expect(ranged.headers()['content-range']).toMatch(/^bytes 0-99\/\d+$/);
	expect((await ranged.body()).length).toBe(100);
	const past = await clinician.get(`${base}/clip.mp4`, { headers: { Range: 'bytes=999999999-' } });
	expect(past.status()).toBe(416);

	const vtt = await clinician.get(`${base}/captions.vtt`);
	expect(vtt.status()).toBe(200);
	expect(vtt.headers()['content-type']).toBe('text/vtt; charset=utf-8');
	expect(vtt.headers()['cache-control']).toBe('private, max-age=0, must-revalidate');
	const etag = vtt.headers().etag;
	expect(etag).toMatch(/^"[A-Za-z0-9_-]+"$/);
	expect(await vtt.text()).toMatch(/^WEBVTT\n\n/);
	const again = await clinician.get(`${base}/captions.vtt`, { headers: { 'If-None-Match': etag } });
	expect(again.status()).toBe(304);

	const transcript = await clinician.get(`${base}/transcript.json`);
	const body = (await transcript.json()) as {
		lines: { id: string; start: number; end: number; text: string; plain: string }[];
	};
	expect(body.lines.length).toBeGreaterThan(0);
	expect(body.lines[0].start).toBeGreaterThanOrEqual(0);
	expect(body.lines.every((l) => l.plain === l.text.replace(/<[^>]+>/g, ''))).toBe(true);

	const poster = await clinician.get(`${base}/poster-0.jpg`);
	expect(poster.status()).toBe(200);
	expect(poster.headers()['content-type']).toBe('image/jpeg');

	// A patient whose published programme uses the segment may watch it; another patient may not.
	const viewerEmail = await seedPatientWithProgramme(segment.id);
	const viewer = await signedInRequest(viewerEmail);
	const outsider = await signedInRequest(ACCOUNTS.patient);
	for (const path of ['clip.mp4', 'captions.vtt', 'transcript.json', 'poster-0.jpg']) {
		expect((await viewer.get(`${base}/${path}`)).status(), `viewer ${path}`).toBe(200);
		expect((await outsider.get(`${base}/${path}`)).status(), `outsider ${path}`).toBe(404);
	}
	expect((await viewer.get(`/api/recordings/${recordingId}/segments`)).status()).toBe(403);
	expect((await viewer.get(`/api/recordings/${recordingId}/chapters.vtt`)).status()).toBe(403);
	await Promise.all([clinician.dispose(), viewer.dispose(), outsider.dispose()]);
});
