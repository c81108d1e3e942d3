/**
 * The exercise form's refusal: every problem beside its own field (tied to it, so a screen reader
 * reads it with the field) and listed at the top as a link to it, what was typed kept, with and
 * without scripts. Without scripts a key point is typed into the blank rows the server sends.
 */
import { expect, test, type Page } from '@playwright/test';
import { E2E } from './ports';
import { ACCOUNTS, expectNoAxeViolations, open, signInWithPassword } from './support';

const TITLE_PROBLEM = 'Give the exercise a title.';
const TIME_PROBLEM = 'A cue’s time must be minutes and seconds, for example 0:12.';
const READY_PROBLEM =
	'Choose the demonstration segment before marking the exercise ready: patients replay it.';

/** The field's own box: its label, input and problems. */
const fieldBox = (page: Page, id: string) =>
	page.locator('.field').filter({ has: page.locator(`[id="${id}"]`) });

async function refuseNewExercise(page: Page, scripted: boolean) {
	// A title of spaces, a key point whose time is no time, and "ready" without a demonstration
	// (a check across fields, said together with the fields' own problems).
	await page.getByLabel('Title').fill('   ');
	await page.getByLabel('Body region').fill('Knee');
	await page.getByLabel('Position').selectOption('supine');
	await page.getByLabel('Movement type').selectOption('active');
	if (scripted) await page.getByRole('button', { name: 'Add a key point' }).click();
	await page.getByLabel('Key point 1', { exact: true }).fill('Slide the heel up');
	await page.locator('#cue-at-0').fill('later');
	await page.getByRole('radio', { name: /Ready/ }).check();
	await page.getByRole('button', { name: 'Save the exercise' }).click();
}

async function expectEachProblemBesideItsField(page: Page) {
	const summary = page.getByRole('alert');
	await expect(summary).toContainText('Not saved: 3 problems.');
	// Not saved: still the new exercise page (its action's address without scripts).
	await expect(page).toHaveURL(/\/exercises\/new(\?\/create)?$/);

	// Each problem is its field's accessible description, and shown in its own box only.
	await expect(page.getByLabel('Title')).toHaveAccessibleDescription(TITLE_PROBLEM);
	await expect(page.getByLabel('Title')).toHaveAttribute('aria-invalid', 'true');
	await expect(fieldBox(page, 'title')).toContainText(TITLE_PROBLEM);
	await expect(fieldBox(page, 'title')).not.toContainText(TIME_PROBLEM);

	const time = page.locator('#cue-at-0');
	await expect(time).toHaveAccessibleDescription(TIME_PROBLEM);
	await expect(time).toHaveAttribute('aria-invalid', 'true');
	await expect(fieldBox(page, 'cue-at-0')).toContainText(TIME_PROBLEM);
	await expect(fieldBox(page, 'cue-at-0')).not.toContainText(TITLE_PROBLEM);
	await expect(page.getByLabel('Key point 1', { exact: true })).not.toHaveAttribute('aria-invalid');

	// The demonstration is a choice of radios: its problem is the group's.
	const demonstration = page.getByRole('group', { name: 'Demonstration' });
	await expect(demonstration).toHaveAccessibleDescription(new RegExp(`${READY_PROBLEM}$`));
	await expect(demonstration.getByRole('list')).toHaveText(READY_PROBLEM);

	await expect(page.getByLabel('Body region')).not.toHaveAttribute('aria-invalid');
	await expect(page.locator('[aria-invalid="true"]')).toHaveCount(2);

	// The list at the top links each problem to its field, in the form's order.
	await expect(summary.getByRole('link')).toHaveText([
		`Demonstration: ${READY_PROBLEM}`,
		`Title: ${TITLE_PROBLEM}`,
		`Key point 1, time: ${TIME_PROBLEM}`
	]);
	for (const [name, href] of [
		['Demonstration', '#segment-choices'],
		['Title', '#title'],
		['Key point 1, time', '#cue-at-0']
	])
		await expect(summary.getByRole('link', { name: new RegExp(`^${name}:`) })).toHaveAttribute(
			'href',
			href
		);

	// What was typed stays.
	await expect(page.getByLabel('Title')).toHaveValue('   ');
	await expect(page.getByLabel('Body region')).toHaveValue('Knee');
	await expect(page.getByLabel('Key point 1', { exact: true })).toHaveValue('Slide the heel up');
	await expect(time).toHaveValue('later');
	await expect(page.getByRole('radio', { name: /Ready/ })).toBeChecked();
}

test('a refused new exercise shows each problem beside its own field, with scripts', async ({
	page
}) => {
	await signInWithPassword(page, ACCOUNTS.clinician);
	await open(page, '/exercises/new');
	await refuseNewExercise(page, true);
	await expectEachProblemBesideItsField(page);
	await expectNoAxeViolations(page);
	// A problem's link takes the keyboard to its field.
	await page
		.getByRole('alert')
		.getByRole('link', { name: /^Key point 1, time:/ })
		.click();
	await expect(page.locator('#cue-at-0')).toBeFocused();
});

test('the same refusal without scripts, typed into the blank key point rows', async ({
	browser
}) => {
	const context = await browser.newContext({ baseURL: E2E.origin, javaScriptEnabled: false });
	const page = await context.newPage();
	await signInWithPassword(page, ACCOUNTS.clinician);
	await page.goto('/exercises/new');
	await refuseNewExercise(page, false);
	await expectEachProblemBesideItsField(page);
	await context.close();
});
