import { expect, test, type Page } from '@playwright/test';
import { execFile } from 'node:child_process';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { PutObjectCommand } from '@aws-sdk/client-s3';
import { addDays, localDateOf } from '../../src/lib/clinical/calendar';
import { replayCode } from '../../src/lib/programmes/replay-code';
import {
	ACCOUNTS,
	database,
	DEMO_PASSWORD,
	expectNoAxeViolations,
	seedReadyRecording,
	signInWithPassword,
	storageClient,
	open
} from './support';
import { seedReadySegment } from './segments-support';
import { seedProgramme, seedSignInPatient, type SeedItem } from './programme-fixtures';
import { FFMPEG } from '../integration/recordings-support';

const run = promisify(execFile);
const SHOTS = join(import.meta.dirname, '../.run/e2e-results');
// What this file makes is named per run, so the suite can run again on the same data.
const RUN = crypto.randomUUID().slice(0, 4).toUpperCase();
const LEAFLET = 'https://alder-street.example/leaflets/swelling';

/**
 * Six knee exercises as a clinician would prescribe them in the first weeks: four or five cues
 * each and safety notes of a few lines (one with a link), so the page count is measured on a
 * full sheet, not an empty one.
 */
const EXERCISES: (SeedItem & {
	cues: string[];
	position: string;
	movementType: string;
	equipment: string[];
})[] = [
	{
		title: `Heel slides ${RUN}`,
		position: 'supine',
		movementType: 'active-assisted',
		equipment: ['Towel'],
		cues: [
			'Slide the heel towards you slowly.',
			'Keep the heel on the bed the whole time.',
			'Stop at a firm stretch, not at pain.',
			'Breathe out as the knee bends.',
			'Slide back until the leg is straight.'
		],
		safetyNotes: `Stop if the knee swells or the pain is sharp. Read [the swelling leaflet](${LEAFLET}) before you start.`
	},
	{
		title: `Thigh squeezes ${RUN}`,
		position: 'supine',
		movementType: 'active',
		equipment: ['Rolled towel'],
		cues: [
			'Press the back of the knee into the towel.',
			'Pull the toes up towards you.',
			'Hold while you count slowly.',
			'Let go fully before the next one.'
		],
		safetyNotes: 'A little ache is normal. Stop if the pain stays after you rest.'
	},
	{
		title: `Straight leg raise ${RUN}`,
		position: 'supine',
		movementType: 'active',
		equipment: [],
		cues: [
			'Tighten the thigh first, then lift.',
			'Lift to the height of the other knee.',
			'Lower slowly, without dropping the leg.',
			'Keep the other knee bent.'
		],
		safetyNotes: 'If the knee bends as you lift, tighten the thigh again before the next one.'
	},
	{
		title: `Sit to stand ${RUN}`,
		position: 'seated',
		movementType: 'active',
		equipment: ['Firm chair'],
		cues: [
			'Shuffle forward to the edge of the chair.',
			'Lean forward, nose over toes.',
			'Push through both heels to stand.',
			'Reach back for the chair before you sit.'
		],
		safetyNotes:
			'Have someone nearby the first few times. Use the armrests if you feel unsteady, and stop if you feel dizzy.'
	},
	{
		title: `Ankle pumps ${RUN}`,
		position: 'supine',
		movementType: 'active',
		equipment: [],
		cues: [
			'Point the toes away from you.',
			'Pull the toes back towards you.',
			'Keep a steady rhythm.',
			'Do these every hour you are awake.'
		],
		safetyNotes: 'Tell the clinic the same day if the calf is hot, red or swollen.'
	},
	{
		title: `Standing knee bend ${RUN}`,
		position: 'standing',
		movementType: 'resisted',
		equipment: ['Kitchen worktop', 'Light band'],
		cues: [
			'Hold the worktop with both hands.',
			'Bend the knee, bringing the heel up behind you.',
			'Keep the knees side by side.',
			'Lower slowly.'
		],
		safetyNotes: 'Only with the band your clinician gave you. Stop if the back of the knee hurts.'
	}
];

let dir: string;
let patient: { patientId: string; email: string };
const programmes: Record<3 | 6, { programmeId: string; itemIds: string[] }> = {} as never;

