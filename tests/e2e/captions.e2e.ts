import { expect, test } from '@playwright/test';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { makeClip } from '../integration/recordings-support';
import {
	ACCOUNTS,
	contextFor,
	expectNoAxeViolations,
	MATRIX_ROLES,
	seedCaptionTrack,
	seedReadyRecording,
	signedInRequest,
	signInWithPassword,
	open,
	reload
} from './support';
import { E2E } from './ports';

const GOOD = `WEBVTT

intro
00:00:00.500 --> 00:00:02.500
Sit on the front of the chair.

stand
00:00:03.000 --> 00:00:05.500
<i>Stand up</i> without using your hands.

00:00:06.000 --> 00:00:07.500
Sit down slowly.
`;

// Two mistakes: a comma decimal on line 3 and a missing arrow on line 6.
const BROKEN = `WEBVTT

00:00:00.500 --> 00:00:02,500
Sit on the front of the chair.

00:00:03.000 00:00:05.500
Stand up.
`;

let dir: string;
let recordingId: string;

test.beforeAll(async () => {
	dir = await mkdtemp(join(tmpdir(), 'kinelume-e2e-captions-'));
	const clip = join(dir, 'chair-rise.mp4');
	await makeClip(clip, { seconds: 8 });
	recordingId = await seedReadyRecording(ACCOUNTS.clinician, {
		rendition: await readFile(clip),
		durationSeconds: 8,
		title: 'Chair rise with captions'
	});
});

test.afterAll(async () => {
	await rm(dir, { recursive: true, force: true });
});

const file = (name: string, text: string) => ({
	name,
	mimeType: 'text/vtt',
	buffer: Buffer.from(text)
});

