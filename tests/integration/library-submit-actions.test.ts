import { fakesDirectory } from './env';
import { join } from 'node:path';
import { isActionFailure, isRedirect } from '@sveltejs/kit';
import { beforeAll, describe, expect, it, vi } from 'vitest';

// A database of this file's own: the tests count track versions and submissions.
process.env.DATABASE_PATH = join(fakesDirectory, `library-submit-actions-${process.pid}.db`);

type Principal = import('$lib/server/auth/principal').Principal;

// The actions read their caller from the request, as in the app; here the test names the caller.
let caller: Principal | null = null;
vi.mock('$app/server', () => ({
	getRequestEvent: () => ({
		locals: { user: caller },
		route: { id: '/(clinician)/exercises/[id=id]/submit' },
		url: new URL('http://kinelume.example/exercises')
	})
}));

const { db, schema } = await import('$lib/server/db');
const { eq } = await import('drizzle-orm');
const captions = await import('$lib/server/captions');
const submissions = await import('$lib/server/library/submissions');
const publishing = await import('$lib/server/library/publishing');
const { actions, load } = await import(
	'../../src/routes/(clinician)/exercises/[id=id]/submit/+page.server'
);
const support = await import('./library-support');

type World = import('./library-support').World;
type Cue = import('$lib/captions/types').Cue;
type Exercise = typeof schema.exercises.$inferSelect;

/*
 * The submit page's form actions, called as the page calls them (form data in, a result or a
 * redirect out): a failing cue fixed from the checklist without leaving the page, and a caption
 * revision sent from it.
 */

let world: World;

beforeAll(() => {
	world = support.makeWorld('Submit page clinic');
	caller = {
		...world.clinician,
		name: 'Test clinician',
		role: 'clinician',
		clinicName: 'Submit page clinic',
		patientId: null,
		timeZone: 'Europe/London'
	};
});

// Ten words in 2.95 s is 203 words per minute, 1.5% over the BBC's 200 (checks.ts cites it).
const FAST: Cue[] = [
	{ id: '1', start: 0, end: 2, text: 'Lie on your back.' },
	{ id: '2', start: 3, end: 5.95, text: 'Bend the knee and slide the heel back in slowly' },
	{ id: '3', start: 7.5, end: 8.8, text: 'Then rest.' }
];

type Event = Parameters<(typeof actions)['fixCue']>[0];

/** What the page's form sends: what is typed, plus the pressed button's name and value. */
function post(exercise: Exercise, fields: Record<string, string>): Event {
	const form = new FormData();
	const typed: Record<string, string> = {
		title: exercise.title,
		description: exercise.description,
		coachingCues: exercise.coachingCues.map((c) => c.text).join('\n'),
		safetyNotes: exercise.safetyNotes,
		consentDetails: 'Signed form kept in the clinic office',
		licence: 'cc-by-nc-4.0',
		attribution: 'Submit page clinic team',
		noteToReviewer: 'Typed before the fix.',
		...fields
	};
	for (const [name, value] of Object.entries(typed)) form.append(name, value);
	return {
		params: { id: exercise.id },
		request: new Request('http://kinelume.example/', { method: 'POST', body: form })
	} as unknown as Event;
}

type PageData =
	import('../../src/routes/(clinician)/exercises/[id=id]/submit/$types').PageServerData;
const pageOf = async (exercise: Exercise) =>
	(await load({
		params: { id: exercise.id },
		url: new URL(`http://kinelume.example/exercises/${exercise.id}/submit`)
	} as unknown as Parameters<typeof load>[0])) as PageData;

function trackOf(exercise: Exercise) {
	const segment = db()
		.select()
		.from(schema.segments)
		.where(eq(schema.segments.id, exercise.segmentId!))
		.get()!;
	return captions.firstCaptionsTrack(segment.clinicId, segment.recordingId)!;
}

