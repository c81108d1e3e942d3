/**
 * The library's forms written with superforms and the Field components (the submission form, the
 * review desk's decision, a collection's own page): a refusal shows every problem beside its own
 * field (tied to it, so a screen reader reads it with the field), keeps what was typed, and works
 * the same with scripts off.
 */
import { expect, test, type Browser, type Page } from '@playwright/test';
import { seedExercise } from './library-support';
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

test.beforeAll(async () => {
	test.setTimeout(120_000);
	const recordingId = await seedReadyRecording(ACCOUNTS.clinician);
	const segmentId = await seedReadySegment(recordingId, {
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

		await expect(page.getByRole('alert')).toContainText('Not saved: 2 problems.');
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
