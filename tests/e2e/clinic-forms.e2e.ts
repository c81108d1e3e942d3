/**
 * /clinic's row forms on superforms: a refused change is said in the row it came from, beside
 * its field, with scripts and without.
 */
import { expect, test } from '@playwright/test';
import { ACCOUNTS, database, expectNoAxeViolations, signInWithPassword, visit } from './support';
import { E2E } from './ports';

const REFUSAL = 'A clinic needs at least one admin. Make someone else admin first.';

test("the clinic's only admin cannot step down: said beside their own role, without scripts too", async ({
	browser
}) => {
	// The refusal depends on there being one admin; with two, this would demote one.
	const db = database();
	const admins = db
		.prepare(
			`select count(*) as n from membership where role = 'admin' and clinic_id =
			 (select clinic_id from membership m join user u on u.id = m.user_id where u.email = ?)`
		)
		.get(ACCOUNTS.admin) as { n: number };
	db.close();
	expect(admins.n).toBe(1);

	for (const javaScriptEnabled of [true, false]) {
		const context = await browser.newContext({ baseURL: E2E.origin, javaScriptEnabled });
		const page = await context.newPage();
		await signInWithPassword(page, ACCOUNTS.admin);
		if (javaScriptEnabled) await visit(page, '/clinic');
		else await page.goto('/clinic');
		const row = page.getByRole('row', { name: /\(you\)/ });
		const role = row.getByRole('combobox', { name: /^Role of / });
		await role.selectOption('clinician');
		await row.getByRole('button', { name: /^Change role of / }).click();

		await expect(role).toHaveAccessibleDescription(REFUSAL);
		await expect(row.getByRole('alert')).toContainText(`: ${REFUSAL}`);
		// Said in that row only, and the choice made is still shown.
		await expect(page.getByRole('alert')).toHaveCount(1);
		await expect(role).toHaveValue('clinician');
		if (javaScriptEnabled) await expectNoAxeViolations(page);
		await context.close();
	}
});
