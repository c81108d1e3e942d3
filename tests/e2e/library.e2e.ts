import { expect, test, type Browser, type Page } from '@playwright/test';
import { execFile } from 'node:child_process';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { PutObjectCommand } from '@aws-sdk/client-s3';
import { FFMPEG, makeClip } from '../integration/recordings-support';
import {
	ACCOUNTS,
	database,
	expectNoAxeViolations,
	firstLink,
	seedCaptionTrack,
	seedReadyRecording,
	signedInRequest,
	storageClient,
	waitForMail,
	open
} from './support';
import { E2E } from './ports';
import { seedReadySegment } from './segments-support';
import { seedCollection, seedExercise, seedPublicExercise } from './library-support';

const run = promisify(execFile);
const SHOTS = join(import.meta.dirname, '../.run/e2e-results');
// Letters of this run's own (slugs are made of words): the suite can run again on the same data.
const RUN = Array.from(
	{ length: 4 },
	() => 'abcdefghijklmnopqrstuvwxyz'[Math.floor(Math.random() * 26)]
).join('');
const TITLE = `Sit to stand from a chair ${RUN}`;
const CUES = [
	{ id: '1', start: 0.5, end: 2.5, text: 'Sit tall on the chair.' },
	{ id: '2', start: 3.5, end: 5.5, text: 'Now stand up slowly.' }
];

let dir: string;
let exerciseId: string;
let segmentId: string;

/** A real 6 s clip with a real poster, as the segment of an exercise of the demo clinic. */
test.beforeAll(async () => {
	test.setTimeout(120_000);
	dir = await mkdtemp(join(tmpdir(), 'kinelume-e2e-library-'));
	const clipPath = join(dir, 'clip.mp4');
	const posterPath = join(dir, 'poster.jpg');
	await makeClip(clipPath, { seconds: 6, size: '640x360' });
	await run(FFMPEG, [
		'-loglevel',
		'error',
		'-y',
		'-ss',
		'1',
		'-i',
		clipPath,
		'-frames:v',
		'1',
		posterPath
	]);
	const recordingId = await seedReadyRecording(ACCOUNTS.clinician, {
		rendition: await readFile(clipPath),
		durationSeconds: 6,
		title: 'Chair exercises'
	});
	segmentId = await seedReadySegment(recordingId, {
		title: TITLE,
		end: 6,
		cues: CUES,
		clip: await readFile(clipPath)
	});
	const db = database();
	const { clinicId } = db
		.prepare('select clinic_id as clinicId from segment where id = ?')
		.get(segmentId) as {
		clinicId: string;
	};
	db.close();
	const s3 = storageClient();
	await s3.send(
		new PutObjectCommand({
			Bucket: 'kinelume',
			Key: `clinics/${clinicId}/recordings/${recordingId}/segments/${segmentId}/posters/0.jpg`,
			Body: await readFile(posterPath),
			ContentType: 'image/jpeg'
		})
	);
	s3.destroy();
	exerciseId = seedExercise(segmentId, {
		title: TITLE,
		description:
			'Stand up from a firm chair without using your hands. Ring the clinic on 0161 496 0000 if your knee swells.',
		position: 'seated',
		movementType: 'active',
		equipment: ['Chair'],
		coachingCues: [{ text: 'Lean forward, nose over toes' }, { text: 'Push through both heels' }]
	});
});

test.afterAll(async () => {
	await rm(dir, { recursive: true, force: true });
});

/**
 * A browser of its own for one person, signed in through the real password form action (the
 * request's cookies carried over), so that no page has to be typed into before it is ready.
 */
async function asNewPerson(browser: Browser, email: string | null): Promise<Page> {
	if (!email) return (await browser.newContext()).newPage();
	const signedIn = await signedInRequest(email);
	const context = await browser.newContext({ storageState: await signedIn.storageState() });
	await signedIn.dispose();
	return context.newPage();
}

async function openQueuedSubmission(page: Page): Promise<void> {
	await open(page, '/curate');
	await page.getByTestId('review-queue').getByRole('link', { name: TITLE }).click();
	await expect(page.getByRole('heading', { name: `Review: ${TITLE}`, level: 1 })).toBeVisible();
}

