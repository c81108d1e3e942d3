import { fakesDirectory, testEnv } from './env';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';

// A database of this file's own: the tests count public exercises and search results.
process.env.DATABASE_PATH = join(fakesDirectory, `library-${process.pid}.db`);

const { db, schema } = await import('$lib/server/db');
const { eq } = await import('drizzle-orm');
const { getObjectStream, headObject } = await import('$lib/server/storage');
const { libraryKeys, recordingKeys } = await import('$lib/server/storage/keys');
const submissions = await import('$lib/server/library/submissions');
const publishing = await import('$lib/server/library/publishing');
const library = await import('$lib/server/library/public');
const collections = await import('$lib/server/library/collections');
const { insertPublishedEntry } = await import('../../src/scripts/bench/synthetic-library');
const { parseLibraryQuery } = await import('$lib/library/search');
const support = await import('./library-support');

type World = import('./library-support').World;

let world: World;
let other: World;

beforeAll(() => {
	world = support.makeWorld('Library test clinic');
	other = support.makeWorld('Another library clinic');
});

async function bodyOf(key: string): Promise<string> {
	const object = await getObjectStream(key);
	if (!object) return '';
	const chunks: Buffer[] = [];
	for await (const chunk of object.body) chunks.push(chunk as Buffer);
	return Buffer.concat(chunks).toString();
}

async function mailsTo(email: string): Promise<{ subject: string; id: string }[]> {
	const list = (await (await fetch(`${testEnv.DEV_INBOX_URL}/messages`)).json()) as {
		id: string;
		to: string[];
		subject: string;
	}[];
	return list.filter((m) => m.to.includes(email));
}

const search = (q: string) => library.searchLibrary(parseLibraryQuery(new URLSearchParams(q)));
const reviewer = () => ({ id: world.educator.id, name: world.educator.name });

describe('submitting', () => {
	it('freezes the exercise as it stands, with its clipped captions and consent', async () => {
		const exercise = await support.makeExercise(world);
		const submission = submissions.submitExercise(
			world.clinician,
			exercise.id,
			support.submissionInput(exercise)
		);
		expect(submission).toMatchObject({
			status: 'waiting',
			clinicId: world.clinicId,
			consentConfirmed: true,
			licence: 'cc-by-nc-4.0'
		});
		expect(submission.snapshot).toMatchObject({
			title: 'Heel slides',
			bodyRegion: 'Knee',
			dosage: { sets: 1, reps: 8, sessionsPerDay: 3, daysPerWeek: 7 },
			coachingCues: [{ text: 'Keep the heel on the bed', atSeconds: 3 }],
			cues: support.GOOD_CUES
		});
		expect(submissions.checklistOf(submission).passed).toBe(true);
	});

	it("refuses another clinic's exercise as not found", async () => {
		const exercise = await support.makeExercise(other);
		expect(() =>
			submissions.submitExercise(world.clinician, exercise.id, support.submissionInput(exercise))
		).toThrow(expect.objectContaining({ status: 404 }));
	});

	it('refuses without consent, and for an exercise without a ready segment', async () => {
		const exercise = await support.makeExercise(world);
		expect(() =>
			submissions.submitExercise(world.clinician, exercise.id, {
				...support.submissionInput(exercise),
				consentConfirmed: false
			})
		).toThrow(/agreed to publication/);
		const bare = await support.makeExercise(world, { segmentId: null });
		expect(() =>
			submissions.submitExercise(world.clinician, bare.id, support.submissionInput(bare))
		).toThrow(expect.objectContaining({ status: 409 }));
	});

	it('replaces an undecided submission of the same exercise, keeping one in the queue', async () => {
		const exercise = await support.makeExercise(world, { title: 'Quad sets' });
		const first = submissions.submitExercise(
			world.clinician,
			exercise.id,
			support.submissionInput(exercise)
		);
		const second = submissions.submitExercise(
			world.clinician,
			exercise.id,
			support.submissionInput(exercise)
		);
		const history = submissions.exerciseSubmissions(world.clinicId, exercise.id);
		expect(history.map((s) => [s.id, s.status])).toEqual([
			[second.id, 'waiting'],
			[first.id, 'superseded']
		]);
		const queued = submissions.listQueue('waiting').filter((r) => r.title === 'Quad sets');
		expect(queued.map((r) => r.id)).toEqual([second.id]);
	});

	it('never lets a stored snapshot change (the database refuses)', async () => {
		const exercise = await support.makeExercise(world);
		const submission = submissions.submitExercise(
			world.clinician,
			exercise.id,
			support.submissionInput(exercise)
		);
		expect(() =>
			db()
				.update(schema.librarySubmissions)
				.set({ snapshot: { ...submission.snapshot, title: 'Changed' } })
				.where(eq(schema.librarySubmissions.id, submission.id))
				.run()
		).toThrow(/never changes/);
	});
});

