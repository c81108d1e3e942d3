import { fakesDirectory, testEnv } from './env';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';

// A database of this file's own: the tests count versions and track versions.
process.env.DATABASE_PATH = join(fakesDirectory, `library-captions-${process.pid}.db`);

const { db, schema } = await import('$lib/server/db');
const { eq } = await import('drizzle-orm');
const { getObjectStream, headObject } = await import('$lib/server/storage');
const { libraryKeys } = await import('$lib/server/storage/keys');
const captions = await import('$lib/server/captions');
const submissions = await import('$lib/server/library/submissions');
const publishing = await import('$lib/server/library/publishing');
const library = await import('$lib/server/library/public');
const cueFixes = await import('$lib/server/library/cue-fixes');
const { parseLibraryQuery } = await import('$lib/library/search');
const support = await import('./library-support');

type World = import('./library-support').World;
type Cue = import('$lib/captions/types').Cue;
type Exercise = typeof schema.exercises.$inferSelect;

/*
 * A published version keeps its captions; a caption fix saved in the studio reaches the library
 * through a caption revision, which an educator approves into a new version with the same clip
 * and posters (copies of the old version's) and the new captions. And a caption error that keeps
 * a submission back can be fixed from the checklist, as a new version of the captions track.
 */

let world: World;
let other: World;

beforeAll(() => {
	world = support.makeWorld('Caption revision clinic');
	other = support.makeWorld('Another caption revision clinic');
});

const reviewer = () => ({ id: world.educator.id, name: world.educator.name });
const CAPTION_JUDGEMENT = ['captions-match', 'plain-words'];

async function bodyOf(key: string): Promise<string> {
	const object = await getObjectStream(key);
	if (!object) return '';
	const chunks: Buffer[] = [];
	for await (const chunk of object.body) chunks.push(chunk as Buffer);
	return Buffer.concat(chunks).toString();
}

async function subjectsTo(email: string): Promise<string[]> {
	const list = (await (await fetch(`${testEnv.DEV_INBOX_URL}/messages`)).json()) as {
		to: string[];
		subject: string;
	}[];
	return list.filter((m) => m.to.includes(email)).map((m) => m.subject);
}

const segmentOf = (exercise: Exercise) =>
	db().select().from(schema.segments).where(eq(schema.segments.id, exercise.segmentId!)).get()!;

function trackOf(exercise: Exercise) {
	const segment = segmentOf(exercise);
	return captions.firstCaptionsTrack(segment.clinicId, segment.recordingId)!;
}

/** Saves `cues` as the track's next version, as the studio does. */
function saveTrack(exercise: Exercise, cues: Cue[]): number {
	const track = trackOf(exercise);
	const saved = captions.saveVersion(track, { baseVersion: track.currentVersion, cues });
	if (!saved.ok) throw new Error('conflict');
	return saved.version;
}

const FIXED_CUES: Cue[] = support.GOOD_CUES.map((c) =>
	c.id === '2' ? { ...c, text: 'Slide the heel in, unhurried.' } : c
);

/** A published exercise (version 1) whose segment follows a captions track. */
async function publishedExercise(title: string) {
	const exercise = await support.makeExercise(world, { title }, { track: support.GOOD_CUES });
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
	return { exercise, slug: approved.slug!, versionId: approved.versionId! };
}

const revisionOf = (exercise: Exercise) =>
	submissions.captionRevisionOf(exercise, segmentOf(exercise));

