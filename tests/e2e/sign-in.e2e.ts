import { expect, test } from '@playwright/test';
import {
	ACCOUNTS,
	database,
	DEMO_PASSWORD,
	expectNoAxeViolations,
	firstLink,
	signInWithPassword,
	waitForMail,
	open
} from './support';
import { E2E } from './ports';

// The limit tests spend these accounts' attempts; each test leaves them as it found them, so the
// suite can run again on the same data (and the rest of it is never locked out).
test.afterEach(() => {
	const db = database();
	try {
		db.prepare('delete from sign_in_attempt where email in (?, ?)').run(
			ACCOUNTS.otherPatient,
			ACCOUNTS.otherClinicClinician
		);
	} finally {
		db.close();
	}
});

const HOMES = [
	{
		role: 'admin',
		email: ACCOUNTS.admin,
		path: '/clinic',
		heading: 'Alder Street Community Clinic'
	},
	{ role: 'clinician', email: ACCOUNTS.clinician, path: '/patients', heading: 'Patients' },
	{ role: 'educator', email: ACCOUNTS.educator, path: '/curate', heading: 'Library desk' },
	{
		role: 'patient',
		email: ACCOUNTS.patient,
		path: '/today',
		heading: /Good (morning|afternoon|evening), Walter/
	}
] as const;

for (const home of HOMES) {
	test(`a ${home.role} signs in with a password and lands on their home`, async ({ page }) => {
		await signInWithPassword(page, home.email);
		await expect(page).toHaveURL(new RegExp(`${home.path}$`));
		await expect(page.getByRole('heading', { level: 1 })).toHaveText(home.heading);
		// Navigation offers only what the role may use.
		const nav = page.getByRole('navigation', { name: 'Main' });
		for (const other of HOMES.filter((h) => h.role !== home.role)) {
			await expect(nav.locator(`a[href="${other.path}"]`)).toHaveCount(0);
		}
		await page.getByRole('button', { name: 'Sign out' }).click();
		await expect(page).toHaveURL(/\/signin$/);
		const after = await page.request.get(home.path, { maxRedirects: 0 });
		expect(after.status()).toBe(303);
	});
}

test('the patient home carries the standing caution', async ({ page }) => {
	await signInWithPassword(page, ACCOUNTS.patient);
	await expect(page.getByRole('complementary', { name: 'When to stop' })).toContainText(
		'sharp or getting worse'
	);
});

test('signing in by the e-mailed link works once', async ({ page, browser }) => {
	const since = Date.now();
	await open(page, '/signin');
	const form = page.locator('form[action="?/link"]');
	await form.getByLabel('E-mail address').fill(ACCOUNTS.clinician);
	await form.getByRole('button', { name: 'Send me a sign-in link' }).click();
	await expect(page.getByRole('heading', { name: 'Check your e-mail' })).toBeVisible();

	const mail = await waitForMail(ACCOUNTS.clinician, since);
	expect(mail.subject).toBe('Your Kinelume sign-in link');
	const link = firstLink(mail.text, '/auth/callback/nodemailer');
	await open(page, link);
	await expect(page).toHaveURL(/\/patients$/);

	// The same link a second time, in a fresh browser, is refused with a clear sentence.
	const fresh = await browser.newContext({ baseURL: E2E.origin });
	const again = await fresh.newPage();
	await open(again, link);
	await expect(again).toHaveURL(/\/signin\?error=Verification/);
	await expect(again.getByRole('alert')).toContainText('expired or was already used');
	await fresh.close();
});

test('an unknown address and a wrong password get the same message', async ({ page }) => {
	await signInWithPassword(page, 'nobody@nowhere.example', 'whatever-password', false);
	const unknown = await page.getByRole('alert').textContent();
	await signInWithPassword(page, ACCOUNTS.educator, 'wrong-password-here', false);
	const wrong = await page.getByRole('alert').textContent();
	expect(unknown).toContain('do not match an account');
	expect(wrong).toBe(unknown);
});

test('asking a link for an unknown address says the same as for a known one and sends nothing', async ({
	page
}) => {
	const since = Date.now();
	await open(page, '/signin');
	const form = page.locator('form[action="?/link"]');
	await form.getByLabel('E-mail address').fill('stranger@nowhere.example');
	await form.getByRole('button', { name: 'Send me a sign-in link' }).click();
	await expect(page.getByRole('heading', { name: 'Check your e-mail' })).toBeVisible();
	await expect(waitForMail('stranger@nowhere.example', since)).rejects.toThrow('No e-mail');
});

test('a malformed sign-in form gets a clear message', async ({ request }) => {
	const response = await request.post('/signin?/password', {
		form: { providerId: 'credentials', email: 'not-an-address', password: '' },
		headers: { Origin: E2E.origin, Accept: 'text/html' },
		maxRedirects: 0
	});
	expect(response.status()).toBe(400);
	expect(await response.text()).toContain('Enter your e-mail address and your password.');
});

