import { expect, test } from '@playwright/test';
import {
	ACCOUNTS,
	database,
	expectNoAxeViolations,
	seedCaptionTrack,
	seedReadyRecording,
	signInWithPassword,
	visit
} from './support';

test("an admin's caption guideline is what the clinic's captions are checked against", async ({
	browser
}) => {
	const recordingId = await seedReadyRecording(ACCOUNTS.clinician);
	seedCaptionTrack(recordingId);

	const admin = await (await browser.newContext()).newPage();
	await signInWithPassword(admin, ACCOUNTS.admin);
	await visit(admin, '/clinic');
	const guideline = admin.getByRole('region', { name: 'Caption guideline' });
	await expect(guideline.getByRole('radio', { name: /BBC Subtitle Guidelines/ })).toBeChecked();
	await guideline.getByRole('radio', { name: /DCMP Captioning Key/ }).check();
	await guideline.getByRole('button', { name: 'Save guideline' }).click();
	await expect(admin.getByText('Saved.')).toBeVisible();
	await expectNoAxeViolations(admin);

	const clinician = await (await browser.newContext()).newPage();
	await signInWithPassword(clinician, ACCOUNTS.clinician);
	await visit(clinician, `/recordings/${recordingId}/captions`);
	await expect(
		clinician.getByRole('columnheader', { name: 'Checks (DCMP Captioning Key)' })
	).toBeVisible();

	// Put it back, so other files see the default.
	await guideline.getByRole('radio', { name: /BBC Subtitle Guidelines/ }).check();
	await guideline.getByRole('button', { name: 'Save guideline' }).click();
	await expect(admin.getByText('Saved.')).toBeVisible();
	await visit(clinician, `/recordings/${recordingId}/captions`);
	await expect(
		clinician.getByRole('columnheader', { name: 'Checks (BBC Subtitle Guidelines)' })
	).toBeVisible();
});

test("an admin's time zone is the one the clinic's pages show times in", async ({ browser }) => {
	const recordingId = await seedReadyRecording(ACCOUNTS.clinician);
	const createdAt = database()
		.prepare('SELECT created_at AS at FROM recording WHERE id = ?')
		.get(recordingId) as { at: number };
	// Worded by Intl directly, as the clocks of each zone show it.
	const shown = (timeZone: string) =>
		new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium', timeStyle: 'short', timeZone }).format(
			createdAt.at
		);

	const admin = await (await browser.newContext()).newPage();
	await signInWithPassword(admin, ACCOUNTS.admin);
	await visit(admin, '/clinic');
	const zone = admin.getByRole('region', { name: 'Time zone' });
	const field = zone.getByLabel('Time zone of the clinic');
	await expect(field).toHaveValue('Europe/London');

	await field.fill('Mars/Olympus');
	await zone.getByRole('button', { name: 'Save time zone' }).click();
	await expect(admin.getByRole('alert')).toContainText('Choose a time zone from the list');
	await expect(field).toHaveValue('Mars/Olympus');

	await field.fill('America/New_York');
	await zone.getByRole('button', { name: 'Save time zone' }).click();
	await expect(admin.getByText('Saved.')).toBeVisible();
	await expectNoAxeViolations(admin);

	const clinician = await (await browser.newContext()).newPage();
	await signInWithPassword(clinician, ACCOUNTS.clinician);
	await visit(clinician, `/recordings/${recordingId}`);
	await expect(clinician.getByText(shown('America/New_York'))).toBeVisible();

	// Put it back, so other files see the default.
	await field.fill('Europe/London');
	await zone.getByRole('button', { name: 'Save time zone' }).click();
	await expect(admin.getByText('Saved.')).toBeVisible();
	await visit(clinician, `/recordings/${recordingId}`);
	await expect(clinician.getByText(shown('Europe/London'))).toBeVisible();
});