test('a clinician imports a WebVTT file, and the recording plays it as its captions', async ({
	page
}) => {
	test.setTimeout(90_000);
	await signInWithPassword(page, ACCOUNTS.clinician);
	await open(page, `/recordings/${recordingId}`);
	await page.getByRole('link', { name: 'Captions and versions' }).click();
	await expect(page.getByRole('heading', { name: 'Captions', level: 1 })).toBeVisible();
	await expectNoAxeViolations(page);

	await page.getByLabel('Kind').selectOption('captions');
	await page.getByLabel('Language', { exact: true }).fill('en-gb');
	await page.getByRole('button', { name: 'Make track' }).click();
	const tracks = page.getByTestId('tracks');
	await expect(tracks).toContainText('British English');
	await expect(tracks).toContainText('en-GB');

	await page.getByLabel('Caption file').setInputFiles(file('mistakes.vtt', BROKEN));
	await page.getByRole('button', { name: 'Import' }).click();
	const problems = page.getByRole('list', { name: 'Problems in the file' });
	await expect(problems).toBeVisible();
	await expect(problems.getByRole('listitem').first()).toContainText(/^Line 3, column \d+:/);
	await expect(problems).toContainText(/Line 6, column \d+:/);
	await expect(tracks).toContainText('none yet');
	await expectNoAxeViolations(page);

	await page.getByLabel('Caption file').setInputFiles(file('sit-to-stand.vtt', GOOD));
	await page.getByRole('button', { name: 'Import' }).click();
	await expect(page.getByText('sit-to-stand.vtt is now version 1 (3 cues).')).toBeVisible();
	await expect(tracks.getByRole('row').nth(1)).toContainText('3');

	// A second broken import leaves version 1 in place.
	await page.getByLabel('Caption file').setInputFiles(file('mistakes.vtt', BROKEN));
	await page.getByRole('button', { name: 'Import' }).click();
	await expect(page.getByRole('list', { name: 'Problems in the file' })).toBeVisible();
	await reload(page);
	await expect(page.getByTestId('versions').getByRole('row')).toHaveCount(2);

	await page.getByRole('link', { name: 'What changed in version 1' }).click();
	await expect(page.getByTestId('changes')).toContainText('3 cues added, 0 removed');
	await expectNoAxeViolations(page);
	await page.screenshot({
		path: join(import.meta.dirname, '../.run/e2e-results/captions-page.png'),
		fullPage: true
	});

	// A second file with one cue reworded, then back to the first version by restoring it.
	const reworded = GOOD.replace('Sit down slowly.', 'Sit back down, slowly.');
	await page.getByLabel('Caption file').setInputFiles(file('reworded.vtt', reworded));
	await page.getByRole('button', { name: 'Import' }).click();
	await expect(page.getByText('reworded.vtt is now version 2 (3 cues).')).toBeVisible();
	await page.getByRole('link', { name: 'What changed in version 2' }).click();
	const changes = page.getByTestId('changes');
	await expect(changes).toContainText('0 cues added, 0 removed, 1 changed, 2 the same');
	await expect(changes).toContainText('Before (00:06.000 to 00:07.500): Sit down slowly.');
	await expect(changes).toContainText('After: Sit back down, slowly.');
	await page.getByRole('button', { name: 'Restore version 1' }).click();
	await expect(page.getByText('Version 1 was copied as version 3.')).toBeVisible();
	await expect(page.getByTestId('versions').getByRole('row')).toHaveCount(4);
	await expect(page.getByTestId('versions')).toContainText('Restored version 1');

	await open(page, `/recordings/${recordingId}`);
	const player = page.getByTestId('player');
	await expect(player).toBeVisible();
	await expect(player.locator('track')).toHaveAttribute('kind', 'captions');
	await player.evaluate((element) => {
		const video = element as HTMLVideoElement;
		video.textTracks[0].mode = 'hidden';
	});
	await expect
		.poll(() => player.evaluate((v) => (v as HTMLVideoElement).textTracks[0].cues?.length ?? 0))
		.toBe(3);
	const activeAt = (seconds: number) =>
		player.evaluate(
			(element, at) =>
				new Promise<string[]>((resolve) => {
					const video = element as HTMLVideoElement;
					const track = video.textTracks[0];
					const read = () => Array.from(track.activeCues ?? []).map((cue) => (cue as VTTCue).text);
					video.addEventListener(
						'seeked',
						// Active cues are updated on the time-marches-on step right after seeking.
						() => requestAnimationFrame(() => requestAnimationFrame(() => resolve(read()))),
						{ once: true }
					);
					video.currentTime = at;
				}),
			seconds
		);
	await player.evaluate(
		(v) =>
			new Promise<void>((resolve) => {
				const video = v as HTMLVideoElement;
				if (video.readyState >= 1) resolve();
				else video.addEventListener('loadedmetadata', () => resolve(), { once: true });
			})
	);
	expect(await activeAt(4)).toEqual(['<i>Stand up</i> without using your hands.']);
	expect(await activeAt(6.5)).toEqual(['Sit down slowly.']);
	expect(await activeAt(2.75)).toEqual([]);

	const src = await player.locator('track').getAttribute('src');
	const first = await page.request.get(src!);
	expect(first.status()).toBe(200);
	expect(first.headers()['content-type']).toBe('text/vtt; charset=utf-8');
	expect(first.headers()['cache-control']).toBe('private, max-age=0, must-revalidate');
	const etag = first.headers().etag;
	expect(etag).toMatch(/^"[^"]+"$/);
	expect(await first.text()).toContain('intro\n00:00:00.500 --> 00:00:02.500');
	const again = await page.request.get(src!, { headers: { 'If-None-Match': etag } });
	expect(again.status()).toBe(304);
	expect(again.headers().etag).toBe(etag);
	expect(await again.text()).toBe('');
});

