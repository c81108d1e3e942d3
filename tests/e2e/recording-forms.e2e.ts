/**
 * The recording pages' forms written with superforms and the Field components (a recording's
 * rename and caption import, its captions page's new track and file import): a refusal shows
 * every problem beside its own field (tied to it, so a screen reader reads it with the field),
 * keeps what was typed, and works the same with scripts off.
 */
import { expect, test, type Browser, type Page } from '@playwright/test';
import {
	ACCOUNTS,
	expectNoAxeViolations,
	seedCaptionTrack,
	seedReadyRecording,
	signInWithPassword,
	visit
} from './support';
import { E2E } from './ports';

/** The field's own box: its label, input and problems. */
const fieldBox = (page: Page, label: string) =>
	page.locator('.field').filter({ has: page.getByLabel(label, { exact: true }) });

/** Runs `check` once with scripts and once without, each in a browser of its own. */
async function withAndWithoutScripts(
	browser: Browser,
	check: (page: Page, scripts: boolean) => Promise<void>
) {
	for (const javaScriptEnabled of [true, false]) {
		const context = await browser.newContext({ baseURL: E2E.origin, javaScriptEnabled });
		const page = await context.newPage();
		await signInWithPassword(page, ACCOUNTS.clinician);
		await check(page, javaScriptEnabled);
		await context.close();
	}
}

async function open(page: Page, path: string, scripts: boolean) {
	if (scripts) await visit(page, path);
	else await page.goto(path);
}

const NOT_A_TAG = 'English please';
const NOT_A_TAG_PROBLEM = `“${NOT_A_TAG}” is not a language tag. Use a BCP 47 tag such as en, en-GB or cy.`;

let recordingId: string;

test.beforeAll(async () => {
	recordingId = await seedReadyRecording(ACCOUNTS.clinician);
	seedCaptionTrack(recordingId);
});

test('a new track with a wrong language and too long a name says both, beside their fields', async ({
	browser
}) => {
	const name = 'A name far longer than anyone would read under a video. '.repeat(2);
	await withAndWithoutScripts(browser, async (page, scripts) => {
		await open(page, `/recordings/${recordingId}/captions`, scripts);
		await page.getByLabel('Kind').selectOption('subtitles');
		await page.getByLabel('Language', { exact: true }).fill(NOT_A_TAG);
		await page.getByLabel('Name shown to viewers (optional)').fill(name);
		await page.getByRole('button', { name: 'Make track' }).click();

		await expect(page.getByRole('alert')).toContainText('Not saved: 2 problems.');
		await expect(fieldBox(page, 'Language')).toContainText(NOT_A_TAG_PROBLEM);
		await expect(fieldBox(page, 'Language')).not.toContainText('100 characters');
		await expect(page.getByLabel('Language', { exact: true })).toHaveAccessibleDescription(
			`For example en-GB, cy or pl. ${NOT_A_TAG_PROBLEM}`
		);
		await expect(page.getByLabel('Name shown to viewers (optional)')).toHaveAccessibleDescription(
			'Keep the name to 100 characters.'
		);
		await expect(fieldBox(page, 'Name shown to viewers (optional)')).not.toContainText(
			'language tag'
		);
		await expect(page.getByLabel('Kind')).not.toHaveAttribute('aria-invalid');
		// What was typed stays.
		await expect(page.getByLabel('Kind')).toHaveValue('subtitles');
		await expect(page.getByLabel('Language', { exact: true })).toHaveValue(NOT_A_TAG);
		await expect(page.getByLabel('Name shown to viewers (optional)')).toHaveValue(name);
		if (scripts) await expectNoAxeViolations(page);
	});
});

test('a file that is no caption file is refused beside the file field', async ({ browser }) => {
	await withAndWithoutScripts(browser, async (page, scripts) => {
		await open(page, `/recordings/${recordingId}/captions`, scripts);
		await page.getByLabel('Caption file').setInputFiles({
			name: 'notes.txt',
			mimeType: 'text/plain',
			buffer: Buffer.from('Sit to stand, ten times.')
		});
		await page.getByRole('button', { name: 'Import', exact: true }).click();

		const problem =
			'“notes.txt” is not a caption file Kinelume reads. Choose a WebVTT (.vtt) or SRT (.srt) file.';
		await expect(page.getByRole('alert')).toContainText('Not saved: one problem.');
		await expect(fieldBox(page, 'Caption file')).toContainText(problem);
		await expect(page.getByLabel('Caption file')).toHaveAccessibleDescription(problem);
		if (scripts) await expectNoAxeViolations(page);
	});
});

test('a blank title is refused beside the title field', async ({ browser }) => {
	await withAndWithoutScripts(browser, async (page, scripts) => {
		await open(page, `/recordings/${recordingId}`, scripts);
		await page.getByText('Rename', { exact: true }).click();
		await page.getByLabel('Title').fill('   ');
		await page.getByRole('button', { name: 'Save title' }).click();

		await expect(page.getByRole('alert')).toContainText('Not saved: one problem.');
		await expect(fieldBox(page, 'Title')).toContainText('Give the recording a title.');
		await expect(page.getByLabel('Title')).toHaveAccessibleDescription(
			'Give the recording a title.'
		);
		if (scripts) await expectNoAxeViolations(page);
	});
});

test('a caption import with no file and a wrong language says both, beside their fields', async ({
	browser
}) => {
	await withAndWithoutScripts(browser, async (page, scripts) => {
		await open(page, `/recordings/${recordingId}`, scripts);
		await page.getByLabel('Language of the captions').fill(NOT_A_TAG);
		await page.getByRole('button', { name: 'Import captions' }).click();

		await expect(page.getByRole('alert')).toContainText('Not saved: 2 problems.');
		const file = 'Import a caption file (.vtt or .srt)';
		await expect(fieldBox(page, file)).toContainText('Choose a .vtt or .srt file to import.');
		await expect(fieldBox(page, file)).not.toContainText('language tag');
		await expect(page.getByLabel(file)).toHaveAccessibleDescription(
			'Choose a .vtt or .srt file to import.'
		);
		await expect(fieldBox(page, 'Language of the captions')).toContainText(NOT_A_TAG_PROBLEM);
		await expect(fieldBox(page, 'Language of the captions')).not.toContainText('Choose a');
		await expect(page.getByLabel('Language of the captions')).toHaveAccessibleDescription(
			new RegExp(NOT_A_TAG_PROBLEM.replace(/[.()]/g, '\\$&'))
		);
		// What was typed stays.
		await expect(page.getByLabel('Language of the captions')).toHaveValue(NOT_A_TAG);
		if (scripts) await expectNoAxeViolations(page);
	});
});