describe('reviewing', () => {
	it('requests changes with a comment, e-mails the clinician, and takes the submission off the queue', async () => {
		const exercise = await support.makeExercise(world, {
			description: 'Ring the clinic on 0161 496 0000 if it swells.'
		});
		const submission = submissions.submitExercise(
			world.clinician,
			exercise.id,
			support.submissionInput(exercise)
		);
		const checklist = submissions.checklistOf(submission);
		expect(checklist.items.find((i) => i.id === 'patient-data')?.passed).toBe(false);

		await expect(
			publishing.decideSubmission(submission.id, reviewer(), {
				decision: 'approved',
				comment: '',
				judgement: support.ALL_JUDGEMENT
			})
		).rejects.toThrow(/no patient data/i);
		await expect(
			publishing.decideSubmission(submission.id, reviewer(), {
				decision: 'changes-requested',
				comment: '',
				judgement: []
			})
		).rejects.toThrow(/comment/);

		const result = await publishing.decideSubmission(submission.id, reviewer(), {
			decision: 'changes-requested',
			comment: 'Please take the phone number out of the description.',
			judgement: []
		});
		expect(result).toMatchObject({ decision: 'changes-requested', mailed: true });
		const found = submissions.submissionForReview(submission.id)!;
		expect(found.submission.status).toBe('changes-requested');
		expect(found.reviews).toMatchObject([
			{
				decision: 'changes-requested',
				comment: 'Please take the phone number out of the description.'
			}
		]);
		expect((await mailsTo(world.clinician.email)).map((m) => m.subject)).toContain(
			'Changes requested for “Heel slides”'
		);
		await expect(
			publishing.decideSubmission(submission.id, reviewer(), {
				decision: 'rejected',
				comment: 'Deciding twice.',
				judgement: []
			})
		).rejects.toThrow(/already decided/);
	});

	it('rejects with a reason, e-mails the clinician, and publishes nothing', async () => {
		const exercise = await support.makeExercise(world, { title: 'Rejected stretch' });
		const submission = submissions.submitExercise(
			world.clinician,
			exercise.id,
			support.submissionInput(exercise)
		);
		const result = await publishing.decideSubmission(submission.id, reviewer(), {
			decision: 'rejected',
			comment: 'This stretch is not one we show without supervision.',
			judgement: []
		});
		expect(result).toMatchObject({ decision: 'rejected', mailed: true, slug: undefined });
		expect(submissions.submissionForReview(submission.id)?.submission.status).toBe('rejected');
		expect(library.findPublicExercise('rejected-stretch')).toBeNull();
		expect((await mailsTo(world.clinician.email)).map((m) => m.subject)).toContain(
			'“Rejected stretch” was not accepted for the library'
		);
	});

	it('says what keeps an approval back apart: failing checks, unconfirmed judgement, a missing comment', async () => {
		const exercise = await support.makeExercise(world, {
			description: 'Ring the clinic on 0161 496 0000 if it swells.'
		});
		const submission = submissions.submitExercise(
			world.clinician,
			exercise.id,
			support.submissionInput(exercise)
		);
		const checklist = submissions.checklistOf(submission);
		const problems = publishing.approvalProblems(checklist, ['safe-demonstration']);
		expect(problems.checks).toEqual([expect.stringMatching(/^Not yet met: no patient data/)]);
		expect(problems.judgement).toEqual([
			'Confirm: the words suit the public: nothing only one clinic or one patient would follow.',
			'Confirm: nothing on screen or in the sound identifies a patient.'
		]);
		expect(publishing.approvalBlockers(checklist, ['safe-demonstration'])).toEqual([
			...problems.checks,
			...problems.judgement
		]);
		expect(publishing.commentProblem('rejected', '  ok  ')).toBe(
			'Write the clinician a comment: say what to change or why.'
		);
		expect(publishing.commentProblem('approved', '')).toBeNull();
	});

	it('needs every judgement item ticked to approve', async () => {
		const exercise = await support.makeExercise(world);
		const submission = submissions.submitExercise(
			world.clinician,
			exercise.id,
			support.submissionInput(exercise)
		);
		await expect(
			publishing.decideSubmission(submission.id, reviewer(), {
				decision: 'approved',
				comment: '',
				judgement: ['safe-demonstration']
			})
		).rejects.toThrow(/Confirm: the words suit the public/);
	});
});

