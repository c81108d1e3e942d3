import { expect, test, type Page } from '@playwright/test';
import { execFile } from 'node:child_process';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { PutObjectCommand } from '@aws-sdk/client-s3';
import { FFMPEG, makeClip } from '../integration/recordings-support';
import {
	ACCOUNTS,
	database,
	expectNoAxeViolations,
	seedCaptionTrack,
	seedReadyRecording,
	signedInRequest,
	signInWithPassword,
	storageClient,
	open,
	reload
} from './support';
import { E2E } from './ports';

const run = promisify(execFile);
const SECONDS = 20;
const shots = join(import.meta.dirname, '../.run/e2e-results');

let dir: string;
let recordingId: string;

/** Puts a thumbnail strip and waveform peaks beside the seeded rendition, as processing would. */
async function addTimelineMedia(clip: string) {
	const sprite = join(dir, 'sprite.jpg');
	await run(FFMPEG, [
		'-hide_banner',
		'-loglevel',
		'error',
		'-y',
		'-i',
		clip,
		'-vf',
		'fps=1,scale=80:60,tile=10x2',
		'-frames:v',
		'1',
		sprite
	]);
	const db = database();
	let clinicId: string;
	try {
		clinicId = (
			db.prepare('select clinic_id as c from recording where id = ?').get(recordingId) as {
				c: string;
			}
		).c;
		const prefix = `clinics/${clinicId}/recordings/${recordingId}/`;
		db.prepare(
			'update recording set frame_rate = 25, sprite = ?, waveform_key = ? where id = ?'
		).run(
			JSON.stringify({
				columns: 10,
				rows: 2,
				intervalSeconds: 1,
				tileWidth: 80,
				tileHeight: 60,
				count: 20
			}),
			`${prefix}waveform.json`,
			recordingId
		);
		const s3 = storageClient();
		// The clip's tone is steady; a gentle swell makes the drawing easy to recognise.
		const peaks = Array.from({ length: SECONDS * 20 }, (_, i) => 0.3 + 0.2 * Math.sin(i / 6));
		for (const [key, body, type] of [
			['sprite.jpg', await readFile(sprite), 'image/jpeg'],
			['waveform.json', JSON.stringify({ peaksPerSecond: 20, peaks }), 'application/json']
		] as const) {
			await s3.send(
				new PutObjectCommand({
					Bucket: 'kinelume',
					Key: prefix + key,
					Body: body,
					ContentType: type
				})
			);
		}
		s3.destroy();
	} finally {
		db.close();
	}
}

test.beforeAll(async () => {
	dir = await mkdtemp(join(tmpdir(), 'kinelume-e2e-studio-'));
	const clip = join(dir, 'heel-slides.mp4');
	await makeClip(clip, { seconds: SECONDS });
	recordingId = await seedReadyRecording(ACCOUNTS.clinician, {
		rendition: await readFile(clip),
		durationSeconds: SECONDS,
		title: 'Heel slides, lying on the back'
	});
	await addTimelineMedia(clip);
});

test.afterAll(async () => {
	await rm(dir, { recursive: true, force: true });
});

async function openStudio(page: Page, trackId: string) {
	await open(page, `/recordings/${recordingId}/studio?track=${trackId}`);
	await expect(page.getByTestId('studio')).toHaveAttribute('data-ready', 'true');
}

const saveState = (page: Page) => page.getByTestId('save-state');

async function serverVersion(trackId: string) {
	const clinician = await signedInRequest(ACCOUNTS.clinician);
	const body = await (await clinician.get(`/api/tracks/${trackId}/versions`)).json();
	await clinician.dispose();
	return body.current as { version: number; cues: { start: number; end: number; text: string }[] };
}

/** The text of the cues the video shows at `seconds`, read from its text track after seeking. */
function shownAt(page: Page, seconds: number) {
	return page.getByTestId('studio-video').evaluate(
		(element, at) =>
			new Promise<string[]>((resolve) => {
				const video = element as HTMLVideoElement;
				const track = video.textTracks[0];
				const read = () => Array.from(track.activeCues ?? []).map((cue) => (cue as VTTCue).text);
				video.addEventListener(
					'seeked',
					() => requestAnimationFrame(() => requestAnimationFrame(() => resolve(read()))),
					{ once: true }
				);
				video.currentTime = at;
			}),
		seconds
	);
}