test('the track endpoints answer transcript, SRT, old versions and conflicts', async () => {
	const id = seedCaptionTrack(
		recordingId,
		[{ id: 'a', start: 1, end: 2, text: '<b>Hold</b> for five.' }],
		{ kind: 'subtitles', language: 'cy' }
	);
	const clinician = await signedInRequest(ACCOUNTS.clinician);
	const transcript = await (await clinician.get(`/api/tracks/${id}/transcript.json`)).json();
	expect(transcript.lines).toEqual([
		{ id: 'a', start: 1, end: 2, text: '<b>Hold</b> for five.', plain: 'Hold for five.' }
	]);
	const srt = await clinician.get(`/api/tracks/${id}/captions.srt`);
	expect(srt.headers()['content-disposition']).toMatch(/^attachment; filename=".+\.srt"$/);
	expect(await srt.text()).toBe('1\n00:00:01,000 --> 00:00:02,000\n<b>Hold</b> for five.\n');

	const save = (baseVersion: number, text: string) =>
		clinician.post(`/api/tracks/${id}/versions`, {
			data: { baseVersion, cues: [{ id: 'a', start: 1, end: 2, text }] },
			headers: { Origin: E2E.origin }
		});
	expect((await save(1, 'Hold for ten.')).status()).toBe(201);
	const conflict = await save(1, 'Hold for three.');
	expect(conflict.status()).toBe(409);
	const body = await conflict.json();
	expect(body.error.status).toBe(409);
	expect(body.conflict.yours[0].text).toBe('Hold for three.');
	expect(body.conflict.current).toMatchObject({ version: 2, cues: [{ text: 'Hold for ten.' }] });
	const old = await clinician.get(`/api/tracks/${id}/captions.vtt?version=1`);
	expect(await old.text()).toContain('<b>Hold</b> for five.');

	const refused = await clinician.post(`/api/tracks/${id}/import`, {
		multipart: { file: file('mistakes.vtt', BROKEN) },
		headers: { Origin: E2E.origin }
	});
	expect(refused.status()).toBe(422);
	const refusal = await refused.json();
	expect(refusal.problems.map((p: { line: number }) => p.line)).toEqual(
		expect.arrayContaining([3, 6])
	);
	const binary = await clinician.post(`/api/tracks/${id}/import`, {
		multipart: {
			file: { name: 'still.vtt', mimeType: 'text/vtt', buffer: Buffer.from([0x89, 0x50, 0, 0]) }
		},
		headers: { Origin: E2E.origin }
	});
	expect(binary.status()).toBe(422);
	const versions = await (await clinician.get(`/api/tracks/${id}/versions`)).json();
	expect(versions.current.version).toBe(2);
	await clinician.dispose();
});

test('only clinicians of the clinic may make tracks, save versions or import', async () => {
	const id = seedCaptionTrack(recordingId, undefined, { kind: 'descriptions', language: 'en' });
	const expected = { public: 401, patient: 403, clinician: 201, educator: 403, admin: 403 };
	const seen: Record<string, number[]> = {};
	for (const role of MATRIX_ROLES) {
		const context = await contextFor(role);
		const headers = { Origin: E2E.origin };
		seen[role] = [
			(
				await context.post(`/api/recordings/${recordingId}/tracks`, {
					data: { kind: 'subtitles', language: 'pl' },
					headers
				})
			).status(),
			(
				await context.post(`/api/tracks/${id}/versions`, {
					data: { baseVersion: role === 'clinician' ? 1 : 0, cues: [] },
					headers
				})
			).status(),
			(
				await context.post(`/api/tracks/${id}/import`, {
					multipart: { file: file('good.vtt', GOOD) },
					headers
				})
			).status()
		];
		await context.dispose();
	}
	expect(seen).toEqual(
		Object.fromEntries(MATRIX_ROLES.map((role) => [role, Array(3).fill(expected[role])]))
	);

	const other = await signedInRequest(ACCOUNTS.otherClinicClinician);
	const headers = { Origin: E2E.origin };
	expect(
		[
			await other.get(`/api/tracks/${id}/captions.vtt`),
			await other.post(`/api/recordings/${recordingId}/tracks`, {
				data: { kind: 'captions', language: 'de' },
				headers
			}),
			await other.post(`/api/tracks/${id}/versions`, {
				data: { baseVersion: 2, cues: [] },
				headers
			}),
			await other.post(`/api/tracks/${id}/import`, {
				multipart: { file: file('good.vtt', GOOD) },
				headers
			})
		].map((r) => r.status())
	).toEqual([404, 404, 404, 404]);
	await other.dispose();
});
