import { expect, request, test } from '@playwright/test';
import {
	ACCOUNTS,
	database,
	expectNoAxeViolations,
	firstLink,
	signedInRequest,
	signInWithPassword,
	waitForMail,
	open,
	reload
} from './support';
import { E2E } from './ports';

// People of this run's own: the suite can run again on the same data without meeting them twice.
const RUN = crypto.randomUUID().slice(0, 4).toUpperCase();
const NEWCOMER = `Noor Ashby ${RUN}`;
const JOINING_PATIENT = `Hattie Groves ${RUN}`;

test('an admin invites a clinician, who accepts and signs in; the link then is spent', async ({
	page,
	browser
}) => {
	const email = `new.physio.${Date.now()}@alder-street.example`;
	await signInWithPassword(page, ACCOUNTS.admin);
	await expect(page).toHaveURL(/\/clinic$/);
	const since = Date.now();
	const invite = page.locator('form[action="?/invite"]');
	await invite.getByLabel('E-mail address').fill(email);
	await invite.getByLabel('Role').selectOption('clinician');
	await invite.getByRole('button', { name: 'Send invitation' }).click();
	await expect(
		page.getByRole('status').filter({ hasText: `Invitation sent to ${email}` })
	).toBeVisible();
	await expect(
		page
			.getByRole('region', { name: /Pending invitations/ })
			.getByRole('cell', { name: email, exact: true })
	).toBeVisible();

	const mail = await waitForMail(email, since);
	expect(mail.subject).toContain('Alder Street Community Clinic');
	const link = firstLink(mail.text, '/invite/');

	const guest = await browser.newContext({ baseURL: E2E.origin });
	const newcomer = await guest.newPage();
	await open(newcomer, link);
	await expect(newcomer.getByRole('heading', { level: 1 })).toHaveText(
		'Join Alder Street Community Clinic'
	);
	await newcomer.getByLabel('Your name').fill(NEWCOMER);
	await newcomer.getByLabel('Choose a password').fill('a-long-enough-secret');
	await newcomer.getByLabel('Type the password again').fill('a-long-enough-secret');
	await newcomer.getByRole('button', { name: 'Accept and create my account' }).click();
	await expect(newcomer).toHaveURL(/\/signin\?welcome=1/);
	await signInWithPassword(newcomer, email, 'a-long-enough-secret');
	await expect(newcomer).toHaveURL(/\/patients$/);

	const reused = await newcomer.request.get(new URL(link).pathname);
	expect(reused.status()).toBe(410);
	expect(await reused.text()).toContain('already been used');
	await guest.close();

	await reload(page);
	await expect(page.getByRole('cell', { name: NEWCOMER, exact: true })).toBeVisible();
});

test('an expired invitation link is refused with a clear message and changes nothing', async ({
	page
}) => {
	const email = `late.${Date.now()}@alder-street.example`;
	await signInWithPassword(page, ACCOUNTS.admin);
	const since = Date.now();
	const invite = page.locator('form[action="?/invite"]');
	await invite.getByLabel('E-mail address').fill(email);
	await invite.getByRole('button', { name: 'Send invitation' }).click();
	const link = firstLink((await waitForMail(email, since)).text, '/invite/');

	const db = database();
	db.prepare('update invitation set expires_at = ? where email = ?').run(Date.now() - 1000, email);
	db.close();

	const response = await page.request.get(new URL(link).pathname);
	expect(response.status()).toBe(410);
	expect(await response.text()).toContain('has expired');
	const accepted = await page.request.post(new URL(link).pathname, {
		form: {
			name: 'Late Person',
			password: 'a-long-enough-secret',
			confirm: 'a-long-enough-secret'
		},
		headers: { Origin: E2E.origin, Accept: 'text/html' },
		maxRedirects: 0
	});
	expect(accepted.status()).toBe(410);
	const check = database();
	const users = check.prepare('select count(*) as n from user where email = ?').get(email) as {
		n: number;
	};
	check.close();
	expect(users.n).toBe(0);
});