test('submit → changes requested → fixed → approved → found by a signed-out visitor and played with captions', async ({
	browser
}) => {
	test.setTimeout(240_000);

	// 1. The clinician submits the exercise, with consent and a licence.
	const clinician = await asNewPerson(browser, ACCOUNTS.clinician);
	await open(clinician, `/exercises/${exerciseId}`);
	await clinician.getByRole('link', { name: 'Submit to the library' }).click();
	await expect(
		clinician.getByRole('heading', { name: 'Submit to the public library', level: 1 })
	).toBeVisible();
	const preview = clinician.getByTestId('submit-checklist');
	await expect(preview).toContainText('Does not pass: No patient data');
	await expect(preview).toContainText('0161 496 0000');
	await expectNoAxeViolations(clinician);
	await clinician.getByLabel(/Everyone who can be seen or heard/).check();
	await clinician.getByLabel('Licence for reuse').selectOption('cc-by-nc-4.0');
	await clinician.getByRole('button', { name: 'Submit for review' }).click();
	await expect(clinician.getByText('Submitted. It is waiting for an educator')).toBeVisible();

	// 2. An educator sees the failing check and asks for changes; the clinician gets an e-mail.
	const educator = await asNewPerson(browser, ACCOUNTS.educator);
	await openQueuedSubmission(educator);
	const checklist = educator.getByTestId('checklist');
	await expect(checklist).toContainText('Passes: Captions pass the caption checks');
	await expect(checklist).toContainText('Does not pass: No patient data');
	const reviewPlayer = educator.getByTestId('review-player');
	await expect
		.poll(() => reviewPlayer.evaluate((v) => (v as HTMLVideoElement).readyState), {
			timeout: 20_000
		})
		.toBeGreaterThan(0);
	await educator.screenshot({ path: join(SHOTS, 'library-review.png'), fullPage: true });
	await expectNoAxeViolations(educator);
	// Approval is refused while a check fails, and nothing is lost.
	for (const box of await educator.getByRole('checkbox').all()) await box.check();
	await educator.getByLabel('Approve and publish').check();
	await educator.getByRole('button', { name: 'Record the decision' }).click();
	await expect(educator.getByRole('alert')).toContainText('Not yet met: no patient data');
	const since = Date.now();
	await educator.getByLabel('Request changes').check();
	await educator
		.getByLabel('Comment to the clinician')
		.fill(
			'Please take the clinic phone number out of the description; the public page is for everyone.'
		);
	await educator.getByRole('button', { name: 'Record the decision' }).click();
	await expect(
		educator.getByText('Changes requested. The clinician has been e-mailed.')
	).toBeVisible();
	const mail = await waitForMail(ACCOUNTS.clinician, since, 'Changes requested');
	expect(mail.text).toContain('take the clinic phone number out');

	// 3. The clinician follows the e-mail, reads the comment and fixes the description.
	await open(clinician, firstLink(mail.text, '/submit'));
	await expect(
		clinician.getByRole('region', { name: 'The educator asked for changes' })
	).toContainText('take the clinic phone number out');
	await clinician
		.getByLabel('Description')
		.fill('Stand up from a firm chair without using your hands, then sit back down slowly.');
	await clinician.getByRole('button', { name: 'Run the checks again' }).click();
	await expect(clinician.getByTestId('submit-checklist')).toContainText('Passes: No patient data');
	await clinician.getByLabel(/Everyone who can be seen or heard/).check();
	await clinician.getByRole('button', { name: 'Submit for review' }).click();
	await expect(clinician.getByText('Submitted. It is waiting for an educator')).toBeVisible();

	// 4. The educator approves; the public version is made.
	await openQueuedSubmission(educator);
	await expect(educator.getByTestId('checklist')).not.toContainText('Does not pass');
	for (const box of await educator.getByRole('checkbox').all()) await box.check();
	await educator.getByLabel('Approve and publish').check();
	await educator.getByRole('button', { name: 'Record the decision' }).click();
	await expect(educator.getByText('Approved and published.')).toBeVisible();
	await expect(educator.getByRole('link', { name: 'See it in the library' })).toBeVisible();
	await waitForMail(ACCOUNTS.clinician, since, 'is now in the public library');

	// 5. A signed-out visitor finds it by the start of a word and plays it with captions.
	const visitor = await asNewPerson(browser, null);
	await open(visitor, '/library');
	await expectNoAxeViolations(visitor);
	await visitor.getByLabel('Search exercises').fill('stan chai');
	await visitor.getByRole('button', { name: 'Search' }).click();
	await expect(visitor).toHaveURL(/\/library\/search\?q=stan\+chai/);
	const results = visitor.getByTestId('search-results');
	await expect(results.getByRole('link', { name: TITLE })).toBeVisible();
	await expect(results.locator('mark').first()).toBeVisible();
	await visitor.screenshot({ path: join(SHOTS, 'library-search.png'), fullPage: true });
	for (const width of [390, 1366])
		await visitor
			.setViewportSize({ width, height: 900 })
			.then(() =>
				visitor.screenshot({ path: join(SHOTS, `library-cards-${width}.png`), fullPage: true })
			);
	await expectNoAxeViolations(visitor);
	await results.getByRole('link', { name: TITLE }).click();
	await expect(visitor.getByRole('heading', { name: TITLE, level: 1 })).toBeVisible();
	await expect(visitor.getByText("Follow your clinician's advice.")).toBeVisible();
	await expect(
		visitor.getByRole('heading', { name: 'Safety notes: read these first' })
	).toBeVisible();
	await expect(visitor.getByText('Before you try this')).toBeVisible();
	await expect(visitor.locator('meta[property="og:title"]')).toHaveAttribute('content', TITLE);
	await expect(visitor.locator('meta[property="og:image"]')).toHaveAttribute(
		'content',
		/\/api\/library\/versions\/.+\/poster-0\.jpg$/
	);

	const player = visitor.getByTestId('library-player');
	await player.evaluate(async (element) => {
		const video = element as HTMLVideoElement;
		video.muted = true;
		await video.play();
	});
	await expect
		.poll(() => player.evaluate((v) => (v as HTMLVideoElement).currentTime), { timeout: 20_000 })
		.toBeGreaterThan(0.8);
	const track = await player.evaluate((element) => {
		const t = (element as HTMLVideoElement).textTracks[0];
		return {
			kind: t.kind,
			mode: t.mode,
			cues: t.cues?.length ?? 0,
			active: t.activeCues?.[0] ? (t.activeCues[0] as VTTCue).text : null
		};
	});
	expect(track).toMatchObject({ kind: 'captions', mode: 'showing', cues: 2 });
	expect(track.active).toBe('Sit tall on the chair.');
	await expect(visitor.getByRole('button', { name: /Sit tall on the chair/ })).toHaveAttribute(
		'aria-current',
		'true'
	);
	await visitor.screenshot({ path: join(SHOTS, 'library-exercise.png'), fullPage: true });
	await expectNoAxeViolations(visitor);

	// Nothing of the clinic's own storage or the review reaches the public page.
	const html = await visitor.content();
	expect(html).not.toContain('/api/segments/');
	expect(html).not.toContain('/api/library/submissions/');
	expect(html).not.toContain(segmentId);
	const db = database();
	const submissionIds = (
		db.prepare('select id from library_submission where exercise_id = ?').all(exerciseId) as {
			id: string;
		}[]
	).map((r) => r.id);
	const { entryId } = db
		.prepare('select id as entryId from library_exercise where source_exercise_id = ?')
		.get(exerciseId) as { entryId: string };
	db.close();
	expect(submissionIds).toHaveLength(2);
	for (const id of submissionIds) {
		const clip = await visitor.request.get(`/api/library/submissions/${id}/clip.mp4`);
		expect(clip.status()).toBe(401);
	}
	expect((await visitor.request.get(`/api/segments/${segmentId}/clip.mp4`)).status()).toBe(401);
	const sitemap = await (await visitor.request.get('/sitemap.xml')).text();
	expect(sitemap).toContain(`/library/exercises/sit-to-stand-from-a-chair-${RUN}`);

	// A collection with it is public too, and readable.
	seedCollection(
		'Chair exercises for week two',
		`chair-exercises-for-week-two-${RUN}`,
		'published',
		[entryId]
	);
	await open(visitor, `/library/collections/chair-exercises-for-week-two-${RUN}`);
	await expect(
		visitor.getByRole('heading', { name: 'Chair exercises for week two', level: 1 })
	).toBeVisible();
	await expect(visitor.getByRole('link', { name: new RegExp(TITLE) })).toBeVisible();
	await expectNoAxeViolations(visitor);
	await open(visitor, '/library');
	await visitor.screenshot({ path: join(SHOTS, 'library-front.png'), fullPage: true });
});

