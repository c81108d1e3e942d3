/** A clinician's desk (1366 px): the main navigation stays on one row. */
import { expect, test } from '@playwright/test';
import { ACCOUNTS, signInWithPassword, open } from './support';

test.use({ viewport: { width: 1366, height: 768 } });

test('the clinician’s navigation fits one row at 1366 px, development inbox included', async ({
	page
}) => {
	await signInWithPassword(page, ACCOUNTS.clinician);
	await open(page, '/caseload');
	const links = page.getByRole('navigation', { name: 'Main' }).getByRole('link');
	const tops = await links.evaluateAll((all) => all.map((a) => a.getBoundingClientRect().top));
	expect(tops.length).toBeGreaterThanOrEqual(5);
	expect(new Set(tops.map(Math.round)).size).toBe(1);
	const signOut = await page.getByRole('button', { name: 'Sign out' }).boundingBox();
	expect(Math.round(signOut!.y)).toBeLessThan(Math.round(tops[0]) + 20);
});
