import { error, fail, redirect } from '@sveltejs/kit';
import { computeChecklist } from '$lib/library/checklist';
import { draftFromForm, parseSubmission, type SubmissionDraft } from '$lib/library/submission-form';
import { requireRole } from '$lib/server/auth/guard';
import type { Exercise, SegmentRow } from '$lib/server/db/schema';
import {
	entryForExercise,
	exerciseSubmissions,
	findClinicExercise,
	LibraryError,
	snapshotOf,
	submitExercise
} from '$lib/server/library/submissions';
import type { Actions, PageServerLoad } from './$types';

function draftFromExercise(exercise: Exercise, clinicName: string): SubmissionDraft {
	return {
		title: exercise.title,
		description: exercise.description,
		coachingCues: exercise.coachingCues.map((c) => c.text).join('\n'),
		safetyNotes: exercise.safetyNotes,
		consent: false,
		consentDetails: '',
		licence: 'cc-by-nc-4.0',
		attribution: `${clinicName} physiotherapy team`,
		noteToReviewer: ''
	};
}

/** What the reviewer's checks would say of a draft, before it is sent. */
function previewChecklist(exercise: Exercise, segment: SegmentRow | null, draft: SubmissionDraft) {
	if (!segment) return null;
	const parsed = parseSubmission({ ...draft, consent: true });
	const wording = parsed.ok
		? parsed.input.wording
		: {
				title: draft.title,
				description: draft.description,
				coachingCues: draft.coachingCues.split(/\r?\n/),
				safetyNotes: draft.safetyNotes
			};
	return computeChecklist({
		snapshot: snapshotOf(exercise, segment, wording),
		consentConfirmed: draft.consent,
		licence: draft.licence,
		attribution: draft.attribution
	});
}

function loadExercise(id: string) {
	const clinician = requireRole('clinician');
	const found = findClinicExercise(clinician.clinicId, id);
	if (!found) error(404, 'Not found.');
	return { clinician, ...found };
}

export const load: PageServerLoad = ({ params, url }) => {
	const { clinician, exercise, segment } = loadExercise(params.id);
	const history = exerciseSubmissions(clinician.clinicId, exercise.id);
	const latest = history[0];
	const fromLatest = latest && url.searchParams.get('from') !== 'exercise';
	const draft: SubmissionDraft = fromLatest
		? {
				title: latest.snapshot.title,
				description: latest.snapshot.description,
				coachingCues: latest.snapshot.coachingCues.map((c) => c.text).join('\n'),
				safetyNotes: latest.snapshot.safetyNotes,
				consent: false,
				consentDetails: latest.consentDetails,
				licence: latest.licence,
				attribution: latest.attribution,
				noteToReviewer: ''
			}
		: draftFromExercise(exercise, clinician.clinicName);
	const entry = entryForExercise(exercise.id);
	const blocked =
		exercise.status === 'retired'
			? 'This exercise is retired, so it cannot go to the library.'
			: !segment
				? 'Choose a demonstration segment for this exercise first.'
				: segment.status !== 'ready'
					? 'The segment’s clip is not cut yet; come back once it is ready.'
					: null;
	return {
		exercise: {
			id: exercise.id,
			title: exercise.title,
			updatedAt: exercise.updatedAt.toISOString()
		},
		cueCount: segment?.cues.length ?? 0,
		draft,
		filledFrom: fromLatest ? { createdAt: latest.createdAt.toISOString() } : null,
		checklist: previewChecklist(exercise, segment, { ...draft, consent: true }),
		blocked,
		published: entry ? { slug: entry.slug, status: entry.status } : null,
		history: history.map((h) => ({
			id: h.id,
			title: h.snapshot.title,
			status: h.status,
			createdAt: h.createdAt.toISOString(),
			reviews: h.reviews.map((r) => ({
				id: r.id,
				decision: r.decision,
				comment: r.comment,
				createdAt: r.createdAt.toISOString()
			}))
		}))
	};
};

export const actions: Actions = {
	/** Runs the reviewer's checks on what is typed, without sending anything. */
	check: async ({ params, request }) => {
		const { exercise, segment } = loadExercise(params.id);
		const draft = draftFromForm(await request.formData());
		return {
			draft,
			checked: true,
			checklist: previewChecklist(exercise, segment, { ...draft, consent: true })
		};
	},
	submit: async ({ params, request }) => {
		const { clinician, exercise, segment } = loadExercise(params.id);
		const draft = draftFromForm(await request.formData());
		const parsed = parseSubmission(draft);
		if (!parsed.ok) {
			return fail(400, {
				draft,
				problems: parsed.problems,
				checklist: previewChecklist(exercise, segment, { ...draft, consent: true })
			});
		}
		try {
			submitExercise(clinician, exercise.id, parsed.input);
		} catch (e) {
			if (e instanceof LibraryError) {
				return fail(e.status, {
					draft,
					problems: [{ path: '', message: e.message }],
					checklist: previewChecklist(exercise, segment, { ...draft, consent: true })
				});
			}
			throw e;
		}
		redirect(303, `/exercises/${exercise.id}/submit?sent=1`);
	}
};