/** A poster that is a real picture: a figure drawn by ffmpeg on the panel colour. */
async function poster(path: string) {
	await run(FFMPEG, [
		'-loglevel',
		'error',
		'-y',
		'-f',
		'lavfi',
		'-i',
		'color=c=0xe8eee9:s=640x360',
		'-vf',
		[
			'drawbox=x=120:y=250:w=400:h=24:color=0x5a6272:t=fill',
			'drawbox=x=170:y=200:w=40:h=40:color=0x1f4d3e:t=fill',
			'drawbox=x=210:y=214:w=150:h=18:color=0x1f4d3e:t=fill',
			'drawbox=x=360:y=190:w=18:h=44:color=0x1f4d3e:t=fill',
			'drawbox=x=378:y=190:w=110:h=18:color=0x1f4d3e:t=fill'
		].join(','),
		'-frames:v',
		'1',
		path
	]);
}

async function putPoster(segmentId: string, bytes: Uint8Array) {
	const db = database();
	const { clinicId, recordingId } = db
		.prepare('select clinic_id as clinicId, recording_id as recordingId from segment where id = ?')
		.get(segmentId) as { clinicId: string; recordingId: string };
	db.close();
	const s3 = storageClient();
	await s3.send(
		new PutObjectCommand({
			Bucket: 'kinelume',
			Key: `clinics/${clinicId}/recordings/${recordingId}/segments/${segmentId}/posters/0.jpg`,
			Body: bytes,
			ContentType: 'image/jpeg'
		})
	);
	s3.destroy();
}

/** Cues, equipment, position and movement on the exercises, and a range limit on the first item. */
function dress(seeded: { itemIds: string[]; exerciseIds: string[]; programmeId: string }) {
	const today = localDateOf(Date.now(), 'Europe/London');
	const db = database();
	try {
		seeded.exerciseIds.forEach((id, i) => {
			const e = EXERCISES[i];
			db.prepare(
				`update exercise set body_region = 'Knee', side = 'either', position = ?, movement_type = ?,
				 equipment = ?, coaching_cues = ? where id = ?`
			).run(
				e.position,
				e.movementType,
				JSON.stringify(e.equipment),
				JSON.stringify(e.cues.map((text) => ({ text }))),
				id
			);
		});
		db.prepare('update programme_item set range_guides = ?, progression = ? where id = ?').run(
			JSON.stringify([
				{
					motion: 'knee-flexion',
					kind: 'limit',
					degrees: 90,
					untilWeek: null,
					untilDate: addDays(today, 20)
				}
			]),
			JSON.stringify({ kind: 'reps', addPerWeek: 2, ceiling: 15 }),
			seeded.itemIds[0]
		);
		db.prepare('update programme set end_date = ? where id = ?').run(
			addDays(today, 41),
			seeded.programmeId
		);
	} finally {
		db.close();
	}
}

test.beforeAll(async () => {
	test.setTimeout(120_000);
	dir = await mkdtemp(join(tmpdir(), 'kinelume-e2e-sheet-'));
	const posterPath = join(dir, 'poster.jpg');
	await poster(posterPath);
	const recordingId = await seedReadyRecording(ACCOUNTS.clinician, {
		rendition: new Uint8Array([0]),
		durationSeconds: 60,
		title: `Knee exercises for the sheet ${RUN}`
	});
	const segmentId = await seedReadySegment(recordingId, { title: `Sheet segment ${RUN}`, end: 20 });
	await putPoster(segmentId, await readFile(posterPath));
	patient = await seedSignInPatient(ACCOUNTS.clinician, { name: `Ada Thorne ${RUN}` });
	const db = database();
	db.prepare("update patient set affected_side = 'left', operation_date = ? where id = ?").run(
		addDays(localDateOf(Date.now(), 'Europe/London'), -9),
		patient.patientId
	);
	db.close();
	for (const count of [3, 6] as const) {
		const seeded = seedProgramme(
			patient.patientId,
			EXERCISES.slice(0, count).map((e) => ({ ...e, segmentId, sets: 2, reps: 10 })),
			{
				title: `First weeks at home (${count} exercises)`,
				note: 'Ice the knee for 15 minutes after the last session of the day.'
			}
		);
		dress(seeded);
		programmes[count] = seeded;
	}
});

test.afterAll(async () => {
	await rm(dir, { recursive: true, force: true });
});

/** Pages in a PDF made by Chromium: its page objects, checked against the page tree's count. */
function pdfPages(pdf: Buffer): number {
	const text = pdf.toString('latin1');
	const objects = text.match(/\/Type\s*\/Page(?![a-zA-Z])/g)?.length ?? 0;
	const counts = [...text.matchAll(/\/Type\s*\/Pages\b[^>]*?\/Count\s+(\d+)/g)].map((m) =>
		Number(m[1])
	);
	if (counts.length) expect(Math.max(...counts), 'the page tree agrees').toBe(objects);
	return objects;
}