test('a clinician writes three cues with the keyboard while the video plays, and they are saved and shown', async ({
	page
}) => {
	test.setTimeout(90_000);
	const trackId = seedCaptionTrack(recordingId, [], { language: 'en-GB' });
	await signInWithPassword(page, ACCOUNTS.clinician);
	await open(page, `/recordings/${recordingId}`);
	await page.getByRole('link', { name: 'Caption editor' }).click();
	await expect(page.getByRole('heading', { name: 'Caption editor', level: 1 })).toBeVisible();
	await expect(page.getByTestId('studio')).toHaveAttribute('data-ready', 'true');
	await expect(page).toHaveURL(new RegExp(`/recordings/${recordingId}/studio$`));
	await expect(saveState(page)).toHaveText('Saved as version 1');
	await expect(page.getByRole('table').filter({ hasText: 'Mark end' })).toBeVisible();

	const video = page.getByTestId('studio-video');
	await video.evaluate(
		(v) =>
			new Promise<void>((resolve) => {
				const element = v as HTMLVideoElement;
				if (element.readyState >= 2) resolve();
				else element.addEventListener('loadeddata', () => resolve(), { once: true });
			})
	);
	await page.getByRole('heading', { name: 'Caption editor', level: 1 }).click();
	await page.keyboard.press(' ');
	await expect
		.poll(() => video.evaluate((v) => (v as HTMLVideoElement).currentTime))
		.toBeGreaterThan(0.3);

	const words = ['Lie on your back.', 'Slide your heel up.', 'Slowly back down.'];
	for (const text of words) {
		await page.keyboard.press('[');
		await page.waitForTimeout(900);
		await page.keyboard.press(']');
		await page.keyboard.press('Enter');
		await expect(page.locator('textarea:focus')).toHaveCount(1);
		await page.keyboard.type(text);
		await page.keyboard.press('Enter');
		await expect(page.locator('textarea:focus')).toHaveCount(0);
		await page.waitForTimeout(300);
	}
	expect(await video.evaluate((v) => (v as HTMLVideoElement).paused)).toBe(false);
	await page.keyboard.press('k');
	await expect.poll(() => video.evaluate((v) => (v as HTMLVideoElement).paused)).toBe(true);

	for (const [i, text] of words.entries()) {
		await expect(page.getByLabel(`Words of cue ${i + 1}`)).toHaveValue(text);
	}
	await expect(saveState(page)).toHaveText('Saved as version 2', { timeout: 15_000 });
	const saved = await serverVersion(trackId);
	expect(saved.version).toBe(2);
	expect(saved.cues.map((c) => c.text)).toEqual(words);
	saved.cues.forEach((cue, i) => {
		expect(cue.end - cue.start).toBeGreaterThan(0.5);
		if (i > 0) expect(cue.start).toBeGreaterThanOrEqual(saved.cues[i - 1].end);
	});

	// What the video shows is what was typed, at the times that were marked.
	const middle = (i: number) => (saved.cues[i].start + saved.cues[i].end) / 2;
	expect(await shownAt(page, middle(1))).toEqual([words[1]]);
	expect(await shownAt(page, middle(2))).toEqual([words[2]]);
	expect(await shownAt(page, saved.cues[2].end + 0.5)).toEqual([]);

	// Undo takes the last words away, on the video too; redo brings them back.
	await page.getByRole('heading', { name: 'Caption editor', level: 1 }).click();
	await page.keyboard.press('Control+z');
	await expect(page.getByLabel('Words of cue 3')).toHaveValue('');
	await page.keyboard.press('Control+Shift+z');
	await expect(page.getByLabel('Words of cue 3')).toHaveValue(words[2]);
	expect(await shownAt(page, middle(2))).toEqual([words[2]]);

	await expectNoAxeViolations(page);
	await page.screenshot({ path: join(shots, 'studio-written.png'), fullPage: true });
});

