/**
 * From a recording to draft exercises in one flow: rename the recording, import its captions from
 * its own page (the track is made), and make an exercise per segment from what the narration said,
 * each proposal showing its words, a vague amount left for the clinician to settle. The narration
 * is invented for the test.
 */
import { expect, test } from '@playwright/test';
import { seedReadySegment } from './segments-support';
import {
	ACCOUNTS,
	expectNoAxeViolations,
	seedReadyRecording,
	signInWithPassword,
	open
} from './support';

const NARRATION = `WEBVTT

00:00.000 --> 00:03.000
The next exercise is the supported arm raise.

00:03.000 --> 00:06.500
Lie on your back and hold a stick in both hands.

00:06.500 --> 00:10.000
Your good arm does the work; let the other arm relax.

00:10.000 --> 00:13.000
Do one set of eight, a few times a day.

00:13.000 --> 00:16.000
You may feel some tightness at the end. Stop if it is painful.

00:16.000 --> 00:19.000
Now we'll do the sitting knee straighten.

00:19.000 --> 00:23.000
Sit on a chair and straighten your knee, ten times, twice a day.
`;

test('a clinician renames a recording, imports its captions there and makes draft exercises from its segments', async ({
	page
}) => {
	const run = crypto.randomUUID().slice(0, 6);
	const recordingId = await seedReadyRecording(ACCOUNTS.clinician);
	await seedReadySegment(recordingId, { title: `Part one ${run}`, start: 0, end: 16 });
	await seedReadySegment(recordingId, { title: `Part two ${run}`, start: 16, end: 23 });
	await signInWithPassword(page, ACCOUNTS.clinician);
	await open(page, `/recordings/${recordingId}`);

	// Rename: a blank title is refused in words; a real one is kept.
	await page.getByText('Rename', { exact: true }).click();
	await page.getByLabel('Title').fill('   ');
	await page.getByRole('button', { name: 'Save title' }).click();
	await expect(page.getByRole('alert')).toContainText('Give the recording a title.');
	await page.getByLabel('Title').fill(`Shoulder and knee set ${run}`);
	await page.getByRole('button', { name: 'Save title' }).click();
	await expect(page.getByRole('heading', { level: 1 })).toHaveText(`Shoulder and knee set ${run}`);

	// Import from the recording's page: no track beforehand, one made for the file.
	await page.getByLabel('Import a caption file (.vtt or .srt)').setInputFiles({
		name: 'narration.vtt',
		mimeType: 'text/vtt',
		buffer: Buffer.from(NARRATION)
	});
	await page.getByRole('button', { name: 'Import captions' }).click();
	await expect(page.getByText('7 cues imported from narration.vtt as version 1.')).toBeVisible();
	await expect(page.getByText('1 track.')).toBeVisible();
	await expectNoAxeViolations(page);

	// Draft exercises from the segments' narration.
	await page.getByRole('link', { name: 'Make exercises from the segments' }).click();
	const first = page.getByRole('group', { name: `1. Part one ${run}` });
	await expect(first.getByLabel('Title')).toHaveValue(/supported arm raise/i);
	await expect(first.getByLabel('Position')).toHaveValue('supine');
	await expect(first.getByLabel('Movement type')).toHaveValue('passive');
	await expect(first).toContainText('From the narration: “on your back”');
	await expect(first.getByLabel('Sessions a day')).toHaveValue('');
	await expect(first).toContainText('choose a number');
	const second = page.getByRole('group', { name: `2. Part two ${run}` });
	await expect(second.getByLabel('Position')).toHaveValue('seated');
	await expect(second.getByLabel('Reps')).toHaveValue('10');
	await expectNoAxeViolations(page);
	await page.screenshot({
		path: 'tests/.run/e2e-results/authoring-proposals.png',
		fullPage: true
	});

	// Unsettled, nothing is made and nothing typed is lost.
	await first.getByLabel('Body region').fill('Shoulder');
	await page.getByRole('button', { name: 'Make the ticked exercises' }).click();
	await expect(page.getByRole('alert')).toContainText('Nothing was made');
	await expect(first.getByLabel('Body region')).toHaveValue('Shoulder');
	await first.getByLabel('Sessions a day').fill('3');
	if ((await second.getByLabel('Body region').inputValue()) === '') {
		await second.getByLabel('Body region').fill('Knee');
	}
	await page.getByRole('button', { name: 'Make the ticked exercises' }).click();
	await expect(page.getByText('2 draft exercises made')).toBeVisible();

	await open(page, `/exercises?q=${encodeURIComponent('supported arm raise')}`);
	await expect(
		page
			.getByRole('row')
			.filter({ hasText: /supported arm raise/i })
			.first()
	).toContainText('Draft');
});