test('an educator unpublishes and retires: the page answers 404, then 410, and so do its files', async ({
	browser
}) => {
	test.setTimeout(60_000);
	const db = database();
	const row = db
		.prepare(
			`select e.slug as slug, v.id as versionId from library_exercise e join library_version v on v.id = e.current_version_id where e.source_exercise_id = ?`
		)
		.get(exerciseId) as { slug: string; versionId: string };
	db.close();
	const visitor = await asNewPerson(browser, null);
	const status = async (path: string) => (await visitor.request.get(path)).status();
	expect(await status(`/library/exercises/${row.slug}`)).toBe(200);
	expect(await status(`/api/library/versions/${row.versionId}/clip.mp4`)).toBe(200);

	const educator = await asNewPerson(browser, ACCOUNTS.educator);
	await open(educator, '/curate/published');
	const line = educator
		.getByTestId('published-table')
		.getByRole('row', { name: new RegExp(TITLE) });
	await line.getByRole('button', { name: `Unpublish ${TITLE}` }).click();
	await expect(educator.getByText('Unpublished: its page now answers')).toBeVisible();
	await expectNoAxeViolations(educator);
	expect(await status(`/library/exercises/${row.slug}`)).toBe(404);
	expect(await status(`/api/library/versions/${row.versionId}/clip.mp4`)).toBe(404);
	expect(await status(`/api/library/versions/${row.versionId}/captions.vtt`)).toBe(404);
	expect(await (await visitor.request.get('/library/search?q=stand')).text()).not.toContain(TITLE);

	await line.getByRole('checkbox').check();
	await line.getByRole('button', { name: `Retire ${TITLE}` }).click();
	await expect(
		educator.getByText('Retired: its page now says it was retired from the library')
	).toBeVisible();
	expect(await status(`/library/exercises/${row.slug}`)).toBe(410);
	expect(await status(`/api/library/versions/${row.versionId}/poster-0.jpg`)).toBe(410);
	await open(visitor, `/library/exercises/${row.slug}`);
	await expect(visitor.getByRole('heading', { name: 'This is no longer available' })).toBeVisible();
	await expectNoAxeViolations(visitor);
});

