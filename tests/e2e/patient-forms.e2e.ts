/**
 * The patient invitation and the patient's details: a refusal shows every problem beside its own
 * field (tied to it for a screen reader), keeps what was typed, and works the same without scripts.
 */
import { expect, test, type Browser, type Page } from '@playwright/test';
import { seedSignInPatient } from './programme-fixtures';
import { ACCOUNTS, expectNoAxeViolations, signInWithPassword, visit } from './support';
import { E2E } from './ports';

/** The field's own box: its label, input and problems. */
const fieldBox = (page: Page, label: string) =>
	page.locator('.field').filter({ has: page.getByLabel(label, { exact: true }) });

/** Runs `check` signed in as the clinician, once with scripts and once without. */
async function withAndWithoutScripts(
	browser: Browser,
	path: string,
	check: (page: Page, javaScriptEnabled: boolean) => Promise<void>
) {
	for (const javaScriptEnabled of [true, false]) {
		const context = await browser.newContext({ baseURL: E2E.origin, javaScriptEnabled });
		const page = await context.newPage();
		await signInWithPassword(page, ACCOUNTS.clinician);
		if (javaScriptEnabled) await visit(page, path);
		else await page.goto(path);
		await check(page, javaScriptEnabled);
		await context.close();
	}
}

test('a patient invitation with two problems says each beside its field, with and without scripts', async ({
	browser
}) => {
	await withAndWithoutScripts(browser, '/patients', async (page, javaScriptEnabled) => {
		const invite = page.locator('form[action="?/invite"]');
		await invite.getByLabel('Full name').fill('   ');
		await invite.getByLabel('E-mail address').fill('someone@nowhere');
		await invite.getByLabel('Operation or injury', { exact: true }).fill('Left hip replacement');
		await invite.getByRole('button', { name: 'Send invitation' }).click();

		await expect(invite.getByRole('alert')).toContainText('Not saved: 2 problems.');
		await expect(invite.getByLabel('Full name')).toHaveAccessibleDescription(
			"Enter the patient's name."
		);
		await expect(fieldBox(page, 'Full name')).toContainText("Enter the patient's name.");
		await expect(fieldBox(page, 'Full name')).not.toContainText('valid e-mail');
		await expect(invite.getByLabel('E-mail address')).toHaveAccessibleDescription(
			'Enter a valid e-mail address.'
		);
		await expect(fieldBox(page, 'E-mail address')).toContainText('Enter a valid e-mail address.');
		await expect(invite.getByLabel('Operation or injury', { exact: true })).not.toHaveAttribute(
			'aria-invalid'
		);
		// What was typed stays.
		await expect(invite.getByLabel('E-mail address')).toHaveValue('someone@nowhere');
		await expect(invite.getByLabel('Operation or injury', { exact: true })).toHaveValue(
			'Left hip replacement'
		);
		if (javaScriptEnabled) await expectNoAxeViolations(page);
	});
});

test("a patient's details with two problems say each beside its field, with and without scripts", async ({
	browser
}) => {
	const { patientId } = await seedSignInPatient(ACCOUNTS.clinician, { name: 'Details Checks' });
	await withAndWithoutScripts(
		browser,
		`/patients/${patientId}/details`,
		async (page, javaScriptEnabled) => {
			await page.getByLabel('Year of birth (optional)').fill('61');
			await page.getByLabel("Surgeon's timing against the table (weeks)").fill('2.5');
			await page.getByLabel('Sling between sessions until').fill('2026-12-14');
			await page.getByRole('button', { name: 'Save details' }).click();

			await expect(page.getByRole('alert')).toContainText('Not saved: 2 problems.');
			await expect(page.getByLabel('Year of birth (optional)')).toHaveAccessibleDescription(
				/Write the birth year as four digits/
			);
			await expect(fieldBox(page, 'Year of birth (optional)')).toContainText(
				'Write the birth year as four digits'
			);
			await expect(fieldBox(page, 'Year of birth (optional)')).not.toContainText('whole number');
			await expect(
				page.getByLabel("Surgeon's timing against the table (weeks)")
			).toHaveAccessibleDescription(/Write the surgeon’s timing as a whole number of weeks/);
			await expect(fieldBox(page, "Surgeon's timing against the table (weeks)")).toContainText(
				'Write the surgeon’s timing as a whole number of weeks'
			);
			await expect(page.getByLabel('Sling between sessions until')).not.toHaveAttribute(
				'aria-invalid'
			);
			// What was typed stays.
			await expect(page.getByLabel('Year of birth (optional)')).toHaveValue('61');
			await expect(page.getByLabel('Sling between sessions until')).toHaveValue('2026-12-14');
			if (javaScriptEnabled) await expectNoAxeViolations(page);
		}
	);
});

