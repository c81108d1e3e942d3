/**
 * Forms written with superforms and the Field components: a refused save shows every problem
 * beside its own field (and tied to it, so a screen reader reads it with the field), keeps what
 * was typed, and works the same with scripts off.
 */
import { expect, test, type Page } from '@playwright/test';
import { seedSignInPatient } from './programme-fixtures';
import { ACCOUNTS, expectNoAxeViolations, signInWithPassword, visit } from './support';
import { E2E } from './ports';

/** The field's own box: its label, input and problems. */
const fieldBox = (page: Page, label: string) =>
	page.locator('.field').filter({ has: page.getByLabel(label, { exact: true }) });

async function refuseNewProgramme(page: Page) {
	await page.getByLabel('Title').fill('   ');
	await page.getByLabel('Start date').fill('2026-12-10');
	await page.getByLabel('End date (optional)').fill('2026-12-01');
	await page.getByRole('button', { name: 'Start building' }).click();
}

async function expectBothProblemsBesideTheirFields(page: Page) {
	await expect(page.getByRole('alert')).toContainText('Not saved: 2 problems.');
	await expect(fieldBox(page, 'Title')).toContainText('Give the programme a title.');
	await expect(fieldBox(page, 'Title')).not.toContainText('The end date is before the start date.');
	await expect(fieldBox(page, 'End date (optional)')).toContainText(
		'The end date is before the start date.'
	);
	await expect(fieldBox(page, 'End date (optional)')).not.toContainText('Give the programme');
	await expect(page.getByLabel('Title')).toHaveAttribute('aria-invalid', 'true');
	await expect(page.getByLabel('End date (optional)')).toHaveAccessibleDescription(
		'The end date is before the start date.'
	);
	await expect(page.getByLabel('Start date')).not.toHaveAttribute('aria-invalid');
	// What was typed stays.
	await expect(page.getByLabel('Start date')).toHaveValue('2026-12-10');
	await expect(page.getByLabel('End date (optional)')).toHaveValue('2026-12-01');
}

test('a new programme with two problems shows each beside its field and keeps what was typed', async ({
	page
}) => {
	const { patientId } = await seedSignInPatient(ACCOUNTS.clinician, { name: 'Form Checks' });
	await signInWithPassword(page, ACCOUNTS.clinician);
	await visit(page, `/programmes/new?patient=${patientId}`);
	await refuseNewProgramme(page);
	await expectBothProblemsBesideTheirFields(page);
	await expectNoAxeViolations(page);
});

test('the same refusal without scripts', async ({ browser }) => {
	const { patientId } = await seedSignInPatient(ACCOUNTS.clinician, { name: 'Form Checks' });
	const context = await browser.newContext({ baseURL: E2E.origin, javaScriptEnabled: false });
	const page = await context.newPage();
	await signInWithPassword(page, ACCOUNTS.clinician);
	await page.goto(`/programmes/new?patient=${patientId}`);
	await refuseNewProgramme(page);
	await expectBothProblemsBesideTheirFields(page);
	await context.close();
});

test('a password change with a wrong current password and differing new ones says both', async ({
	page
}) => {
	await signInWithPassword(page, ACCOUNTS.educator);
	await visit(page, '/account');
	await page.getByLabel('Current password').fill('not-the-password');
	await page.getByLabel(/^New password/).fill('a-new-password-2026');
	await page.getByLabel('Type it again').fill('a-different-password');
	await page.getByRole('button', { name: 'Save password' }).click();
	await expect(page.getByRole('alert')).toContainText('Not saved: 2 problems.');
	await expect(page.getByLabel('Current password')).toHaveAccessibleDescription(
		'Your current password is not right.'
	);
	await expect(fieldBox(page, 'Current password')).toContainText(
		'Your current password is not right.'
	);
	await expect(page.getByLabel('Type it again')).toHaveAccessibleDescription(
		'The two new passwords differ.'
	);
	await expect(fieldBox(page, 'Type it again')).toContainText('The two new passwords differ.');
	await expect(page.getByLabel(/^New password/)).not.toHaveAttribute('aria-invalid');
	// Passwords are never sent back: the fields are empty again.
	await expect(page.getByLabel('Current password')).toHaveValue('');
	await expectNoAxeViolations(page);
});

test("a member's invitation to an address that is no address says so beside it and keeps the role", async ({
	page
}) => {
	await signInWithPassword(page, ACCOUNTS.admin);
	await visit(page, '/clinic');
	const invite = page.locator('form[action="?/invite"]');
	await invite.getByLabel('E-mail address').fill('someone@nowhere');
	await invite.getByLabel('Role').selectOption('educator');
	await invite.getByRole('button', { name: 'Send invitation' }).click();
	await expect(invite.getByLabel('E-mail address')).toHaveAccessibleDescription(
		'Enter a valid e-mail address.'
	);
	await expect(invite.getByRole('alert')).toContainText('E-mail address: Enter a valid');
	await expect(invite.getByLabel('E-mail address')).toHaveValue('someone@nowhere');
	await expect(invite.getByLabel('Role')).toHaveValue('educator');
	await expectNoAxeViolations(page);
});

test('a collection titled with spaces only is refused beside its title, without scripts too', async ({
	browser
}) => {
	for (const javaScriptEnabled of [true, false]) {
		const context = await browser.newContext({ baseURL: E2E.origin, javaScriptEnabled });
		const page = await context.newPage();
		await signInWithPassword(page, ACCOUNTS.educator);
		if (javaScriptEnabled) await visit(page, '/curate/collections');
		else await page.goto('/curate/collections');
		await page.getByLabel('Title').fill('    ');
		await page.getByRole('button', { name: 'Create the collection' }).click();
		await expect(page.getByLabel('Title')).toHaveAccessibleDescription(
			'Give the collection a title of at least 3 characters.'
		);
		await expect(fieldBox(page, 'Title')).toContainText('at least 3 characters');
		await expect(page.getByRole('alert')).toContainText('Title: Give the collection a title');
		await expect(page.getByLabel('Title')).toHaveValue('    ');
		if (javaScriptEnabled) await expectNoAxeViolations(page);
		await context.close();
	}
});