test('an educator builds a collection in order, with a cover, and publishes it', async ({
	browser
}) => {
	test.setTimeout(60_000);
	const db = database();
	const { clinicId } = db
		.prepare("select id as clinicId from clinic where name = 'Alder Street Community Clinic'")
		.get() as { clinicId: string };
	db.close();
	await seedPublicExercise(clinicId, {
		title: `Collection ankle circles ${RUN}`,
		slug: `collection-ankle-circles-${RUN}`
	});
	await seedPublicExercise(clinicId, {
		title: `Collection bridging ${RUN}`,
		slug: `collection-bridging-${RUN}`
	});

	const educator = await asNewPerson(browser, ACCOUNTS.educator);
	await open(educator, '/curate/collections');
	await educator.getByLabel('Title').fill(`Morning routine ${RUN}`);
	await educator.getByRole('button', { name: 'Create the collection' }).click();
	await expect(
		educator.getByRole('heading', { name: `Morning routine ${RUN}`, level: 1 })
	).toBeVisible();
	await expect(educator.getByText('Draft', { exact: true })).toBeVisible();
	await educator.getByLabel('Introduction', { exact: true }).fill('Do these **slowly**.');
	await educator.getByRole('button', { name: 'Save' }).click();
	await expect(educator.getByText('Saved.')).toBeVisible();

	for (const title of [`Collection ankle circles ${RUN}`, `Collection bridging ${RUN}`]) {
		await educator.getByLabel('Add a published exercise').selectOption({ label: title });
		await educator.getByRole('button', { name: 'Add', exact: true }).click();
		await expect(educator.getByText('Added.')).toBeVisible();
	}
	const items = educator.getByRole('region', { name: /Exercises, in order/ }).getByRole('listitem');
	await expect(items).toHaveText([/1\. Collection ankle circles/, /2\. Collection bridging/]);
	await educator.getByRole('button', { name: `Move Collection bridging ${RUN} up` }).click();
	await expect(items).toHaveText([/1\. Collection bridging/, /2\. Collection ankle circles/]);

	await educator.getByRole('radio', { name: `Collection ankle circles ${RUN}, still 1` }).check();
	await educator.getByRole('button', { name: 'Use this cover' }).click();
	await expect(educator.getByText('Cover chosen.')).toBeVisible();
	await educator.getByRole('button', { name: 'Publish the collection' }).click();
	await expect(educator.getByText('Published: anyone can see it now.')).toBeVisible();
	await expectNoAxeViolations(educator);

	const visitor = await asNewPerson(browser, null);
	await open(visitor, `/library/collections/morning-routine-${RUN}`);
	await expect(
		visitor.getByRole('heading', { name: `Morning routine ${RUN}`, level: 1 })
	).toBeVisible();
	await expect(visitor.locator('strong', { hasText: 'slowly' })).toBeVisible();
	await expect(
		visitor.getByRole('region', { name: /exercises, in order/ }).getByRole('listitem')
	).toHaveText([/1\.\s*Collection bridging/, /2\.\s*Collection ankle circles/]);
	await expect(visitor.locator('meta[property="og:image"]')).toHaveAttribute(
		'content',
		/poster-0\.jpg$/
	);
	await expectNoAxeViolations(visitor);

	await educator.getByRole('button', { name: 'Unpublish the collection' }).click();
	await expect(educator.getByText('Unpublished: its page answers “not found”.')).toBeVisible();
	expect((await visitor.request.get('/library/collections/morning-routine')).status()).toBe(404);
});