describe('the fixCue action', () => {
	it('saves the offered fix on the captions track and checks again, keeping what was typed', async () => {
		const exercise = await support.makeExercise(
			world,
			{ title: 'Heel slides from the page' },
			{ track: FAST }
		);
		const page = await pageOf(exercise);
		expect(page.checklist?.items.find((i) => i.id === 'captions')?.passed).toBe(false);
		const [cue] = page.cueFixes!.cues;
		expect(cue.fixes.map((f) => f.label)).toEqual(['Show cue 2 until 00:06.334 (0.38 s longer)']);

		const result = await actions.fixCue(
			post(exercise, {
				captionsTrack: page.cueFixes!.trackId,
				captionsVersion: String(page.cueFixes!.version),
				fix: `${cue.trackIndex}:${cue.fixes[0].fix}`
			})
		);
		expect(isActionFailure(result)).toBe(false);
		expect(result).toMatchObject({
			checked: true,
			form: {
				id: 'submission',
				data: { noteToReviewer: 'Typed before the fix.', title: 'Heel slides from the page' },
				errors: {}
			},
			fixed: {
				ok: true,
				message:
					'Saved as version 2 of the recording’s captions: Show cue 2 until 00:06.334 (0.38 s longer). Your patients see it too.'
			},
			checklist: { passed: true }
		});
		expect(trackOf(exercise).currentVersion).toBe(2);
		// The page, loaded again, offers nothing more to fix, and the exercise can be submitted.
		expect((await pageOf(exercise)).cueFixes?.cues).toEqual([]);
		const submitted = actions.submit(post(exercise, { consent: 'yes' }));
		await expect(submitted).rejects.toSatisfy(isRedirect);
		const [sent] = submissions.exerciseSubmissions(world.clinicId, exercise.id);
		expect(submissions.checklistOf(sent).passed).toBe(true);
	});

	it('answers 409 and saves nothing when the captions were saved since the page showed them', async () => {
		const exercise = await support.makeExercise(
			world,
			{ title: 'Heel slides saved meanwhile' },
			{ track: FAST }
		);
		const page = await pageOf(exercise);
		const track = trackOf(exercise);
		captions.saveVersion(track, {
			baseVersion: 1,
			cues: FAST.map((c) => (c.id === '1' ? { ...c, text: 'Lie flat on your back.' } : c))
		});
		const result = await actions.fixCue(
			post(exercise, {
				captionsTrack: page.cueFixes!.trackId,
				captionsVersion: '1',
				fix: `${page.cueFixes!.cues[0].trackIndex}:extend-into-gap`
			})
		);
		expect(isActionFailure(result)).toBe(true);
		expect(result).toMatchObject({
			status: 409,
			data: {
				form: { data: { noteToReviewer: 'Typed before the fix.' } },
				fixed: { ok: false, message: expect.stringMatching(/^Someone saved version 2/) },
				checklist: { passed: false }
			}
		});
		expect(trackOf(exercise).currentVersion).toBe(2);
	});

	it('answers 400 for a fix it cannot read', async () => {
		const exercise = await support.makeExercise(
			world,
			{ title: 'Heel slides, odd fix' },
			{ track: FAST }
		);
		const result = await actions.fixCue(
			post(exercise, { captionsTrack: 'x', captionsVersion: '1', fix: '1:delete-everything' })
		);
		expect(result).toMatchObject({ status: 400 });
		expect(trackOf(exercise).currentVersion).toBe(1);
	});
});

describe('the submit action', () => {
	it('refuses two bad fields at once, each problem on its field, and gives back what was typed', async () => {
		const exercise = await support.makeExercise(world, { title: 'Heel slides, two problems' });
		const cues = Array.from({ length: 21 }, (_, i) => `Key point ${i + 1}`).join('\n');
		const result = await actions.submit(
			post(exercise, { title: 'x', coachingCues: cues, consent: 'yes' })
		);
		expect(result).toMatchObject({
			status: 400,
			data: {
				form: {
					valid: false,
					errors: {
						title: ['Give the exercise a title of at least 3 characters.'],
						coachingCues: ['At most 20 key points.']
					},
					// (a posted form sends its line ends as CR LF)
					data: { title: 'x', coachingCues: cues.replaceAll('\n', '\r\n'), consent: true }
				}
			}
		});
		expect(submissions.exerciseSubmissions(world.clinicId, exercise.id)).toEqual([]);
	});
});

describe('the sendCaptions action', () => {
	it('sends the changed captions as a revision of the published version', async () => {
		const exercise = await support.makeExercise(
			world,
			{ title: 'Ankle pumps from the page' },
			{ track: support.GOOD_CUES }
		);
		const first = submissions.submitExercise(
			world.clinician,
			exercise.id,
			support.submissionInput(exercise)
		);
		const approved = await publishing.decideSubmission(
			first.id,
			{ id: world.educator.id, name: world.educator.name },
			{ decision: 'approved', comment: '', judgement: support.ALL_JUDGEMENT }
		);
		expect((await pageOf(exercise)).revision).toBeNull();

		const track = trackOf(exercise);
		captions.saveVersion(track, {
			baseVersion: 1,
			cues: support.GOOD_CUES.map((c) =>
				c.id === '3' ? { ...c, text: 'And slide it back out.' } : c
			)
		});
		const revision = (await pageOf(exercise)).revision!;
		expect(revision).toMatchObject({
			version: 1,
			slug: approved.slug,
			captionsVersion: 2,
			summary: '1 cue changed',
			checksPass: true,
			refusal: null,
			rows: [{ change: 'changed', before: 'And slide it out.', after: 'And slide it back out.' }]
		});

		const form = new FormData();
		form.append('captionsVersion', '2');
		form.append('revisionNote', 'One word added.');
		const event = {
			params: { id: exercise.id },
			request: new Request('http://kinelume.example/', { method: 'POST', body: form })
		} as unknown as Event;
		await expect(actions.sendCaptions(event)).rejects.toMatchObject({
			status: 303,
			location: `/exercises/${exercise.id}/submit?sent=captions`
		});
		const [sent] = submissions.exerciseSubmissions(world.clinicId, exercise.id);
		expect(sent).toMatchObject({
			kind: 'captions',
			noteToReviewer: 'One word added.',
			revisesVersionId: approved.versionId
		});
		expect((await pageOf(exercise)).revision?.refusal).toBe(
			'These caption changes are waiting for an educator’s review.'
		);
	});
});