describe('approving', () => {
	it('publishes a version whose clip and posters are copies under library/<version>/', async () => {
		const exercise = await support.makeExercise(world, { title: 'Straight leg raise' });
		const submission = submissions.submitExercise(
			world.clinician,
			exercise.id,
			support.submissionInput(exercise)
		);
		const result = await publishing.decideSubmission(submission.id, reviewer(), {
			decision: 'approved',
			comment: 'Clear and careful.',
			judgement: support.ALL_JUDGEMENT
		});
		expect(result).toMatchObject({
			decision: 'approved',
			slug: 'straight-leg-raise',
			mailed: true
		});
		const versionId = result.versionId!;
		const keys = libraryKeys(versionId);
		const segmentId = submission.segmentId!;
		expect(await bodyOf(keys.segment(segmentId))).toBe(
			new TextDecoder().decode(support.CLIP_BYTES)
		);
		expect(await bodyOf(keys.poster(0))).toBe(new TextDecoder().decode(support.POSTER_BYTES));
		expect(await headObject(keys.poster(1))).not.toBeNull();

		const found = library.findPublicExercise('straight-leg-raise');
		expect(found?.kind).toBe('published');
		if (found?.kind !== 'published') return;
		expect(found.value.version).toMatchObject({
			id: versionId,
			version: 1,
			posterCount: 2,
			title: 'Straight leg raise'
		});
		expect(library.findPublicVersion(versionId)?.kind).toBe('published');
		expect(search('q=straight+leg').results.map((r) => r.slug)).toContain('straight-leg-raise');
		expect((await mailsTo(world.clinician.email)).map((m) => m.subject)).toContain(
			'“Straight leg raise” is now in the public library'
		);
	});

	it('keeps the published version unchanged while a new submission is made and waits', async () => {
		const exercise = await support.makeExercise(world, { title: 'Bridging' });
		const first = submissions.submitExercise(
			world.clinician,
			exercise.id,
			support.submissionInput(exercise)
		);
		const approved = await publishing.decideSubmission(first.id, reviewer(), {
			decision: 'approved',
			comment: '',
			judgement: support.ALL_JUDGEMENT
		});
		const before = library.findPublicExercise(approved.slug!);
		if (before?.kind !== 'published') throw new Error('not published');
		const publishedBefore = JSON.stringify(before.value.version);

		// The clinician edits the exercise and submits again with new words.
		db()
			.update(schema.exercises)
			.set({ reps: 12, safetyNotes: 'New notes: stop if your back aches sharply.' })
			.where(eq(schema.exercises.id, exercise.id))
			.run();
		const changed = db()
			.select()
			.from(schema.exercises)
			.where(eq(schema.exercises.id, exercise.id))
			.get()!;
		const second = submissions.submitExercise(
			world.clinician,
			exercise.id,
			support.submissionInput(changed, { description: 'A newer description of bridging.' })
		);
		expect(second.libraryExerciseId).toBe(before.value.entry.id);
		expect(second.snapshot.dosage.reps).toBe(12);

		const during = library.findPublicExercise(approved.slug!);
		if (during?.kind !== 'published') throw new Error('not published');
		expect(JSON.stringify(during.value.version)).toBe(publishedBefore);
		expect(search('q=newer+description').results).toEqual([]);

		// The database itself refuses to change a published version.
		expect(() =>
			db()
				.update(schema.libraryVersions)
				.set({ title: 'Changed' })
				.where(eq(schema.libraryVersions.id, approved.versionId!))
				.run()
		).toThrow(/never changes/);

		// Approving the new submission adds version 2 under the same address.
		const next = await publishing.decideSubmission(second.id, reviewer(), {
			decision: 'approved',
			comment: '',
			judgement: support.ALL_JUDGEMENT
		});
		expect(next.slug).toBe(approved.slug);
		const after = library.findPublicExercise(approved.slug!);
		if (after?.kind !== 'published') throw new Error('not published');
		expect(after.value.version).toMatchObject({
			version: 2,
			snapshot: { description: 'A newer description of bridging.' }
		});
		// The old version's files are no longer served; the old row is still as it was.
		expect(library.findPublicVersion(approved.versionId!)).toBeNull();
		const old = db()
			.select()
			.from(schema.libraryVersions)
			.where(eq(schema.libraryVersions.id, approved.versionId!))
			.get();
		expect(JSON.stringify(old)).toBe(publishedBefore);
		expect(search('q=newer+description').results.map((r) => r.slug)).toEqual([approved.slug]);
	});

	it('refuses when the clip has gone from storage, and publishes nothing', async () => {
		const exercise = await support.makeExercise(world, { title: 'Clip gone' });
		const submission = submissions.submitExercise(
			world.clinician,
			exercise.id,
			support.submissionInput(exercise)
		);
		const segment = db()
			.select()
			.from(schema.segments)
			.where(eq(schema.segments.id, submission.segmentId!))
			.get()!;
		const { deleteObject } = await import('$lib/server/storage');
		await deleteObject(recordingKeys(segment.clinicId, segment.recordingId).segment(segment.id));
		await expect(
			publishing.decideSubmission(submission.id, reviewer(), {
				decision: 'approved',
				comment: '',
				judgement: support.ALL_JUDGEMENT
			})
		).rejects.toThrow(/could not be copied/);
		expect(submissions.submissionForReview(submission.id)?.submission.status).toBe('waiting');
		expect(library.findPublicExercise('clip-gone')).toBeNull();
	});
});