async function shot(page: Page, name: string) {
	await page.screenshot({ path: join(SHOTS, `sheet-${name}.png`), fullPage: true });
}

for (const count of [3, 6] as const) {
	test(`a programme of ${count} exercises prints on at most two A4 pages, in the patient's words`, async ({
		page
	}) => {
		const { programmeId, itemIds } = programmes[count];
		await signInWithPassword(page, ACCOUNTS.clinician);
		await open(page, `/programmes/${programmeId}/sheet`);
		const sheet = page.locator('article.sheet');
		await expect(sheet.getByRole('heading', { level: 2 })).toHaveCount(count);

		// The treated side in words, dates as people write them, and no ISO date anywhere.
		await expect(sheet.getByTestId('sheet-side')).toHaveCount(count);
		for (const side of await sheet.getByTestId('sheet-side').allTextContents()) {
			expect(side).toContain('Your left leg — the one being treated.');
		}
		await expect(sheet).toContainText(
			/from [A-Z][a-z]+day \d{1,2} [A-Z][a-z]+ \d{4} up to and including [A-Z][a-z]+day \d{1,2} [A-Z][a-z]+ \d{4}/
		);
		await expect(sheet).toContainText(/No further than 90° up to and including [A-Z][a-z]+day/i);
		expect(await sheet.innerText()).not.toMatch(/\d{4}-\d{2}-\d{2}|Either side/);

		// Each code and its printed address: the short address of that item.
		await expect(sheet.getByRole('img', { name: /QR code that opens the video/ })).toHaveCount(
			count
		);
		const addresses = await sheet.locator('figcaption').allTextContents();
		expect(addresses).toHaveLength(count);
		for (const [i, id] of itemIds.entries()) {
			expect(addresses[i]).toMatch(new RegExp(`/r/${await replayCode(id)}\\s*$`));
		}
		for (const img of await sheet.locator('img').all()) {
			await expect
				.poll(() => img.evaluate((e) => (e as HTMLImageElement).naturalWidth))
				.toBeGreaterThan(0);
		}
		await expectNoAxeViolations(page);
		await shot(page, `${count}-screen`);

		// On paper: the safety link's address is printed after its words (and only there).
		await page.emulateMedia({ media: 'print' });
		const link = sheet.getByRole('link', { name: 'the swelling leaflet' });
		expect(await link.evaluate((a) => getComputedStyle(a, '::after').content)).toBe(
			`" (${LEAFLET})"`
		);
		await expect(page.getByRole('button', { name: 'Print' })).toBeHidden();
		await page.setViewportSize({ width: 794, height: 1123 });
		await shot(page, `${count}-print`);

		const pdf = await page.pdf({ format: 'A4' });
		await writeFile(join(SHOTS, `sheet-${count}.pdf`), pdf);
		const pages = pdfPages(pdf);
		test.info().annotations.push({ type: 'pages', description: `${count} exercises: ${pages}` });
		console.log(`sheet of ${count} exercises: ${pages} A4 page(s)`);
		expect(pages).toBeGreaterThanOrEqual(1);
		expect(pages).toBeLessThanOrEqual(2);
	});
}

test('the printed short address opens the replay for its patient only', async ({ browser }) => {
	const itemId = programmes[3].itemIds[0];
	const code = await replayCode(itemId);

	// Signed out: to sign in, and from there on to the replay.
	const guest = await browser.newContext();
	const page = await guest.newPage();
	await open(page, `/r/${code.toLowerCase()}`);
	await expect(page).toHaveURL(/\/signin\?next=/);
	const form = page.locator('form[action="?/password"]');
	await form.getByLabel('E-mail address').fill(patient.email);
	await form.getByLabel('Password').fill(DEMO_PASSWORD);
	await form.getByRole('button', { name: 'Sign in' }).click();
	await expect(page).toHaveURL(new RegExp(`/replay/${itemId}$`));
	await expect(page.getByRole('heading', { level: 1 })).toContainText(EXERCISES[0].title);
	await guest.close();

	// Another patient with the same code: not found, as the replay itself answers.
	const other = await browser.newContext();
	const otherPage = await other.newPage();
	await signInWithPassword(otherPage, ACCOUNTS.patient);
	const answer = await open(otherPage, `/r/${code}`);
	expect(answer?.status()).toBe(404);
	expect(otherPage.url()).toMatch(new RegExp(`/r/${code}$`));
	await other.close();
});