test('a finding’s fix lengthens a cue read too fast, and the finding goes', async ({ page }) => {
	const trackId = seedCaptionTrack(
		recordingId,
		[
			{
				id: 'heel',
				start: 1,
				end: 2,
				text: 'Keep your heel on the bed\nand slide it up towards you.'
			},
			{ id: 'rest', start: 9, end: 11, text: 'Now rest.' }
		],
		{ kind: 'subtitles', language: 'en' }
	);
	await signInWithPassword(page, ACCOUNTS.clinician);
	await openStudio(page, trackId);
	// The clinic's choice may have been changed by another test; these numbers are the BBC's.
	await page.getByLabel('Check against').selectOption('bbc');
	const cue = page.getByRole('list', { name: 'Checks of cue 1' });
	await expect(cue).toContainText('Error: Reading rate 720 words per minute');
	await expect(page.getByTestId('findings')).toContainText('Cue 1 · Error: Reading rate');
	await expectNoAxeViolations(page);
	await page.screenshot({ path: join(shots, 'studio-findings.png'), fullPage: true });

	// Choosing a finding in the checks panel selects its cue.
	await page.getByTestId('findings').getByRole('button').first().click();
	await expect(page.getByText('Cue 1 selected')).toBeVisible();

	await cue.getByRole('button', { name: /Fix: Lengthen into the gap/ }).click();
	await expect(page.getByRole('list', { name: 'Checks of cue 1' })).toHaveCount(0);
	await expect(page.getByTestId('checks-summary')).toContainText('No findings');
	// 12 words at the BBC's 180 words per minute need 4 s (BBC Subtitle Guidelines, reading rate).
	await expect(page.getByLabel('End', { exact: true }).first()).toHaveValue('00:05.000');
	await page.keyboard.press('Control+s');
	await expect(saveState(page)).toHaveText('Saved as version 2');
	expect((await serverVersion(trackId)).cues[0]).toMatchObject({ start: 1, end: 5 });

	// Other guidelines are a choice of this page only, and find what their own numbers find.
	const select = page.getByLabel('Check against');
	const notTheClinics = await select
		.locator('option')
		.filter({ hasNotText: 'clinic’s choice' })
		.getAttribute('value');
	await select.selectOption(notTheClinics!);
	await expect(page.getByText('Only this page changes')).toBeVisible();
	await select.selectOption('dcmp');
	await expect(page.getByTestId('checks-summary')).toContainText('DCMP Captioning Key');
});

test('a fix far down a long list works on the first click', async ({ page }) => {
	// Twelve calm cues, then one read far too fast at the bottom of the list, with time after it.
	const calm = Array.from({ length: 12 }, (_, i) => ({
		id: `calm-${i + 1}`,
		start: i * 1.2,
		end: (i + 1) * 1.2,
		text: 'Breathe out.'
	}));
	const fast = {
		id: 'fast',
		start: 15,
		end: 16,
		text: 'Keep your heel on the bed\nand slide it up towards you.'
	};
	const trackId = seedCaptionTrack(recordingId, [...calm, fast], {
		kind: 'subtitles',
		language: 'en-IE'
	});
	await signInWithPassword(page, ACCOUNTS.clinician);
	await openStudio(page, trackId);
	await page.getByLabel('Check against').selectOption('bbc');
	const last = page.getByRole('list', { name: 'Checks of cue 13' });
	await expect(last).toContainText('Error: Reading rate');
	// One click, as a person would make it: the fix must land on the first try.
	await last.getByRole('button', { name: /Fix: Lengthen into the gap/ }).click();
	await expect(page.getByRole('list', { name: 'Checks of cue 13' })).toHaveCount(0);

	// The same Fix in the checks panel, after the list has scrolled to the bottom, also needs one click.
	await page.getByRole('button', { name: 'Undo' }).click();
	await expect(last).toContainText('Error: Reading rate');
	await page
		.getByTestId('findings')
		.getByRole('button', { name: 'Fix: Lengthen into the gap (cue 13)' })
		.click();
	await expect(page.getByRole('list', { name: 'Checks of cue 13' })).toHaveCount(0);
});