describe('unpublishing and retiring', () => {
	it('hides an unpublished exercise (404) and marks a retired one gone (410), files included', async () => {
		const exercise = await support.makeExercise(world, { title: 'Ankle pumps' });
		const submission = submissions.submitExercise(
			world.clinician,
			exercise.id,
			support.submissionInput(exercise)
		);
		const { slug, versionId } = await publishing.decideSubmission(submission.id, reviewer(), {
			decision: 'approved',
			comment: '',
			judgement: support.ALL_JUDGEMENT
		});
		const entry = library.findPublicExercise(slug!);
		if (entry?.kind !== 'published') throw new Error('not published');
		const id = entry.value.entry.id;

		expect(library.sitemapEntries().map((e) => e.path)).toContain(`/library/exercises/${slug}`);
		publishing.unpublishEntry(id);
		expect(library.findPublicExercise(slug!)).toBeNull();
		expect(library.sitemapEntries().map((e) => e.path)).not.toContain(`/library/exercises/${slug}`);
		expect(library.findPublicVersion(versionId!)).toBeNull();
		expect(search('q=ankle+pumps').results).toEqual([]);

		publishing.republishEntry(id);
		expect(library.findPublicExercise(slug!)?.kind).toBe('published');
		expect(search('q=ankle+pumps').results.map((r) => r.slug)).toEqual([slug]);

		await publishing.retireEntry(id);
		expect(library.findPublicExercise(slug!)).toEqual({ kind: 'retired' });
		expect(library.findPublicVersion(versionId!)).toEqual({ kind: 'retired' });
		expect(search('q=ankle+pumps').results).toEqual([]);
		expect(await headObject(libraryKeys(versionId!).segment(submission.segmentId!))).toBeNull();
		expect(() => publishing.republishEntry(id)).toThrow(expect.objectContaining({ status: 409 }));

		// Submitting the same exercise again, once approved, starts a new address.
		const again = submissions.submitExercise(
			world.clinician,
			exercise.id,
			support.submissionInput(exercise)
		);
		expect(again.libraryExerciseId).toBeNull();
		const fresh = await publishing.decideSubmission(again.id, reviewer(), {
			decision: 'approved',
			comment: '',
			judgement: support.ALL_JUDGEMENT
		});
		expect(fresh.slug).toBe('ankle-pumps-2');
	});
});

