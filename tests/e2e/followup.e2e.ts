import { expect, test, type Page } from '@playwright/test';
import { addDays } from '../../src/lib/clinical/calendar';
import {
	daysBack,
	londonToday,
	seedCaseloadPatient,
	seedSessionLogs,
	signInAs
} from './followup-support';
import { seedProgramme } from './programme-fixtures';
import { ACCOUNTS, expectNoAxeViolations, visit, open } from './support';

/**
 * Follow-up in the browser: the caseload's sorting, filters and pages (server-rendered, so the
 * links and the GET form work as they are), a patient's charts with the tables behind them, and
 * range-of-motion readings with their comparisons and flags.
 */

let risingId: string;
let steadyId: string;

// Names of this run's own people: a rerun on the same data (or a worker restarted after a
// failure, which runs beforeAll again) seeds new ones instead of doubling these.
const RUN = crypto.randomUUID().slice(0, 4).toUpperCase();
const MABEL = `Mabel Thorne ${RUN}`;
const NORMAN = `Norman Pike ${RUN}`;
const HARBOUR = `Harbour Patient ${RUN}`;

test.beforeAll(() => {
	const today = londonToday();
	const start = addDays(today, -27);
	// Pain 2 in the first week, 3 after, 6 in the last 7 days (3 points over the 7 before), every day.
	risingId = seedCaseloadPatient(ACCOUNTS.clinician, { name: MABEL });
	const rising = seedProgramme(
		risingId,
		[{ title: 'Knee bends (follow-up e2e)', sessionsPerDay: 1, daysPerWeek: 7 }],
		{
			startDate: start,
			title: 'Knee home programme'
		}
	);
	seedSessionLogs(risingId, rising.itemIds[0], [
		...daysBack(27, 21).map((date) => ({ date, pain: 2 })),
		...daysBack(20, 7).map((date) => ({ date, pain: 3 })),
		...daysBack(6, 0).map((date) => ({ date, pain: 6 }))
	]);
	// Five of the six whole days before today, nothing yet today, pain steady.
	steadyId = seedCaseloadPatient(ACCOUNTS.clinician, { name: NORMAN });
	const steady = seedProgramme(
		steadyId,
		[{ title: 'Thigh tightening (follow-up e2e)', sessionsPerDay: 1, daysPerWeek: 7 }],
		{
			startDate: start
		}
	);
	seedSessionLogs(steadyId, steady.itemIds[0], [
		...daysBack(27, 7).map((date) => ({ date, pain: 2 })),
		...[6, 5, 3, 2, 1].map((n) => ({ date: addDays(today, -n), pain: 2 }))
	]);
	// Enough patients in the other clinic for two pages of 25.
	for (let i = 1; i <= 27; i++) {
		seedCaseloadPatient(ACCOUNTS.otherClinicClinician, {
			name: `${HARBOUR} ${String(i).padStart(2, '0')}`,
			operationDaysAgo: i
		});
	}
});

function rowOf(page: Page, name: string) {
	return page.getByRole('row').filter({ has: page.getByRole('rowheader', { name }) });
}

test('the caseload shows adherence, pain flags with their basis, and sorts and filters', async ({
	page
}) => {
	await signInAs(page, ACCOUNTS.clinician);
	await visit(page, '/caseload');
	await expect(page.getByRole('heading', { name: 'Caseload' })).toBeVisible();

	const rising = rowOf(page, MABEL);
	await expect(rising).toContainText('100%');
	await expect(rising).toContainText('7 of 7 sessions, ');
	await expect(rising).toContainText('Pain rising');
	await expect(rising).toContainText(
		'Pain flag: recent average 6.0 is 3.0 above the 7 days before (3.0) (a rise of 2 points or 30% is clinically important — Farrar et al. 2001, found for a fall in pain).'
	);
	await expect(rising).toContainText('Week 6');
	const steady = rowOf(page, NORMAN);
	await expect(steady).toContainText('83%');
	await expect(steady).toContainText('5 of 6 sessions, ');
	await expect(steady).toContainText('None');
	// Another clinic's patients never appear.
	await expect(page.getByText(`${HARBOUR} 01`)).toHaveCount(0);
	await expect(page.getByRole('heading', { name: 'How these figures are counted' })).toBeVisible();
	await expectNoAxeViolations(page);

	// Sort by 7-day adherence, lowest first, by the column's link.
	await page.getByRole('link', { name: /Adherence, 7 days/ }).click();
	await expect(page).toHaveURL(/sort=adherence7&dir=asc/);
	await expect(page.getByRole('columnheader', { name: /Adherence, 7 days/ })).toHaveAttribute(
		'aria-sort',
		'ascending'
	);
	const names = await page.getByRole('rowheader').allInnerTexts();
	const order = names.map((n) => n.split('\n')[0]);
	expect(order.indexOf(NORMAN)).toBeLessThan(order.indexOf(MABEL));

	// Filter by flag with the form, then search by name.
	await page.getByLabel('Flags').selectOption('pain-rise');
	await page.getByRole('button', { name: 'Show' }).click();
	await expect(page).toHaveURL(/flag=pain-rise/);
	await expect(rowOf(page, MABEL)).toBeVisible();
	await expect(rowOf(page, NORMAN)).toHaveCount(0);
	await page.getByLabel('Flags').selectOption('all');
	await page.getByLabel('Name').fill(NORMAN.toLowerCase());
	await page.getByLabel('Name').press('Enter');
	await expect(page).toHaveURL(/q=norman/);
	await expect(page.getByRole('rowheader')).toHaveCount(1);
	await expect(rowOf(page, NORMAN)).toBeVisible();
	await page.getByLabel('Name').fill('Harbour');
	await page.getByLabel('Name').press('Enter');
	await expect(page.getByText('No patient matches this filter.')).toBeVisible();
});