describe('caption revisions', () => {
	it('publish a new version with copies of the same files and the new captions; the old version stays as it was', async () => {
		const { exercise, slug, versionId } = await publishedExercise('Heel slides revised');
		const oldRow = () =>
			db()
				.select()
				.from(schema.libraryVersions)
				.where(eq(schema.libraryVersions.id, versionId))
				.get();
		const before = JSON.stringify(oldRow());

		// The clinician fixes a caption in the track: patients see it now, the library does not.
		saveTrack(exercise, FIXED_CUES);
		const revision = revisionOf(exercise)!;
		expect(revision.refusal).toBeNull();
		expect(revision.diff).toMatchObject({ changed: 1, added: 0, removed: 0, unchanged: 2 });
		const sent = submissions.submitCaptionRevision(world.clinician, exercise.id, {
			captionsVersion: revision.captions.version,
			noteToReviewer: 'One word was wrong.'
		});
		expect(sent).toMatchObject({
			kind: 'captions',
			revisesVersionId: versionId,
			status: 'waiting',
			licence: 'cc-by-nc-4.0',
			attribution: 'Test clinic physiotherapy team',
			consentDetails: 'Signed form kept in the clinic office'
		});
		// Everything but the cues is the published version's.
		const published = oldRow()!;
		expect({ ...sent.snapshot, cues: [] }).toEqual({ ...published.snapshot, cues: [] });
		expect(sent.snapshot.cues).toEqual(FIXED_CUES);
		expect(submissions.checklistOf(sent).items.map((i) => [i.id, i.passed])).toEqual([
			['captions', true],
			['patient-data', true]
		]);
		expect(submissions.listQueue('waiting').find((r) => r.id === sent.id)).toMatchObject({
			kind: 'captions',
			updatesPublished: true,
			passed: 2,
			total: 2
		});
		// A revision is judged on its captions: the whole-exercise ticks do not approve it.
		await expect(
			publishing.decideSubmission(sent.id, reviewer(), {
				decision: 'approved',
				comment: '',
				judgement: support.ALL_JUDGEMENT
			})
		).rejects.toThrow(/Confirm: the captions say what is said/);

		const approved = await publishing.decideSubmission(sent.id, reviewer(), {
			decision: 'approved',
			comment: 'Thanks for the fix.',
			judgement: CAPTION_JUDGEMENT
		});
		expect(approved).toMatchObject({ decision: 'approved', slug, mailed: true });
		const newId = approved.versionId!;
		const found = library.findPublicExercise(slug);
		if (found?.kind !== 'published') throw new Error('not published');
		expect(found.value.version).toMatchObject({
			id: newId,
			version: 2,
			title: 'Heel slides revised',
			posterCount: 2,
			clipSize: support.CLIP_BYTES.length,
			submissionId: sent.id
		});
		expect(found.value.version.snapshot.cues).toEqual(FIXED_CUES);

		// The same pictures, as copies under the new version's own prefix.
		const segmentId = published.snapshot.segment.id;
		const clip = new TextDecoder().decode(support.CLIP_BYTES);
		const poster = new TextDecoder().decode(support.POSTER_BYTES);
		expect(await bodyOf(libraryKeys(newId).segment(segmentId))).toBe(clip);
		expect(await bodyOf(libraryKeys(newId).poster(0))).toBe(poster);
		expect(await bodyOf(libraryKeys(newId).poster(1))).toBe(poster);
		// The old version is unchanged, files included, and no longer served.
		expect(JSON.stringify(oldRow())).toBe(before);
		expect(oldRow()!.snapshot.cues).toEqual(support.GOOD_CUES);
		expect(await bodyOf(libraryKeys(versionId).segment(segmentId))).toBe(clip);
		expect(library.findPublicVersion(versionId)).toBeNull();
		expect(
			library
				.searchLibrary(parseLibraryQuery(new URLSearchParams('q=unhurried')))
				.results.map((r) => r.slug)
		).toEqual([slug]);
		expect(await subjectsTo(world.clinician.email)).toContain(
			'The new captions of “Heel slides revised” are in the public library'
		);
		expect(revisionOf(exercise)?.refusal).toMatch(/same as in the library’s version/);

		// The kind and the revised version are as fixed as the snapshot.
		expect(() =>
			db()
				.update(schema.librarySubmissions)
				.set({ kind: 'exercise' })
				.where(eq(schema.librarySubmissions.id, sent.id))
				.run()
		).toThrow(/never changes/);
		expect(() =>
			db()
				.update(schema.librarySubmissions)
				.set({ revisesVersionId: newId })
				.where(eq(schema.librarySubmissions.id, sent.id))
				.run()
		).toThrow(/never changes/);

		// Retiring deletes every version's copies, the revision's included.
		await publishing.retireEntry(found.value.entry.id);
		expect(await headObject(libraryKeys(newId).segment(segmentId))).toBeNull();
		expect(await headObject(libraryKeys(versionId).segment(segmentId))).toBeNull();
		expect(await headObject(libraryKeys(newId).poster(0))).toBeNull();
	});

	it('is refused in words for an unpublished or retired exercise, and when nothing changed', async () => {
		const { exercise, slug } = await publishedExercise('Ankle pumps revised');
		expect(() =>
			submissions.submitCaptionRevision(world.clinician, exercise.id, { noteToReviewer: '' })
		).toThrow('The captions are the same as in the library’s version; there is nothing to send.');

		saveTrack(exercise, FIXED_CUES);
		const found = library.findPublicExercise(slug);
		if (found?.kind !== 'published') throw new Error('not published');
		const entryId = found.value.entry.id;
		publishing.unpublishEntry(entryId);
		expect(() =>
			submissions.submitCaptionRevision(world.clinician, exercise.id, { noteToReviewer: '' })
		).toThrow(
			'This exercise is unpublished from the library; caption changes can be sent once an educator publishes it again.'
		);

		// Sent while published, then unpublished before the decision: approval waits for it.
		publishing.republishEntry(entryId);
		const sent = submissions.submitCaptionRevision(world.clinician, exercise.id, {
			noteToReviewer: ''
		});
		publishing.unpublishEntry(entryId);
		await expect(
			publishing.decideSubmission(sent.id, reviewer(), {
				decision: 'approved',
				comment: '',
				judgement: CAPTION_JUDGEMENT
			})
		).rejects.toThrow(/unpublished; publish it again before approving caption changes/);
		expect(submissions.findSubmission(sent.id)?.status).toBe('waiting');

		await publishing.retireEntry(entryId);
		expect(() =>
			submissions.submitCaptionRevision(world.clinician, exercise.id, { noteToReviewer: '' })
		).toThrow(/retired from the library, so its captions there cannot change/);
		await expect(
			publishing.decideSubmission(sent.id, reviewer(), {
				decision: 'approved',
				comment: '',
				judgement: CAPTION_JUDGEMENT
			})
		).rejects.toThrow(/retired from the library/);
	});

	it('cannot be sent for another clinic’s exercise', async () => {
		const { exercise } = await publishedExercise('Quad sets revised');
		saveTrack(exercise, FIXED_CUES);
		expect(() =>
			submissions.submitCaptionRevision(other.clinician, exercise.id, { noteToReviewer: '' })
		).toThrow(expect.objectContaining({ status: 404, message: 'Not found.' }));
		expect(submissions.exerciseSubmissions(world.clinicId, exercise.id)).toHaveLength(1);
	});

	it('is refused when the captions were saved again since the page was opened', async () => {
		const { exercise } = await publishedExercise('Bridging revised');
		const seen = saveTrack(exercise, FIXED_CUES);
		saveTrack(exercise, [...FIXED_CUES, { id: '4', start: 8.2, end: 8.9, text: 'Rest.' }]);
		expect(() =>
			submissions.submitCaptionRevision(world.clinician, exercise.id, {
				captionsVersion: seen,
				noteToReviewer: ''
			})
		).toThrow(/saved again since this page was opened/);
	});

	it('can be sent back or rejected with a comment, and gives way to a whole submission', async () => {
		const { exercise } = await publishedExercise('Calf raises revised');
		saveTrack(exercise, FIXED_CUES);
		const first = submissions.submitCaptionRevision(world.clinician, exercise.id, {
			noteToReviewer: ''
		});
		await expect(
			publishing.decideSubmission(first.id, reviewer(), {
				decision: 'changes-requested',
				comment: '',
				judgement: []
			})
		).rejects.toThrow(/comment/);
		await publishing.decideSubmission(first.id, reviewer(), {
			decision: 'changes-requested',
			comment: 'The second caption should name the heel.',
			judgement: []
		});
		expect(submissions.findSubmission(first.id)?.status).toBe('changes-requested');
		expect(await subjectsTo(world.clinician.email)).toContain(
			'Changes requested for the captions of “Calf raises revised”'
		);

		saveTrack(
			exercise,
			support.GOOD_CUES.map((c) =>
				c.id === '2' ? { ...c, text: 'Slide the heel in, gently.' } : c
			)
		);
		const second = submissions.submitCaptionRevision(world.clinician, exercise.id, {
			noteToReviewer: ''
		});
		expect(submissions.findSubmission(first.id)?.status).toBe('superseded');
		await publishing.decideSubmission(second.id, reviewer(), {
			decision: 'rejected',
			comment: 'The library keeps the wording it had.',
			judgement: []
		});
		expect(submissions.findSubmission(second.id)?.status).toBe('rejected');
		expect(await subjectsTo(world.clinician.email)).toContain(
			'The new captions of “Calf raises revised” were not accepted for the library'
		);

		// A whole submission waiting goes out with its own captions; a revision waits for it.
		const third = submissions.submitCaptionRevision(world.clinician, exercise.id, {
			noteToReviewer: ''
		});
		const whole = submissions.submitExercise(
			world.clinician,
			exercise.id,
			support.submissionInput(exercise)
		);
		expect(submissions.findSubmission(third.id)?.status).toBe('superseded');
		expect(whole.kind).toBe('exercise');
		expect(revisionOf(exercise)?.refusal).toMatch(/whole exercise is waiting for review/);
		expect(() =>
			submissions.submitCaptionRevision(world.clinician, exercise.id, { noteToReviewer: '' })
		).toThrow(/whole exercise is waiting for review/);
	});
});

