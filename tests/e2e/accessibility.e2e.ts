import { expect, test } from '@playwright/test';
import { ACCOUNTS, expectNoAxeViolations, idOf, signInWithPassword, visit, open } from './support';
import { E2E } from './ports';

/** Every page each role can reach, scanned with axe-core in chromium. */
const PUBLIC_PAGES = ['/', '/signin', '/signin/link-sent', '/signout'];

test('public pages have no axe violations', async ({ page }) => {
	for (const path of PUBLIC_PAGES) {
		await open(page, path);
		await expectNoAxeViolations(page);
	}
	// Error pages share the look and must be just as readable.
	const missing = await open(page, '/no-such-page');
	expect(missing?.status()).toBe(404);
	await expect(page.getByRole('heading', { level: 1 })).toHaveText('We could not find that page');
	await expectNoAxeViolations(page);
});

const ROLE_PAGES = [
	{ email: ACCOUNTS.admin, pages: () => ['/clinic', '/inbox', '/account'] },
	{
		email: ACCOUNTS.clinician,
		pages: () => [
			'/patients',
			`/patients/${idOf('select id from patient where email = ?', ACCOUNTS.patient)}`,
			'/account'
		]
	},
	{ email: ACCOUNTS.educator, pages: () => ['/curate', '/account'] },
	{ email: ACCOUNTS.patient, pages: () => ['/today', '/account', '/clinic'] }
];

for (const role of ROLE_PAGES) {
	test(`pages for ${role.email} have no axe violations`, async ({ page }) => {
		await signInWithPassword(page, role.email);
		for (const path of role.pages()) {
			await visit(page, path);
			await expectNoAxeViolations(page);
		}
	});
}

test('the inbox message page and the invitation page have no axe violations', async ({
	page,
	browser
}) => {
	await signInWithPassword(page, ACCOUNTS.admin);
	await visit(page, '/inbox');
	await page
		.getByRole('link', { name: /invited to join/ })
		.first()
		.click();
	await expect(page.getByTestId('message-body')).toBeVisible();
	await expectNoAxeViolations(page);
	const link = await page
		.getByTestId('message-body')
		.getByRole('link')
		.first()
		.getAttribute('href');
	const guest = await browser.newContext({ baseURL: E2E.origin });
	const visitor = await guest.newPage();
	await open(visitor, link!);
	await expect(visitor.getByRole('heading', { level: 1 })).toContainText('Join');
	await expectNoAxeViolations(visitor);
	await guest.close();
});