describe('search over seeded exercises', () => {
	const base = {
		description: '',
		side: 'either',
		equipment: [] as string[],
		phase: 1,
		dosage: {
			sets: 1,
			reps: 8,
			holdSeconds: 0,
			restSeconds: 30,
			sessionsPerDay: 3,
			daysPerWeek: 7
		},
		coachingCues: [] as { text: string }[],
		safetyNotes: 'Stop if pain is sharp or worse than usual.',
		precautionTags: [] as string[],
		segment: { id: 'seeded', durationSeconds: 10, posterCount: 0, captionsLanguage: 'en-GB' },
		cues: [] as { id: string; start: number; end: number; text: string }[]
	};
	let region: string;

	beforeAll(() => {
		region = `Region ${crypto.randomUUID().slice(0, 8)}`;
		const seed = (
			slug: string,
			changes: Partial<typeof base> & { title: string; position: string; movementType: string },
			status?: 'unpublished' | 'retired'
		) =>
			insertPublishedEntry(
				world.clinicId,
				slug,
				{ ...base, bodyRegion: region, ...changes },
				{ status }
			);
		seed('zz-calf-raises-standing', {
			title: 'Calf raises',
			position: 'standing',
			movementType: 'active',
			description: 'Rise onto the toes, holding the wobbleboard rail.',
			equipment: ['Chair']
		});
		seed('zz-wobbleboard-balance', {
			title: 'Wobbleboard balance',
			position: 'standing',
			movementType: 'active',
			description: 'Stand on the board.',
			equipment: ['Wobbleboard'],
			phase: 3
		});
		seed('zz-seated-march', {
			title: 'Seated march',
			position: 'seated',
			movementType: 'active',
			coachingCues: [{ text: 'Lift each knee towards the wobbleboard' }],
			equipment: ['Chair']
		});
		seed('zz-heel-slides-captions', {
			title: 'Heel slides',
			position: 'supine',
			movementType: 'active-assisted',
			cues: [{ id: '1', start: 0, end: 2, text: 'Imagine a wobbleboard under the heel.' }],
			phase: 2
		});
		seed(
			'zz-hidden',
			{ title: 'Wobbleboard hidden', position: 'standing', movementType: 'active' },
			'unpublished'
		);
		seed(
			'zz-gone',
			{ title: 'Wobbleboard gone', position: 'standing', movementType: 'active' },
			'retired'
		);
	});

	const inRegion = (q: string) => search(`${q}&region=${encodeURIComponent(region)}`);

	it('ranks a title match first, then description, coaching cues and captions', () => {
		expect(inRegion('q=wobbleboard').results.map((r) => r.slug)).toEqual([
			'zz-wobbleboard-balance',
			'zz-calf-raises-standing',
			'zz-seated-march',
			'zz-heel-slides-captions'
		]);
	});

	it('matches the start of a word, and other forms of it', () => {
		expect(inRegion('q=wobb').results).toHaveLength(4);
		expect(inRegion('q=raise').results.map((r) => r.slug)).toEqual(['zz-calf-raises-standing']);
		expect(inRegion('q=marching').results.map((r) => r.slug)).toEqual(['zz-seated-march']);
	});

	it('needs every word, and falls back to any word when no exercise has all', () => {
		expect(inRegion('q=calf+wobbleboard').results.map((r) => r.slug)).toEqual([
			'zz-calf-raises-standing'
		]);
		const any = inRegion('q=calf+march');
		expect(any.anyWord).toBe(true);
		expect(any.results.map((r) => r.slug).sort()).toEqual([
			'zz-calf-raises-standing',
			'zz-seated-march'
		]);
	});

	it('filters by position, movement type, phase and equipment, with or without words', () => {
		expect(inRegion('q=wobbleboard&position=seated').results.map((r) => r.slug)).toEqual([
			'zz-seated-march'
		]);
		expect(inRegion('movement=active-assisted').results.map((r) => r.slug)).toEqual([
			'zz-heel-slides-captions'
		]);
		expect(inRegion('phase=3').results.map((r) => r.slug)).toEqual(['zz-wobbleboard-balance']);
		expect(inRegion('equipment=Chair').results.map((r) => r.slug)).toEqual([
			'zz-calf-raises-standing',
			'zz-seated-march'
		]);
		expect(inRegion('').total).toBe(4);
	});

	it('never finds what is unpublished or retired', () => {
		const slugs = search('q=wobbleboard').results.map((r) => r.slug);
		expect(slugs).not.toContain('zz-hidden');
		expect(slugs).not.toContain('zz-gone');
		expect(library.filterOptions().regions.find((r) => r.value === region)?.count).toBe(4);
	});

	it('marks the matched words in the excerpt', () => {
		const [first] = inRegion('q=board').results;
		expect(first.slug).toBe('zz-wobbleboard-balance');
		expect(first.excerpt).toBe('Stand on the \u0002board\u0003.');
	});

	it('treats operators and quotes typed in the box as words', () => {
		expect(() => search('q=%22wobble+NOT+(board')).not.toThrow();
		expect(inRegion('q=NEAR+OR').results).toEqual([]);
	});
});

