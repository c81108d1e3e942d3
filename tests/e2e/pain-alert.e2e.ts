/**
 * Severe or sharp pain, as a patient logs it and a clinician learns of it: the log step's
 * "sharp or new pain" box and note wording, the e-mail to the clinicians, and the caseload flag.
 */
import { expect, test } from '@playwright/test';
import { seedProgramme, seedSignInPatient } from './programme-fixtures';
import { seedReadySegment } from './segments-support';
import {
	ACCOUNTS,
	expectNoAxeViolations,
	seedReadyRecording,
	signInWithPassword,
	waitForMail,
	open
} from './support';

test('a patient logs 8/10 with sharp pain ticked; the clinician is e-mailed and the caseload flags it', async ({
	page,
	browser
}) => {
	const recordingId = await seedReadyRecording(ACCOUNTS.clinician);
	const segmentId = await seedReadySegment(recordingId, { title: 'Heel slides' });
	const name = `Ottilie Vane ${crypto.randomUUID().slice(0, 4)}`;
	const patient = await seedSignInPatient(ACCOUNTS.clinician, { name });
	const {
		itemIds: [itemId]
	} = seedProgramme(patient.patientId, [
		{ title: 'Heel slides', segmentId, safetyNotes: 'Stop if the knee swells.' }
	]);

	await signInWithPassword(page, patient.email);
	await open(page, `/replay/${itemId}`);
	await page.getByRole('button', { name: /I have read these notes/ }).click();
	const since = Date.now();
	await page.getByRole('button', { name: /Done — log this session/ }).click();
	const form = page.getByTestId('log-form');
	await form.getByRole('radio', { name: '8', exact: true }).check({ force: true });
	const sharp = form.getByRole('checkbox', { name: /Sharp or new pain/ });
	await sharp.check();
	await expect(form).toContainText('Notes are read at your next review, not straight away.');
	await expect(form).toContainText('get urgent medical help');
	await expectNoAxeViolations(page);
	await form.getByRole('button', { name: 'Save session' }).click();
	await expect(page.getByTestId('log-outcome')).toContainText('Session saved');

	const mail = await waitForMail(
		ACCOUNTS.clinician,
		since,
		'a patient logged severe or sharp pain'
	);
	expect(mail.text).toContain(
		`${name} (Alder Street Community Clinic) logged pain 8/10 and ticked “sharp or new pain”`
	);
	expect(mail.text).toContain(`/patients/${patient.patientId}`);

	const desk = await browser.newContext();
	const clinician = await desk.newPage();
	await signInWithPassword(clinician, ACCOUNTS.clinician);
	await open(clinician, '/caseload?flag=pain-severe');
	const row = clinician.getByRole('row').filter({ hasText: name });
	await expect(row).toContainText('Severe or sharp pain');
	await desk.close();
});