test('once a patient is invited the form is empty again, with and without scripts', async ({
	browser
}) => {
	await withAndWithoutScripts(browser, '/patients', async (page, javaScriptEnabled) => {
		const name = `Emptied Form ${javaScriptEnabled ? 'S' : 'N'}${Date.now()}`;
		const invite = page.locator('form[action="?/invite"]');
		await invite.getByLabel('Full name').fill(name);
		await invite.getByLabel('E-mail address').fill(`emptied.${Date.now()}@alder-street.example`);
		await invite.getByLabel('Operation or injury', { exact: true }).fill('Right knee arthroscopy');
		await invite.getByRole('button', { name: 'Send invitation' }).click();
		await expect(
			page.getByRole('row').filter({ hasText: name }).getByText('Invited')
		).toBeVisible();
		await expect(invite.getByLabel('Full name')).toHaveValue('');
		await expect(invite.getByLabel('E-mail address')).toHaveValue('');
		await expect(invite.getByLabel('Operation or injury', { exact: true })).toHaveValue('');
	});
});

test('a range-of-motion reading with two problems says each beside its field, with and without scripts', async ({
	browser
}) => {
	const { patientId } = await seedSignInPatient(ACCOUNTS.clinician, { name: 'Reading Checks' });
	await withAndWithoutScripts(
		browser,
		`/patients/${patientId}`,
		async (page, javaScriptEnabled) => {
			const form = page.getByRole('form', { name: 'Add a reading' });
			const box = (label: string) =>
				form.locator('.field').filter({ has: page.getByLabel(label, { exact: true }) });
			// A rotation says where the arm was; the degrees are past what any joint we record reaches.
			await form.getByLabel('Motion').selectOption('shoulder-external-rotation');
			// The second round starts from the first's reading: clear where the arm was.
			await form.getByLabel('Arm position (rotations)').selectOption('');
			await form.getByLabel('Degrees').fill('250');
			await form.getByLabel('Note (optional)').fill('lying on the couch');
			await form.getByRole('button', { name: 'Save reading' }).click();

			await expect(form.getByRole('alert')).toContainText('Not saved: 2 problems.');
			await expect(form.getByLabel('Degrees')).toHaveAccessibleDescription(
				/Degrees cannot be above 200\./
			);
			await expect(box('Degrees')).toContainText('Degrees cannot be above 200.');
			await expect(box('Degrees')).not.toContainText('Say where the arm was');
			await expect(form.getByLabel('Arm position (rotations)')).toHaveAccessibleDescription(
				/Say where the arm was: rotation is read differently at the side and raised\./
			);
			await expect(box('Arm position (rotations)')).toContainText('Say where the arm was');
			await expect(form.getByLabel('Measured on')).not.toHaveAttribute('aria-invalid');
			// What was typed stays.
			await expect(form.getByLabel('Motion')).toHaveValue('shoulder-external-rotation');
			await expect(form.getByLabel('Degrees')).toHaveValue('250');
			await expect(form.getByLabel('Note (optional)')).toHaveValue('lying on the couch');
			if (javaScriptEnabled) await expectNoAxeViolations(page);

			// Once fixed it is saved, and the form is ready for the next reading.
			await form.getByLabel('Arm position (rotations)').selectOption('side');
			await form.getByLabel('Degrees').fill('45');
			await form.getByRole('button', { name: 'Save reading' }).click();
			await expect(form.getByRole('status')).toContainText('45° saved.');
			await expect(form.getByRole('alert')).toHaveCount(0);
			await expect(form.getByLabel('Degrees')).toHaveValue('');
			await expect(form.getByLabel('Note (optional)')).toHaveValue('');
			await expect(form.getByLabel('Motion')).toHaveValue('shoulder-external-rotation');
		}
	);
});