/** A recording of the demo clinic with a captions track of `cues`, and an exercise on 0–9 s of it. */
async function exerciseFollowingTrack(
	title: string,
	cues: { id: string; start: number; end: number; text: string }[]
): Promise<{ exerciseId: string; trackId: string }> {
	const recordingId = await seedReadyRecording(ACCOUNTS.clinician);
	const trackId = seedCaptionTrack(recordingId, cues);
	const segment = await seedReadySegment(recordingId, { title, end: 9, cues });
	const exerciseId = seedExercise(segment, {
		title,
		description: 'Lying on your back, slide the heel towards you and back.'
	});
	return { exerciseId, trackId };
}

test('a caption fixed in the track reaches the library as a caption revision an educator approves', async ({
	browser
}) => {
	test.setTimeout(180_000);
	const title = `Heel slides with captions ${RUN}`;
	const cues = [
		{ id: '1', start: 0.5, end: 2.5, text: 'Lie on your back.' },
		{ id: '2', start: 3.5, end: 5.5, text: 'Slide the heel in.' },
		{ id: '3', start: 6.5, end: 8.5, text: 'And slide it out.' }
	];
	const { exerciseId: id, trackId } = await exerciseFollowingTrack(title, cues);

	// Published first, through the ordinary path.
	const clinician = await asNewPerson(browser, ACCOUNTS.clinician);
	await open(clinician, `/exercises/${id}/submit`);
	await expect(clinician.getByTestId('submit-checklist')).not.toContainText('Does not pass');
	await clinician.getByLabel(/Everyone who can be seen or heard/).check();
	await clinician.getByRole('button', { name: 'Submit for review' }).click();
	await expect(clinician.getByText('Submitted. It is waiting for an educator')).toBeVisible();
	const educator = await asNewPerson(browser, ACCOUNTS.educator);
	const decide = async (heading: string) => {
		await open(educator, '/curate');
		await educator.getByTestId('review-queue').getByRole('link', { name: title }).click();
		await expect(educator.getByRole('heading', { name: heading, level: 1 })).toBeVisible();
	};
	await decide(`Review: ${title}`);
	for (const box of await educator.getByRole('checkbox').all()) await box.check();
	await educator.getByLabel('Approve and publish').check();
	await educator.getByRole('button', { name: 'Record the decision' }).click();
	await expect(educator.getByText('Approved and published.')).toBeVisible();
	const publicPage = await educator
		.getByRole('link', { name: 'See it in the library' })
		.getAttribute('href');
	const visitor = await asNewPerson(browser, null);
	const publicCaptions = async () => {
		await open(visitor, publicPage!);
		const src = await visitor.getByTestId('library-player').locator('track').getAttribute('src');
		return { src: src!, text: await (await visitor.request.get(src!)).text() };
	};
	const first = await publicCaptions();
	expect(first.text).toContain('Slide the heel in.');

	// The clinician fixes a caption in the track (the studio's save): patients see it at once.
	const saved = await clinician.request.post(`/api/tracks/${trackId}/versions`, {
		data: {
			baseVersion: 1,
			cues: cues.map((c) => (c.id === '2' ? { ...c, text: 'Slide the heel in, unhurried.' } : c))
		},
		headers: { Origin: E2E.origin }
	});
	expect(saved.status()).toBe(201);

	// The exercise's submit page offers to send the caption changes to the library.
	await open(clinician, `/exercises/${id}`);
	await clinician.getByRole('link', { name: 'Submit to the library' }).click();
	const offer = clinician.getByRole('region', { name: 'The library shows older captions' });
	await expect(offer).toContainText('1 cue changed');
	const changes = offer.getByTestId('revision-changes');
	await expect(changes).toContainText('Slide the heel in.');
	await expect(changes).toContainText('Slide the heel in, unhurried.');
	await expectNoAxeViolations(clinician);
	await offer.getByLabel('Note to the reviewer (optional, not public)').fill('One word added.');
	await offer.getByRole('button', { name: 'Send the caption changes to the library' }).click();
	await expect(clinician.getByText('Caption changes sent.')).toBeVisible();
	await expect(
		clinician.getByRole('region', { name: 'The library shows older captions' })
	).toContainText('These caption changes are waiting for an educator’s review.');

	// The educator sees the change cue by cue, with only the caption checks, and approves it.
	await open(educator, '/curate');
	await expect(
		educator.getByTestId('review-queue').getByRole('row', { name: new RegExp(title) })
	).toContainText('Caption changes to a published exercise');
	await decide(`Review caption changes: ${title}`);
	const table = educator.getByTestId('caption-changes');
	await expect(table.getByRole('row')).toHaveCount(2);
	await expect(table).toContainText('Slide the heel in, unhurried.');
	const checklist = educator.getByTestId('checklist');
	await expect(checklist.locator(':scope > li')).toHaveCount(2);
	await expect(checklist).toContainText('Passes: No patient data in the captions');
	await expect(educator.getByText('Note from the clinician')).toBeVisible();
	await educator.screenshot({ path: join(SHOTS, 'library-caption-revision.png'), fullPage: true });
	await expectNoAxeViolations(educator);
	for (const box of await educator.getByRole('checkbox').all()) await box.check();
	await educator.getByLabel('Approve and publish').check();
	await educator.getByRole('button', { name: 'Record the decision' }).click();
	await expect(educator.getByText('Approved and published.')).toBeVisible();

	// The public page serves the new captions from a new version; the old version is not served.
	const second = await publicCaptions();
	expect(second.src).not.toBe(first.src);
	expect(second.text).toContain('Slide the heel in, unhurried.');
	expect((await visitor.request.get(first.src)).status()).toBe(404);
	await expectNoAxeViolations(visitor);
});