test('findings are grouped by kind with their guideline once, and Fix all mends a kind in one saved step', async ({
	page
}) => {
	test.setTimeout(90_000);
	await page.setViewportSize({ width: 1366, height: 768 });
	// Three lines too long that fit in two lines, and three gaps under the BBC's 1 s, the last of
	// which cannot close: its cue would then be on screen for 7.1 s, over the 7 s of common practice.
	const seeded = [
		{ id: 'lie', start: 0, end: 3, text: 'Lie on your back with both legs straight out.' },
		{ id: 'bend', start: 3.4, end: 7.4, text: 'Bend one knee and keep that foot flat on the bed.' },
		{
			id: 'slide',
			start: 7.8,
			end: 14.2,
			text: 'Slide your heel up towards you, then slowly back down.'
		},
		{ id: 'hold', start: 14.9, end: 18.5, text: 'Hold it there and breathe.' }
	];
	const trackId = seedCaptionTrack(recordingId, seeded, { language: 'en-AU' });
	await signInWithPassword(page, ACCOUNTS.clinician);
	await openStudio(page, trackId);
	await page.getByLabel('Check against').selectOption('bbc');

	const findings = page.getByTestId('findings');
	const group = (title: string) =>
		page.getByTestId('finding-group').filter({ has: page.getByRole('heading', { name: title }) });
	const lines = group('Lines too long');
	const gaps = group('Gaps too short');
	await expect(page.getByTestId('checks-summary')).toContainText('6 warnings');
	await expect(
		findings.getByRole('list', { name: 'Kinds of finding' }).getByRole('listitem')
	).toHaveText([/Lines too long\s*3/, /Gaps too short\s*3/]);
	await expect(lines.getByRole('heading', { level: 3 })).toHaveText(/^Lines too long\s*3 cues$/);
	await expect(gaps.getByRole('heading', { level: 3 })).toHaveText(/^Gaps too short\s*3 cues$/);
	// The guideline is named once for its kind, not on each of its three findings.
	await expect(
		findings.getByText('BBC Subtitle Guidelines (2026 edition): at most 37 characters per line')
	).toHaveCount(1);
	await expect(findings.getByText('gaps between subtitles, if any, at least 1 s')).toHaveCount(1);
	await expect(lines.getByRole('listitem')).toHaveCount(3);
	await expect(
		lines.getByRole('button', { name: /^Fix: Re-flow the lines \(cue \d\)$/ })
	).toHaveCount(3);
	await expectNoAxeViolations(page);
	// The checks panel at the top of a 1366 px window, a little room above its heading.
	await page.getByRole('region', { name: 'Checks', exact: true }).evaluate((panel) => {
		panel.scrollIntoView({ block: 'start' });
		window.scrollBy(0, -16);
	});
	await page.screenshot({ path: join(shots, 'studio-grouped.png') });
	// One click fixes the kind; its group goes and the words are the same words.
	await lines.getByRole('button', { name: 'Fix all 3: lines too long' }).click();
	await expect(lines).toHaveCount(0);
	await expect(page.getByTestId('fix-report')).toHaveText(
		'Lines too long: fixed 3 cues in one step (Undo puts them back).'
	);
	await expect(page.getByTestId('fix-report')).toBeFocused();
	const words = (text: string) => text.split(/\s+/).filter(Boolean);
	for (const [i, cue] of seeded.entries()) {
		const value = await page.getByLabel(`Words of cue ${i + 1}`).inputValue();
		expect(words(value)).toEqual(words(cue.text));
		for (const line of value.split('\n')) expect(line.length).toBeLessThanOrEqual(37);
	}
	await expect(page.getByLabel('Words of cue 1')).toHaveValue(
		'Lie on your back with\nboth legs straight out.'
	);

	// A kind that cannot all be fixed says which stayed and why.
	await gaps.getByRole('button', { name: 'Fix all 3: gaps too short' }).click();
	await expect(gaps.getByTestId('fix-report')).toHaveText(
		'Gaps too short: fixed 2 cues in one step (Undo puts them back). One is left; why is written under it.'
	);
	await expect(gaps.getByRole('heading', { level: 3 })).toHaveText(/^Gaps too short\s*1 cue$/);
	await expect(gaps.getByRole('listitem')).toHaveText([
		/Cue 3 · Warning: A 0.7 s gap before the next cue flickers.*Not fixed: Closing the gap would leave a cue on screen too long\./
	]);
	await expectNoAxeViolations(page);

	// Each Fix all was one undo step.
	await page.getByRole('button', { name: 'Undo' }).click();
	await expect(gaps.getByRole('heading', { level: 3 })).toHaveText(/3 cues$/);
	await expect(page.getByLabel('Words of cue 1')).toHaveValue(
		'Lie on your back with\nboth legs straight out.'
	);
	await page.getByRole('button', { name: 'Redo' }).click();
	await expect(gaps.getByRole('heading', { level: 3 })).toHaveText(/1 cue$/);

	// Saved like any edit: after a reload the fixes are there.
	await page.keyboard.press('Control+s');
	await expect(saveState(page)).toHaveText(/^Saved as version \d+$/, { timeout: 15_000 });
	const saved = await serverVersion(trackId);
	expect(saved.cues.map((c) => c.end)).toEqual([3.4, 7.8, 14.2, 18.5]);
	expect(saved.cues.map((c) => words(c.text))).toEqual(seeded.map((c) => words(c.text)));
	await reload(page);
	await expect(page.getByTestId('studio')).toHaveAttribute('data-ready', 'true');
	await page.getByLabel('Check against').selectOption('bbc');
	await expect(page.getByLabel('Words of cue 2')).toHaveValue(
		'Bend one knee and keep\nthat foot flat on the bed.'
	);
	await expect(group('Lines too long')).toHaveCount(0);
	await expect(group('Gaps too short').getByRole('listitem')).toHaveCount(1);
});

