/**
 * The library's forms written with superforms and the Field components (the submission form, the
 * review desk's decision, a collection's own page): a refusal shows every problem beside its own
 * field (tied to it, so a screen reader reads it with the field), keeps what was typed, and works
 * the same with scripts off.
 */
import { expect, test, type Browser, type Page } from '@playwright/test';
import { seedCollection, seedExercise, seedSubmission } from './library-support';
import { seedReadySegment } from './segments-support';
import {
	ACCOUNTS,
	expectNoAxeViolations,
	seedReadyRecording,
	signInWithPassword,
	visit
} from './support';
import { E2E } from './ports';

/** The field's own box: its label, input and problems. */
const fieldBox = (page: Page, label: string | RegExp) =>
	page.locator('.field').filter({ has: page.getByLabel(label, { exact: true }) });

/** Runs `check` once with scripts and once without, each in a browser of its own. */
async function withAndWithoutScripts(
	browser: Browser,
	email: string,
	check: (page: Page, javaScriptEnabled: boolean) => Promise<void>
) {
	for (const javaScriptEnabled of [true, false]) {
		const context = await browser.newContext({ baseURL: E2E.origin, javaScriptEnabled });
		const page = await context.newPage();
		await signInWithPassword(page, email);
		await check(page, javaScriptEnabled);
		await context.close();
	}
}

async function open(page: Page, path: string, javaScriptEnabled: boolean) {
	if (javaScriptEnabled) await visit(page, path);
	else await page.goto(path);
}

let exerciseId: string;
let segmentId: string;

test.beforeAll(async () => {
	test.setTimeout(120_000);
	const recordingId = await seedReadyRecording(ACCOUNTS.clinician);
	segmentId = await seedReadySegment(recordingId, {
		title: 'Form checks',
		start: 0,
		end: 1,
		cues: [{ id: '1', start: 0, end: 1, text: 'Slide your heel.' }]
	});
	exerciseId = seedExercise(segmentId, { title: 'Heel slides for the form checks' });
});

test('a submission with a short title and too many key points says both, beside their fields', async ({
	browser
}) => {
	const cues = Array.from({ length: 21 }, (_, i) => `Key point ${i + 1}`).join('\n');
	await withAndWithoutScripts(browser, ACCOUNTS.clinician, async (page, scripts) => {
		await open(page, `/exercises/${exerciseId}/submit`, scripts);
		await page.getByLabel('Title').fill('x');
		await page.getByLabel('Key points (one a line)').fill(cues);
		await page.getByLabel(/Everyone who can be seen or heard/).check();
		await page.getByRole('button', { name: 'Submit for review' }).click();

		await expect(page.getByRole('alert')).toContainText('Nothing was sent yet.');
		await expect(page.getByRole('alert')).toContainText('Key points (one a line): At most 20');
		await expect(page.getByLabel('Title')).toHaveAccessibleDescription(
			'Give the exercise a title of at least 3 characters.'
		);
		await expect(fieldBox(page, 'Title')).toContainText('at least 3 characters');
		await expect(fieldBox(page, 'Title')).not.toContainText('key points');
		await expect(page.getByLabel('Key points (one a line)')).toHaveAccessibleDescription(
			'At most 20 key points.'
		);
		await expect(fieldBox(page, 'Key points (one a line)')).toContainText('At most 20 key points.');
		await expect(page.getByLabel('Credit line shown with the exercise')).not.toHaveAttribute(
			'aria-invalid'
		);
		// What was typed stays, the tick included.
		await expect(page.getByLabel('Title')).toHaveValue('x');
		await expect(page.getByLabel('Key points (one a line)')).toHaveValue(cues);
		await expect(page.getByLabel(/Everyone who can be seen or heard/)).toBeChecked();
		if (scripts) await expectNoAxeViolations(page);
	});
});

test('an approval with judgement unconfirmed and a check failing says each beside its own choice', async ({
	browser
}) => {
	await withAndWithoutScripts(browser, ACCOUNTS.educator, async (page, scripts) => {
		// A submission whose public words carry a telephone number: its patient data check fails.
		const submissionId = seedSubmission(
			seedExercise(segmentId, { title: `Heel slides, ring 0161 496 0${scripts ? 123 : 456}` }),
			ACCOUNTS.clinician
		);
		await open(page, `/curate/submissions/${submissionId}`, scripts);
		await page
			.getByLabel('The demonstration is safe to copy at home and matches its words')
			.check();
		await page.getByLabel('Approve and publish').check();
		await page.getByLabel('Comment to the clinician').fill('Looks good.');
		await page.getByRole('button', { name: 'Record the decision' }).click();

		await expect(page.getByRole('alert')).toContainText('Not saved:');
		const judgement = page.getByRole('group', { name: 'Your own judgement (needed to approve)' });
		const decision = page.getByRole('group', { name: 'Decision' });
		await expect(judgement).toContainText(
			'Confirm: the words suit the public: nothing only one clinic or one patient would follow.'
		);
		await expect(judgement).toContainText(
			'Confirm: nothing on screen or in the sound identifies a patient.'
		);
		await expect(judgement).not.toContainText('Confirm: the demonstration is safe');
		await expect(judgement).not.toContainText('Not yet met');
		await expect(decision).toContainText('Not yet met: no patient data');
		await expect(decision).not.toContainText('Confirm:');
		await expect(decision).toHaveAccessibleDescription(/Not yet met: no patient data/);
		// What was chosen and typed stays.
		await expect(
			page.getByLabel('The demonstration is safe to copy at home and matches its words')
		).toBeChecked();
		await expect(page.getByLabel('Approve and publish')).toBeChecked();
		await expect(page.getByLabel('Comment to the clinician')).toHaveValue('Looks good.');
		await expect(page.getByRole('heading', { name: /Review: Heel slides, ring/ })).toBeVisible();
		if (scripts) await expectNoAxeViolations(page);
	});
});

test("a collection's title too short and introduction too long are said together, beside them", async ({
	browser
}) => {
	const tooLong = 'Slowly. '.repeat(760);
	await withAndWithoutScripts(browser, ACCOUNTS.educator, async (page, scripts) => {
		const run = crypto.randomUUID().slice(0, 8);
		const { id } = seedCollection(`Form checks ${run}`, `form-checks-${run}`, 'draft', []);
		await open(page, `/curate/collections/${id}`, scripts);
		await page.getByLabel('Title', { exact: true }).fill('ab');
		// Longer than the box takes when typed, as a client without the limit would post it.
		await page
			.getByLabel('Introduction', { exact: true })
			.evaluate((box) => box.removeAttribute('maxlength'));
		await page.getByLabel('Introduction', { exact: true }).fill(tooLong);
		await page.getByRole('button', { name: 'Save', exact: true }).click();

		await expect(page.getByRole('alert')).toContainText('Not saved: 2 problems.');
		await expect(page.getByLabel('Title', { exact: true })).toHaveAccessibleDescription(
			'Give the collection a title of at least 3 characters.'
		);
		await expect(fieldBox(page, 'Title')).not.toContainText('introduction');
		await expect(fieldBox(page, 'Introduction')).toContainText(
			'Keep the introduction under 6,000 characters.'
		);
		await expect(page.getByLabel('Title', { exact: true })).toHaveValue('ab');
		await expect(page.getByRole('heading', { name: `Form checks ${run}`, level: 1 })).toBeVisible();
		if (scripts) await expectNoAxeViolations(page);
	});
});