// Ten words in 2.95 s is 203 words per minute, 1.5% over the BBC's 200 (checks.ts cites it).
const FAST: Cue[] = [
	{ id: '1', start: 0, end: 2, text: 'Lie on your back.' },
	{ id: '2', start: 3, end: 5.95, text: 'Bend the knee and slide the heel back in slowly' },
	{ id: '3', start: 7.5, end: 8.8, text: 'Then rest.' }
];

describe('fixing a cue from the checklist', () => {
	it('saves the fix as the track’s next version, and the checks then pass', async () => {
		const exercise = await support.makeExercise(
			world,
			{ title: 'Heel slides, fast caption' },
			{ track: FAST }
		);
		const segment = segmentOf(exercise);
		const checks = () =>
			submissions.checklistOf({
				snapshot: submissions.snapshotOf(exercise, segmentOf(exercise)),
				consentConfirmed: true,
				licence: 'cc-by-nc-4.0',
				attribution: 'Test clinic physiotherapy team'
			});
		expect(checks().items.find((i) => i.id === 'captions')?.passed).toBe(false);

		const offered = cueFixes.cueFixesFor(segment)!;
		expect(offered).toMatchObject({ version: 1, recordingId: segment.recordingId });
		expect(offered.cues).toMatchObject([
			{
				index: 1,
				trackIndex: 1,
				fixes: [{ fix: 'extend-into-gap', label: 'Show cue 2 until 00:06.334 (0.38 s longer)' }]
			}
		]);
		const result = cueFixes.fixSegmentCue(world.clinician, exercise.id, {
			trackId: offered.trackId,
			baseVersion: offered.version,
			trackIndex: 1,
			fix: 'extend-into-gap'
		});
		expect(result).toEqual({
			ok: true,
			version: 2,
			label: 'Show cue 2 until 00:06.334 (0.38 s longer)'
		});
		const track = trackOf(exercise);
		expect(track.currentVersion).toBe(2);
		expect(captions.listVersions(track)[0]).toMatchObject({
			version: 2,
			source: 'edit',
			note: 'Show cue 2 until 00:06.334 (0.38 s longer), from the library checks',
			createdBy: world.clinician.id
		});
		// No re-cut: the segment follows the track, so the checks pass and it can be submitted.
		expect(checks().passed).toBe(true);
		expect(cueFixes.cueFixesFor(segment)?.cues).toEqual([]);
		const sent = submissions.submitExercise(
			world.clinician,
			exercise.id,
			support.submissionInput(exercise)
		);
		expect(submissions.checklistOf(sent).passed).toBe(true);
		expect(sent.snapshot.cues[1]).toMatchObject({ start: 3, end: 6.334 });
	});

	it('writes nothing over a version someone saved since, and says so', async () => {
		const exercise = await support.makeExercise(
			world,
			{ title: 'Heel slides, saved meanwhile' },
			{ track: FAST }
		);
		const offered = cueFixes.cueFixesFor(segmentOf(exercise))!;
		saveTrack(
			exercise,
			FAST.map((c) => (c.id === '3' ? { ...c, text: 'Then rest a moment.' } : c))
		);
		const result = cueFixes.fixSegmentCue(world.clinician, exercise.id, {
			trackId: offered.trackId,
			baseVersion: offered.version,
			trackIndex: 1,
			fix: 'extend-into-gap'
		});
		expect(result).toEqual({
			ok: false,
			version: 2,
			message:
				'Someone saved version 2 of the captions after the version 1 this page showed; nothing was overwritten. The checks below are for version 2.'
		});
		expect(trackOf(exercise).currentVersion).toBe(2);
		expect(captions.getVersion(trackOf(exercise))?.cues[1].end).toBe(5.95);
	});

	it('refuses a fix that is not offered, and another clinic’s exercise', async () => {
		const exercise = await support.makeExercise(
			world,
			{ title: 'Heel slides, no such fix' },
			{ track: FAST }
		);
		const offered = cueFixes.cueFixesFor(segmentOf(exercise))!;
		const input = {
			trackId: offered.trackId,
			baseVersion: offered.version,
			trackIndex: 0,
			fix: 'split-cue' as const
		};
		expect(() => cueFixes.fixSegmentCue(world.clinician, exercise.id, input)).toThrow(
			/does not apply to the captions as they are/
		);
		expect(() =>
			cueFixes.fixSegmentCue(other.clinician, exercise.id, { ...input, trackIndex: 1 })
		).toThrow(expect.objectContaining({ status: 404 }));
		expect(trackOf(exercise).currentVersion).toBe(1);
	});
});