test('a save that meets a newer version shows both side by side and overwrites nothing', async ({
	page
}) => {
	const trackId = seedCaptionTrack(
		recordingId,
		[
			{ id: 'a', start: 1, end: 3.5, text: 'Bend your knee.' },
			{ id: 'b', start: 5, end: 8, text: 'Hold for five.' }
		],
		{ kind: 'subtitles', language: 'cy' }
	);
	await signInWithPassword(page, ACCOUNTS.clinician);
	const other = await signedInRequest(ACCOUNTS.clinician);
	await openStudio(page, trackId);
	await page.getByLabel('Words of cue 2').fill('Hold for ten.');

	// Someone else saves version 2 before this page does (its autosave waits a few seconds).
	const theirs = await other.post(`/api/tracks/${trackId}/versions`, {
		data: {
			baseVersion: 1,
			cues: [
				{ id: 'a', start: 1, end: 3.5, text: 'Bend your knee slowly.' },
				{ id: 'b', start: 5, end: 8, text: 'Hold for five.' }
			]
		},
		headers: { Origin: E2E.origin }
	});
	expect(theirs.status()).toBe(201);
	await other.dispose();

	await page.keyboard.press('Control+s');
	const conflict = page.getByTestId('conflict');
	await expect(conflict).toBeVisible();
	await expect(saveState(page)).toHaveText(/^Not saved — version 2 was saved elsewhere/);
	await expect(conflict.getByRole('heading')).toHaveText(
		'Version 2 was saved while you were editing'
	);
	await expect(conflict.getByRole('columnheader')).toHaveText([
		'Version 2 (saved)',
		'Yours (on this device)'
	]);
	const rows = conflict.getByRole('row');
	await expect(rows.filter({ hasText: 'Bend your knee slowly.' })).toContainText('Bend your knee.');
	await expect(rows.filter({ hasText: 'Hold for ten.' })).toContainText('Hold for five.');
	expect((await serverVersion(trackId)).version).toBe(2);
	await expectNoAxeViolations(page);
	await conflict.screenshot({ path: join(shots, 'studio-conflict.png') });

	await conflict.getByRole('button', { name: 'Keep mine (save them as version 3)' }).click();
	await expect(saveState(page)).toHaveText('Saved as version 3');
	await expect(conflict).toHaveCount(0);
	expect((await serverVersion(trackId)).cues.map((c) => c.text)).toEqual([
		'Bend your knee.',
		'Hold for ten.'
	]);
});

