import { expect, test } from '@playwright/test';
import {
	ACCOUNTS,
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