test('a caption read a little too fast is fixed from the checklist, and the exercise submitted', async ({
	browser
}) => {
	test.setTimeout(90_000);
	const title = `Heel slides read fast ${RUN}`;
	// Ten words in 2.95 s: 203 words per minute against the library's 200.
	const { exerciseId: id } = await exerciseFollowingTrack(title, [
		{ id: '1', start: 0, end: 2, text: 'Lie on your back.' },
		{ id: '2', start: 3, end: 5.95, text: 'Bend the knee and slide the heel back in slowly' },
		{ id: '3', start: 7.5, end: 8.8, text: 'Then rest.' }
	]);
	const clinician = await asNewPerson(browser, ACCOUNTS.clinician);
	await open(clinician, `/exercises/${id}/submit`);
	const checks = clinician.getByTestId('submit-checklist');
	await expect(checks).toContainText('Does not pass: Captions pass the caption checks');
	await expect(checks).toContainText('Reading rate 203 words per minute');
	await clinician.getByLabel('Description').fill('Slide the heel towards you, then away again.');

	await clinician
		.getByTestId('cue-fixes')
		.getByRole('button', { name: 'Show cue 2 until 00:06.334 (0.38 s longer)' })
		.click();
	await expect(clinician.getByText('Saved as version 2 of the recording’s captions')).toBeVisible();
	await expect(checks).toContainText('Passes: Captions pass the caption checks');
	await expect(checks).not.toContainText('Does not pass');
	await expect(clinician.getByLabel('Description')).toHaveValue(
		'Slide the heel towards you, then away again.'
	);
	await expectNoAxeViolations(clinician);

	await clinician.getByLabel(/Everyone who can be seen or heard/).check();
	await clinician.getByRole('button', { name: 'Submit for review' }).click();
	await expect(clinician.getByText('Submitted. It is waiting for an educator')).toBeVisible();
});