test('changes whose save failed are kept on the device and restored after a reload', async ({
	page
}) => {
	const trackId = seedCaptionTrack(
		recordingId,
		[{ id: '', start: 2, end: 5, text: 'Breathe in.' }],
		{ kind: 'descriptions', language: 'en-GB' }
	);
	await signInWithPassword(page, ACCOUNTS.clinician);
	await openStudio(page, trackId);
	await page.route('**/versions', (route) =>
		route.request().method() === 'POST' ? route.abort() : route.continue()
	);
	await page.getByLabel('Words of cue 1').fill('Breathe in, and relax your shoulders.');
	await page.keyboard.press('Control+s');
	await expect(saveState(page)).toHaveText('Not saved — kept on this device');
	await expect(page.getByText('The connection to Kinelume dropped.')).toBeVisible();
	expect((await serverVersion(trackId)).version).toBe(1);

	await page.unroute('**/versions');
	await reload(page);
	await expect(page.getByTestId('studio')).toHaveAttribute('data-ready', 'true');
	const offer = page.getByRole('region', { name: 'Changes kept on this device' });
	await expect(offer).toContainText('never reached Kinelume (1 cue, started from version 1)');
	await expectNoAxeViolations(page);
	await page.screenshot({ path: join(shots, 'studio-offer.png') });
	await offer.getByRole('button', { name: 'Restore my changes' }).click();
	await expect(page.getByLabel('Words of cue 1')).toHaveValue(
		'Breathe in, and relax your shoulders.'
	);
	await expect(saveState(page)).toHaveText('Saved as version 2', { timeout: 15_000 });
	expect((await serverVersion(trackId)).cues[0].text).toBe('Breathe in, and relax your shoulders.');

	// Saved: nothing is offered any more.
	await reload(page);
	await expect(page.getByTestId('studio')).toHaveAttribute('data-ready', 'true');
	await expect(page.getByRole('region', { name: 'Changes kept on this device' })).toHaveCount(0);
});

test('a cue dragged along the timeline snaps to its neighbour, and one undo puts it back', async ({
	page
}) => {
	const trackId = seedCaptionTrack(
		recordingId,
		[
			{ id: 'lift', start: 1, end: 3, text: 'Lift.' },
			{ id: 'lower', start: 8, end: 10, text: 'Lower.' }
		],
		{ kind: 'chapters', language: 'en' }
	);
	await signInWithPassword(page, ACCOUNTS.clinician);
	await openStudio(page, trackId);
	await page.getByRole('button', { name: 'Zoom in' }).click();
	const timeline = page.locator('.timeline');
	await timeline.scrollIntoViewIfNeeded();
	const blocks = timeline.locator('[data-cue]');
	const first = (await blocks.nth(0).boundingBox())!;
	const second = (await blocks.nth(1).boundingBox())!;

	// Let go 3 px after the first cue's end: close enough to snap onto it.
	const y = second.y + second.height / 2;
	await page.mouse.move(second.x + second.width / 2, y);
	await page.mouse.down();
	await page.mouse.move(second.x + second.width / 2 - 40, y, { steps: 4 });
	await page.mouse.move(first.x + first.width + 3 + second.width / 2, y, { steps: 4 });
	await page.mouse.up();
	const starts = page.getByLabel('Start', { exact: true });
	const ends = page.getByLabel('End', { exact: true });
	await expect(starts.nth(1)).toHaveValue('00:03.000');
	await expect(ends.nth(1)).toHaveValue('00:05.000');

	// The end of the first cue, pulled past the second's start, stops there.
	const moved = (await blocks.nth(0).boundingBox())!;
	await page.mouse.move(moved.x + moved.width - 2, moved.y + 10);
	await page.mouse.down();
	await page.mouse.move(moved.x + moved.width + 60, moved.y + 10, { steps: 4 });
	await page.mouse.up();
	await expect(ends.nth(0)).toHaveValue('00:03.000');

	// That changed nothing, so the one undo step is the move.
	await page.getByRole('button', { name: 'Undo' }).click();
	await expect(starts.nth(1)).toHaveValue('00:08.000');
	await expect(saveState(page)).toHaveText('Saved as version 1');
	await timeline.screenshot({ path: join(shots, 'studio-timeline.png') });
});