test('a clinician invites a patient, who joins without a password, lands on Today, and later signs in by link', async ({
	page,
	browser
}) => {
	const email = `new.patient.${Date.now()}@alder-street.example`;
	await signInWithPassword(page, ACCOUNTS.clinician);
	const since = Date.now();
	const invite = page.locator('form[action="?/invite"]');
	await invite.getByLabel('Full name').fill(JOINING_PATIENT);
	await invite.getByLabel('E-mail address').fill(email);
	await invite.getByLabel('Operation or injury').fill('Left total knee replacement');
	await invite.getByLabel('Affected side').selectOption('left');
	await invite.getByRole('button', { name: 'Send invitation' }).click();
	const row = page.getByRole('row').filter({ hasText: JOINING_PATIENT });
	await expect(row.getByText('Invited')).toBeVisible();

	const link = firstLink((await waitForMail(email, since)).text, '/invite/');
	const guest = await browser.newContext({ baseURL: E2E.origin });
	const patient = await guest.newPage();
	await open(patient, link);
	await patient.getByLabel('Your name').fill(JOINING_PATIENT);
	await patient.getByRole('button', { name: 'Accept and create my account' }).click();
	// Accepting signs the patient in at once and opens their programme.
	await expect(patient).toHaveURL(/\/today$/);
	await expect(patient.getByRole('heading', { level: 1 })).toContainText('Hattie');

	// Later, without a password, they sign in with an e-mailed link.
	await patient.getByRole('button', { name: 'Sign out' }).click();
	// Signing out lands on the sign-in page; opening it before then would cut that navigation short.
	await patient.waitForURL((url) => url.pathname === '/signin');
	await patient.locator('html[data-started]').waitFor({ state: 'attached' });
	const linkSince = Date.now();
	const linkForm = patient.locator('form[action="?/link"]');
	await linkForm.getByLabel('E-mail address').fill(email);
	await linkForm.getByRole('button', { name: 'Send me a sign-in link' }).click();
	const signInLink = firstLink(
		(await waitForMail(email, linkSince, 'sign-in link')).text,
		'/auth/callback/nodemailer'
	);
	await open(patient, signInLink);
	await expect(patient).toHaveURL(/\/today$/);
	await expect(patient.getByRole('heading', { level: 1 })).toContainText('Hattie');
	await guest.close();

	await reload(page);
	await expect(
		page.getByRole('row').filter({ hasText: JOINING_PATIENT }).getByText('Signed up')
	).toBeVisible();
});

test('a malformed invitation form keeps what was typed and says what is wrong', async ({
	page
}) => {
	await signInWithPassword(page, ACCOUNTS.clinician);
	const response = await page.request.post('/patients?/invite', {
		form: { fullName: 'Someone', email: 'not-an-address', affectedSide: 'left', condition: '' },
		headers: { Origin: E2E.origin, Accept: 'text/html' },
		maxRedirects: 0
	});
	expect(response.status()).toBe(400);
	const html = await response.text();
	expect(html).toContain('Enter a valid e-mail address.');
	expect(html).toContain('value="Someone"');
});

test('accepting an invitation with two problems says each beside its field, with and without scripts', async ({
	browser
}) => {
	const email = `two.problems.${Date.now()}@alder-street.example`;
	const since = Date.now();
	const admin = await signedInRequest(ACCOUNTS.admin);
	const sent = await admin.post('/clinic?/invite', {
		form: { email, role: 'clinician' },
		headers: { Origin: E2E.origin, Accept: 'text/html' },
		maxRedirects: 0
	});
	expect(sent.status()).toBe(200);
	await admin.dispose();
	const link = firstLink((await waitForMail(email, since)).text, '/invite/');

	for (const javaScriptEnabled of [true, false]) {
		const context = await browser.newContext({ baseURL: E2E.origin, javaScriptEnabled });
		const page = await context.newPage();
		if (javaScriptEnabled) await open(page, link);
		else await page.goto(link);
		await page.getByLabel('Your name').fill('   ');
		await page.getByLabel('Choose a password').fill('a-long-enough-secret');
		await page.getByLabel('Type the password again').fill('a-long-enough-secreT');
		await page.getByRole('button', { name: 'Accept and create my account' }).click();

		await expect(page.getByRole('alert')).toContainText('Not saved: 2 problems.');
		const box = (label: string) =>
			page.locator('.field').filter({ has: page.getByLabel(label, { exact: true }) });
		await expect(page.getByLabel('Your name')).toHaveAccessibleDescription('Enter your name.');
		await expect(box('Your name')).toContainText('Enter your name.');
		await expect(box('Your name')).not.toContainText('differ');
		await expect(page.getByLabel('Type the password again')).toHaveAccessibleDescription(
			'The two passwords differ.'
		);
		await expect(box('Type the password again')).toContainText('The two passwords differ.');
		await expect(page.getByLabel('Choose a password')).not.toHaveAttribute('aria-invalid');
		// What was typed stays, except the passwords.
		await expect(page.getByLabel('Your name')).toHaveValue('   ');
		await expect(page.getByLabel('Choose a password')).toHaveValue('');
		if (javaScriptEnabled) await expectNoAxeViolations(page);
		await context.close();
	}
	// Refused, the link is still good.
	const anyone = await request.newContext({ baseURL: E2E.origin });
	expect((await anyone.get(new URL(link).pathname)).status()).toBe(200);
	await anyone.dispose();
});