test('the caseload pages by 25 and sorts by name both ways', async ({ page }) => {
	await signInAs(page, ACCOUNTS.otherClinicClinician);
	await visit(page, `/caseload?q=${encodeURIComponent(HARBOUR)}`);
	await expect(page.getByRole('heading', { name: '27 patients match' })).toBeVisible();
	await expect(page.getByRole('rowheader')).toHaveCount(25);
	await expect(page.getByText('Page 1 of 2')).toBeVisible();
	await page.getByRole('link', { name: 'Next' }).click();
	await expect(page).toHaveURL(/page=2/);
	await expect(page.getByRole('rowheader')).toHaveCount(2);
	await expect(page.getByRole('rowheader').first()).toContainText(`${HARBOUR} 26`);
	// Sorting starts again at the first page.
	await page.getByRole('link', { name: /^Patient.*sort/ }).click();
	await expect(page).toHaveURL(/sort=name&dir=desc/);
	await expect(page).not.toHaveURL(/page=/);
	await expect(page.getByRole('rowheader').first()).toContainText(`${HARBOUR} 27`);
	// By week after the operation, soonest first (patient 01 was operated on a day ago).
	await page.getByRole('link', { name: /Since operation/ }).click();
	await expect(page.getByRole('rowheader').first()).toContainText(`${HARBOUR} 01`);
	await expect(page.getByText(MABEL)).toHaveCount(0);
});

/** The number of painted pixels on a chart's canvas (0 until chart.js has drawn). */
async function paintedPixels(page: Page, chart: string): Promise<number> {
	return page.locator(`[data-chart="${chart}"] canvas`).evaluate((node) => {
		const canvas = node as HTMLCanvasElement;
		const context = canvas.getContext('2d');
		if (!context || canvas.width === 0) return 0;
		const { data } = context.getImageData(0, 0, canvas.width, canvas.height);
		let painted = 0;
		for (let i = 3; i < data.length; i += 4) if (data[i] > 0) painted++;
		return painted;
	});
}

test('a patient page draws its charts, each with a table of the same numbers', async ({ page }) => {
	await signInAs(page, ACCOUNTS.clinician);
	await visit(page, `/patients/${risingId}`);
	await expect(page.getByRole('heading', { name: MABEL })).toBeVisible();
	await expect(page.getByRole('link', { name: 'Knee home programme' })).toBeVisible();
	await expect(page.getByRole('link', { name: 'New programme' })).toHaveAttribute(
		'href',
		`/programmes/new?patient=${risingId}`
	);
	await expect(
		page.getByText('Pain flag: recent average 6.0 is 3.0 above the 7 days before (3.0)').first()
	).toBeVisible();

	for (const chart of ['adherence-chart', 'pain-chart']) {
		await expect.poll(() => paintedPixels(page, chart), { message: chart }).toBeGreaterThan(500);
	}
	const adherence = page.locator('[data-chart="adherence-chart"]');
	await expect(adherence.getByRole('img')).toHaveAccessibleName(/Adherence per week/);
	// The programme started 27 days ago: four or five calendar weeks, each a row.
	const weeks = await adherence.locator('tbody tr').count();
	expect(weeks).toBeGreaterThanOrEqual(4);
	expect(weeks).toBeLessThanOrEqual(5);
	const pain = page.locator('[data-chart="pain-chart"]');
	await expect(pain.locator('tbody tr')).toHaveCount(28);
	await expect(pain.locator('tbody tr').last()).toContainText('6.0');
	// The newest 20 logs first (today's, pain 6), then every one on request.
	const logs = page.getByRole('table', { name: 'Session logs (28)' });
	await expect(logs.locator('tbody tr')).toHaveCount(20);
	await expect(logs.locator('tbody tr').first().locator('td').nth(2)).toHaveText('6');
	await expectNoAxeViolations(page);
	await page.getByRole('link', { name: 'Show all 28' }).click();
	await expect(logs.locator('tbody tr')).toHaveCount(28);
});