test('a form post from a foreign origin is refused', async ({ request }) => {
	const response = await request.post('/signin?/password', {
		form: { providerId: 'credentials', email: ACCOUNTS.admin, password: DEMO_PASSWORD },
		headers: { Origin: 'https://attacker.example', Accept: 'text/html' },
		maxRedirects: 0
	});
	expect(response.status()).toBe(403);
	expect(response.headers()['set-cookie'] ?? '').not.toContain('session-token');
});

test('six wrong passwords in a row give 429 with Retry-After, and the right one waits too', async ({
	request
}) => {
	const attempt = (password: string) =>
		request.post('/signin?/password', {
			form: { providerId: 'credentials', email: ACCOUNTS.otherPatient, password },
			headers: { Origin: E2E.origin, Accept: 'text/html' },
			maxRedirects: 0
		});
	for (let i = 1; i <= 5; i++)
		expect((await attempt(`wrong-${i}-password`)).status(), `attempt ${i}`).toBe(400);
	const sixth = await attempt('wrong-6-password');
	expect(sixth.status()).toBe(429);
	const retryAfter = Number(sixth.headers()['retry-after']);
	expect(retryAfter).toBeGreaterThan(800);
	expect(retryAfter).toBeLessThanOrEqual(900);
	expect(await sixth.text()).toContain('Too many failed sign-ins');
	// Locked means locked: even the right password waits, so guessing cannot continue.
	expect((await attempt(DEMO_PASSWORD)).status()).toBe(429);
});

test('sign-in links are limited per address, with the same answer past the limit', async ({
	request
}) => {
	const since = Date.now();
	const ask = () =>
		request.post('/signin?/link', {
			form: { providerId: 'nodemailer', email: ACCOUNTS.otherClinicClinician, redirectTo: '/home' },
			headers: { Origin: E2E.origin, Accept: 'text/html' },
			maxRedirects: 0
		});
	for (let i = 1; i <= 6; i++) {
		const response = await ask();
		expect(response.status(), `request ${i}`).toBe(303);
		expect(response.headers().location).toBe('/signin/link-sent');
	}
	// Five links arrive; the sixth request was answered alike but sent nothing.
	await expect
		.poll(async () => {
			const list = (await (await fetch(`${E2E.mailApi}/messages`)).json()) as {
				to: string[];
				subject: string;
				date: string;
			}[];
			return list.filter(
				(m) =>
					m.to.includes(ACCOUNTS.otherClinicClinician) &&
					m.subject === 'Your Kinelume sign-in link' &&
					new Date(m.date).getTime() >= since - 1000
			).length;
		})
		.toBe(5);
	await new Promise((r) => setTimeout(r, 1000));
	const list = (await (await fetch(`${E2E.mailApi}/messages`)).json()) as {
		to: string[];
		subject: string;
		date: string;
	}[];
	// Only this test's sign-in links count: the weekly digest may reach the same clinician during
	// the run, and an earlier run on the same data sent links of its own.
	expect(
		list.filter(
			(m) =>
				m.to.includes(ACCOUNTS.otherClinicClinician) &&
				m.subject === 'Your Kinelume sign-in link' &&
				new Date(m.date).getTime() >= since - 1000
		)
	).toHaveLength(5);
});

test('a sign-in with two problems says each beside its field, with and without scripts, and never sends the password back', async ({
	browser
}) => {
	const tooLong = 'p'.repeat(1025);
	for (const javaScriptEnabled of [true, false]) {
		const context = await browser.newContext({ baseURL: E2E.origin, javaScriptEnabled });
		const page = await context.newPage();
		if (javaScriptEnabled) await open(page, '/signin');
		else await page.goto('/signin');
		const form = page.locator('form[action="?/password"]');
		await form.getByLabel('E-mail address').fill('someone@nowhere');
		await form.getByLabel('Password').fill(tooLong);
		await form.getByRole('button', { name: 'Sign in' }).click();

		const email = form.getByLabel('E-mail address');
		const password = form.getByLabel('Password');
		await expect(email).toHaveAccessibleDescription('Enter a valid e-mail address.');
		await expect(password).toHaveAccessibleDescription(
			'A password here has at most 1,024 characters.'
		);
		const box = (label: string) =>
			form.locator('.field').filter({ has: page.getByLabel(label, { exact: true }) });
		await expect(box('E-mail address')).toContainText('Enter a valid e-mail address.');
		await expect(box('E-mail address')).not.toContainText('1,024 characters');
		await expect(box('Password')).toContainText('A password here has at most 1,024 characters.');
		await expect(form.getByRole('alert')).toContainText(
			'Enter your e-mail address and your password.'
		);
		await expect(form.getByRole('alert')).toContainText(
			'E-mail address: Enter a valid e-mail address.'
		);
		// What was typed comes back, except the password, which is nowhere in the page.
		await expect(email).toHaveValue('someone@nowhere');
		await expect(password).toHaveValue('');
		expect(await page.content()).not.toContain(tooLong);
		if (javaScriptEnabled) await expectNoAxeViolations(page);
		await context.close();
	}
});
