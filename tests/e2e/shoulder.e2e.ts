/**
 * The early protected shoulder programme, end to end: a clinician records a biceps-repair
 * precaution with an end, a sling period and an outward-rotation limit, builds the programme and
 * sees the clash on the seated exercise that needs active elbow flexion; the patient sees how to
 * move, the sling line and the limit in plain words, logs 8/10 with sharp pain, and the clinician
 * is e-mailed and sees the flag. The exercises and names are invented for the test.
 */
import { join } from 'node:path';
import { expect, test, type Page } from '@playwright/test';
import { seedExercise, seedSignInPatient } from './programme-fixtures';
import { seedReadySegment } from './segments-support';
import {
	ACCOUNTS,
	expectNoAxeViolations,
	seedReadyRecording,
	signInWithPassword,
	waitForMail,
	open
} from './support';

/** Screens kept with the run's results, to look at after a change. */
async function shot(page: Page, name: string) {
	const dir = join(import.meta.dirname, '../.run/e2e-results');
	await page.screenshot({ path: join(dir, `shoulder-${name}.png`), fullPage: true });
}

/** A date `days` from today, 'YYYY-MM-DD' (UTC, as the London test patient's day at test time). */
function dayFromToday(days: number): string {
	return new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);
}

test('a clinician builds the early shoulder programme; the patient sees how to move, the sling and the limit, and a sharp-pain log reaches the clinician', async ({
	page,
	browser
}) => {
	const run = crypto.randomUUID().slice(0, 6);
	const recordingId = await seedReadyRecording(ACCOUNTS.clinician);
	const lyingRaise = `Lying arm raise with a stick ${run}`;
	const towelTurn = `Outward turn, towel under the elbow ${run}`;
	const seatedTurn = `Seated outward turn ${run}`;
	for (const [title, position, tags, equipment] of [
		[lyingRaise, 'supine', [], ['Stick']],
		[towelTurn, 'supine', ['shoulder-external-rotation'], ['Stick', 'Towel']],
		// Holding the elbow bent while seated uses the biceps.
		[seatedTurn, 'seated', ['shoulder-external-rotation', 'active-elbow-flexion'], ['Stick']]
	] as const) {
		const segmentId = await seedReadySegment(recordingId, { title });
		seedExercise(ACCOUNTS.clinician, {
			title,
			segmentId,
			bodyRegion: 'Shoulder',
			position,
			movementType: 'passive',
			equipment: [...equipment],
			precautionTags: [...tags],
			safetyNotes: 'It should not be painful; tightness at the end of the movement is expected.'
		});
	}
	const name = `Ines Calder ${run}`;
	const patient = await seedSignInPatient(ACCOUNTS.clinician, { name });
	const operationDate = dayFromToday(-14);
	const slingUntil = dayFromToday(21);

	// The clinician records the repair, the precaution with its end and the sling period.
	await signInWithPassword(page, ACCOUNTS.clinician);
	await open(page, `/patients/${patient.patientId}/details`);
	await page.getByLabel('Operation or injury', { exact: true }).fill('Right rotator cuff repair');
	await page.getByLabel('Affected side').selectOption('right');
	await page.getByLabel('Date of the operation (or injury)').fill(operationDate);
	await page.getByLabel('Protocol', { exact: true }).selectOption('rotator-cuff-repair');
	await page.getByLabel('Sling between sessions until').fill(slingUntil);
	const precautions = page.locator('details', { hasText: 'Precautions' });
	await precautions.locator('summary').click();
	await precautions
		.getByRole('checkbox', { name: 'Biceps repair: no active elbow flexion' })
		.check();
	await precautions.getByLabel('Until: Biceps repair: no active elbow flexion').fill('week 8');
	// A wrong end is refused in words and loses nothing.
	await precautions.getByLabel(/^Until: Shoulder: limit outward rotation/).fill('soon');
	await precautions.getByRole('checkbox', { name: 'Shoulder: limit outward rotation' }).check();
	await page.getByRole('button', { name: 'Save details' }).click();
	await expect(page.getByRole('alert')).toContainText('"soon" is neither a week');
	await expect(page.getByLabel('Sling between sessions until')).toHaveValue(slingUntil);
	await page.getByRole('checkbox', { name: 'Shoulder: limit outward rotation' }).uncheck();
	await page.getByLabel(/^Until: Shoulder: limit outward rotation/).fill('');
	await page.getByRole('button', { name: 'Save details' }).click();
	await expect(page.getByText('The details are saved.')).toBeVisible();
	await expectNoAxeViolations(page);
	await shot(page, 'details');

	await open(page, `/patients/${patient.patientId}`);
	await shot(page, 'patient');
	await expect(page.getByTestId('precautions')).toContainText(
		'Biceps repair: no active elbow flexion, until'
	);
	await expect(page.getByText(/Between sessions until/)).toBeVisible();

	// The programme: three exercises, the rotation limit on the towel exercise, the clash flagged.
	await page.getByRole('link', { name: 'New programme' }).click();
	await page.getByRole('button', { name: 'Start building' }).click();
	await expect(page).toHaveURL(/\/programmes\/[0-9a-f-]{36}$/);
	await expect(page.getByRole('region', { name: /Week after the operation/ })).toContainText(
		'Week 2 after the operation'
	);
	await page.getByLabel('Search').fill(run);
	for (const title of [lyingRaise, towelTurn, seatedTurn]) {
		await page.getByRole('button', { name: `Add ${title}` }).click();
	}
	const towel = page.locator('ol > li').filter({ hasText: towelTurn });
	await towel.getByLabel('Motion').first().selectOption('shoulder-external-rotation');
	await towel.getByLabel('Kind').first().selectOption('limit');
	await towel.getByLabel('Degrees').first().fill('20');
	await towel.getByLabel('Until').first().fill('6');
	const lying = page.locator('ol > li').filter({ hasText: lyingRaise });
	await lying.getByLabel('Motion').first().selectOption('shoulder-flexion');
	await lying.getByLabel('Degrees').first().fill('90');

	const seated = page.locator('ol > li').filter({ hasText: seatedTurn });
	await expect(seated).toContainText('Precaution flag:');
	await expect(seated).toContainText('Biceps repair: no active elbow flexion');
	await expect(towel).not.toContainText('Precaution flag:');
	// The seated exercise is taken out after the clash; the programme keeps the two lying ones.
	await page.getByRole('button', { name: `Remove ${seatedTurn}` }).click();
	await expect(page.getByText(/All changes saved at/)).toBeVisible({ timeout: 10_000 });
	await expectNoAxeViolations(page);
	await shot(page, 'builder');
	await page.getByRole('button', { name: /^Publish and e-mail/ }).click();
	await expect(page.getByText(`Published and e-mailed to ${name}.`)).toBeVisible();
	// The printed sheet carries the limit and the sling period too.
	await page.getByRole('link', { name: 'Printable sheet' }).click();
	await expect(
		page.getByText(/no further than 20° up to and including .*, moved for you/)
	).toBeVisible();
	await expect(
		page.getByText(/wear your sling between sessions up\s+to and including/)
	).toBeVisible();
	await page.goBack();

	// The patient: how to move, the sling line and the limit, on Today and in the replay.
	const phone = await browser.newContext({ viewport: { width: 390, height: 844 } });
	const patientPage = await phone.newPage();
	await signInWithPassword(patientPage, patient.email);
	await open(patientPage, '/today');
	await expect(patientPage.getByTestId('sling')).toContainText(
		'wear your sling between sessions up to and including'
	);
	const towelCard = patientPage.locator('li').filter({ hasText: towelTurn });
	await expect(towelCard.getByTestId('how-to-move')).toContainText('Your other arm does the work');
	await expect(towelCard.getByTestId('range-guides')).toContainText(
		'Turning the forearm out away from the body: no further than 20° up to and including'
	);
	await expect(
		patientPage.locator('li').filter({ hasText: lyingRaise }).getByTestId('range-guides')
	).toContainText('Raising the arm forward and up: to about 90°');
	await expect(patientPage.getByText('Monday, Wednesday and Friday')).toHaveCount(0);
	await expectNoAxeViolations(patientPage);
	await shot(patientPage, 'today-phone');

	await towelCard.getByRole('link', { name: /Play exercise/ }).click();
	await expect(patientPage).toHaveURL(/\/replay\//);
	await expect(patientPage.getByRole('heading', { level: 1 })).toHaveText(towelTurn);
	await expect(patientPage.getByTestId('range-guides')).toContainText('no further than 20°');
	await expect(patientPage.getByTestId('sling')).toBeVisible();
	await shot(patientPage, 'replay-phone');
	await patientPage.getByRole('button', { name: /I have read these notes/ }).click();
	const since = Date.now();
	await patientPage.getByRole('button', { name: /Done — log this session/ }).click();
	const form = patientPage.getByTestId('log-form');
	await form.getByRole('radio', { name: '8', exact: true }).check({ force: true });
	await form.getByRole('checkbox', { name: /Sharp or new pain/ }).check();
	await form.getByRole('button', { name: 'Save session' }).click();
	await expect(patientPage.getByTestId('log-outcome')).toContainText('Session saved');
	await phone.close();

	// The clinician is e-mailed and the caseload flags it.
	const mail = await waitForMail(
		ACCOUNTS.clinician,
		since,
		'a patient logged severe or sharp pain'
	);
	expect(mail.text).toContain(`${name} (Alder Street Community Clinic) logged pain 8/10`);
	await open(page, '/caseload?flag=pain-severe');
	await expect(page.getByRole('row').filter({ hasText: name })).toContainText(
		'Severe or sharp pain'
	);
});