describe('collections', () => {
	it('keep an order, publish only with a published exercise, and show only published ones', () => {
		const snapshot = {
			title: 'Collection exercise A',
			description: '',
			bodyRegion: 'Knee',
			side: 'either',
			position: 'seated',
			movementType: 'active',
			equipment: [],
			phase: 1,
			dosage: {
				sets: 1,
				reps: 8,
				holdSeconds: 0,
				restSeconds: 0,
				sessionsPerDay: 1,
				daysPerWeek: 7
			},
			coachingCues: [],
			safetyNotes: '',
			precautionTags: [],
			segment: { id: 'x', durationSeconds: 5, posterCount: 0, captionsLanguage: 'en-GB' },
			cues: []
		};
		const a = insertPublishedEntry(world.clinicId, 'col-a', snapshot);
		const b = insertPublishedEntry(world.clinicId, 'col-b', {
			...snapshot,
			title: 'Collection exercise B'
		});
		const hidden = insertPublishedEntry(
			world.clinicId,
			'col-hidden',
			{ ...snapshot, title: 'Hidden one' },
			{ status: 'unpublished' }
		);

		const collection = collections.createCollection(world.educator.id, {
			title: 'Knee class, week one',
			introduction: 'Start **gently**. <script>alert(1)</script>'
		});
		expect(collection).toMatchObject({ slug: 'knee-class-week-one', status: 'draft' });
		expect(() => collections.publishCollection(collection.id)).toThrow(/at least one published/);
		expect(() => collections.addToCollection(collection.id, hidden.entryId)).toThrow(
			/Only published/
		);

		collections.addToCollection(collection.id, a.entryId);
		collections.addToCollection(collection.id, b.entryId);
		collections.moveInCollection(collection.id, b.entryId, -1);
		expect(collections.collectionItems(collection.id).map((i) => i.slug)).toEqual([
			'col-b',
			'col-a'
		]);

		expect(library.findPublicCollection('knee-class-week-one')).toBeNull();
		collections.publishCollection(collection.id);
		expect(library.findPublicCollection('knee-class-week-one')?.items.map((i) => i.slug)).toEqual([
			'col-b',
			'col-a'
		]);

		publishing.unpublishEntry(b.entryId);
		expect(library.findPublicCollection('knee-class-week-one')?.items.map((i) => i.slug)).toEqual([
			'col-a'
		]);

		collections.unpublishCollection(collection.id);
		expect(library.findPublicCollection('knee-class-week-one')).toBeNull();
	});
});