test('range-of-motion readings compare with normal, the other side and the measurement error', async ({
	page
}) => {
	const today = londonToday();
	await signInAs(page, ACCOUNTS.clinician);
	await visit(page, `/patients/${steadyId}`);
	const form = page.getByRole('form', { name: 'Add a reading' });

	async function addReading(side: 'Left (affected)' | 'Right', degrees: string, date: string) {
		await form.getByLabel('Motion').selectOption('knee-flexion');
		await form.getByLabel(side).check();
		await form.getByLabel('Active').check();
		await form.getByLabel('Measured on').fill(date);
		await form.getByLabel('Degrees').fill(degrees);
		await form.getByLabel('Degrees').press('Enter');
		await expect(form.getByRole('status')).toContainText(`${degrees}° saved.`);
		// Ready for the next reading: Degrees is empty and focused, the motion kept.
		await expect(form.getByLabel('Degrees')).toBeFocused();
		await expect(form.getByLabel('Degrees')).toHaveValue('');
		await expect(form.getByLabel('Motion')).toHaveValue('knee-flexion');
	}

	await addReading('Right', '117', addDays(today, -14));
	await addReading('Left (affected)', '95', addDays(today, -14));
	const readings = page.getByRole('table', { name: 'Range of motion' });
	await expect(readings).toContainText('Knee flexion 95° = 70% of the AAOS normal 135°');
	await expect(readings).toContainText('81% of the right side (117°)');

	await addReading('Left (affected)', '101', addDays(today, -7));
	await expect(readings).toContainText(
		'is within the measurement error (±10°) — not counted as a change.'
	);
	await expect(page.getByText('Range of motion lost')).toHaveCount(0);

	await addReading('Left (affected)', '88', today);
	await expect(readings).toContainText('Loss of 13°');
	await expect(page.getByText('Range of motion lost')).toBeVisible();

	// A reading that cannot be read is refused with the reason, and what was typed stays.
	await form.getByLabel('Note (optional)').fill('after a long walk');
	await form.getByLabel('Degrees').fill('ninety');
	await form.getByLabel('Degrees').press('Enter');
	await expect(form.getByRole('alert')).toContainText('Give the degrees measured, e.g. 95 or -5.');
	await expect(form.getByLabel('Degrees')).toBeFocused();
	await expect(form.getByLabel('Degrees')).toHaveValue('ninety');
	await expect(form.getByLabel('Note (optional)')).toHaveValue('after a long walk');

	// Another normative table: the AMA Guides list no knee values.
	await page.getByLabel('Normal values from').selectOption('ama');
	await page.getByRole('button', { name: 'Compare' }).click();
	await expect(page).toHaveURL(/norms=ama/);
	await expect(readings).toContainText('The AMA Guides table has no value for knee flexion');

	// The chart of the motion and its table.
	const chart = page.locator('[data-chart="rom-chart-knee-flexion"]');
	await expect.poll(() => paintedPixels(page, 'rom-chart-knee-flexion')).toBeGreaterThan(500);
	await expect(chart.locator('tbody tr')).toHaveCount(4);
	await expectNoAxeViolations(page);

	// The caseload carries the range-of-motion flag too.
	await visit(page, '/caseload?flag=rom-loss');
	await expect(rowOf(page, NORMAN)).toContainText('Range of motion lost');
});

test("another clinic's patient page is not found", async ({ page }) => {
	await signInAs(page, ACCOUNTS.otherClinicClinician);
	const response = await open(page, `/patients/${risingId}`);
	expect(response?.status()).toBe(404);
	const api = await page.request.get(`/api/patients/${risingId}/followup.json`);
	expect(api.status()).toBe(404);
	expect(await api.json()).toEqual({ error: { status: 404, message: 'Not found.' } });
});
