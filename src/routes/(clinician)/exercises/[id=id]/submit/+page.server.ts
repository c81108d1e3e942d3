import { error, fail, redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { z } from 'zod';
import { captionChangeRows, captionChangeSummary } from '$lib/library/caption-changes';
import { computeCaptionChecklist, computeChecklist } from '$lib/library/checklist';
import { isCueFix } from '$lib/library/cue-fixes';
import {
	parseSubmission,
	submissionForm,
	toSubmission,
	type SubmissionDraft
} from '$lib/library/submission-form';
import { requireRole } from '$lib/server/auth/guard';
import type { Exercise, SegmentRow } from '$lib/server/db/schema';
import { cueFixesFor, fixSegmentCue } from '$lib/server/library/cue-fixes';
import {
	captionRevisionOf,
	entryForExercise,
	exerciseSubmissions,
	findClinicExercise,
	LibraryError,
	snapshotOf,
	submitCaptionRevision,
	submitExercise
} from '$lib/server/library/submissions';
import { segmentCaptions } from '$lib/server/segments';
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

/**
 * The library's captions against the segment's now, when they differ: what changed, whether the
 * caption checks pass, and whether the changes can be sent (and if not, why).
 */
function revisionView(exercise: Exercise, segment: SegmentRow | null) {
	const revision = captionRevisionOf(exercise, segment);
	if (!revision || revision.diff.entries.length === 0) return null;
	const checks = computeCaptionChecklist({
		...revision.version.snapshot,
		cues: revision.captions.cues
	});
	return {
		version: revision.version.version,
		slug: revision.entry.slug,
		captionsVersion: revision.captions.version,
		summary: captionChangeSummary(revision.diff),
		rows: captionChangeRows(revision.diff),
		checksPass: checks.passed,
		refusal: revision.refusal
	};
}

function loadExercise(id: string) {
	const clinician = requireRole('clinician');
	const found = findClinicExercise(clinician.clinicId, id);
	if (!found) error(404, 'Not found.');
	return { clinician, ...found };
}

export const load: PageServerLoad = async ({ params, url }) => {
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
		cueCount: segment ? segmentCaptions(segment).cues.length : 0,
		cueFixes: segment ? cueFixesFor(segment) : null,
		revision: revisionView(exercise, segment),
		form: await superValidate(draft, zod4(submissionForm), { id: 'submission', errors: false }),
		captionsForm: await superValidate({ revisionNote: '' }, zod4(captionsForm), {
			id: 'captions',
			errors: false
		}),
		filledFrom: fromLatest ? { createdAt: latest.createdAt.toISOString() } : null,
		checklist: previewChecklist(exercise, segment, { ...draft, consent: true }),
		blocked,
		published: entry ? { slug: entry.slug, status: entry.status } : null,
		history: history.map((h) => ({
			id: h.id,
			title: h.snapshot.title,
			kind: h.kind,
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

/** The caption changes' note: the same limit as the submission's note to the reviewer. */
const captionsForm = z.object({ revisionNote: submissionForm.shape.noteToReviewer });

/**
 * The submission form as posted, unchecked: running the checks or fixing a caption says nothing
 * of the form's own problems (an unticked consent is no problem until the form is sent).
 */
const typed = (posted: FormData) =>
	superValidate(posted, zod4(submissionForm), { id: 'submission', errors: false });

export const actions: Actions = {
	/** Runs the reviewer's checks on what is typed, without sending anything. */
	check: async ({ params, request }) => {
		const { exercise, segment } = loadExercise(params.id);
		const form = await typed(await request.formData());
		return {
			form,
			checked: true,
			checklist: previewChecklist(exercise, segment, { ...form.data, consent: true })
		};
	},
	/**
	 * Saves one offered caption fix as the track's next version (the studio's save, refused when
	 * someone saved since), then checks again what is typed: the segment follows the track.
	 */
	fixCue: async ({ params, request }) => {
		const { clinician, exercise, segment } = loadExercise(params.id);
		const posted = await request.formData();
		const form = await typed(posted);
		const [index, fix] = String(posted.get('fix') ?? '').split(':');
		const input = {
			trackId: String(posted.get('captionsTrack') ?? ''),
			baseVersion: Number(posted.get('captionsVersion')),
			trackIndex: Number(index),
			fix
		};
		// The segment's captions are read afresh from the track, so this is after the fix.
		const checked = () => previewChecklist(exercise, segment, { ...form.data, consent: true });
		if (
			!isCueFix(input.fix) ||
			!Number.isInteger(input.trackIndex) ||
			!Number.isInteger(input.baseVersion)
		) {
			return fail(400, {
				form,
				checked: true,
				checklist: checked(),
				fixed: { ok: false, message: 'That fix could not be read; nothing was saved.' }
			});
		}
		let result;
		try {
			result = fixSegmentCue(clinician, exercise.id, { ...input, fix: input.fix });
		} catch (e) {
			if (e instanceof LibraryError) {
				if (e.status === 404) error(404, 'Not found.');
				return fail(e.status, {
					form,
					checked: true,
					checklist: checked(),
					fixed: { ok: false, message: e.message }
				});
			}
			throw e;
		}
		const fixed = result.ok
			? {
					ok: true,
					message: `Saved as version ${result.version} of the recording’s captions: ${result.label}. Your patients see it too.`
				}
			: { ok: false, message: result.message };
		if (!result.ok) return fail(409, { form, checked: true, checklist: checked(), fixed });
		return { form, checked: true, checklist: checked(), fixed };
	},
	/** Sends the segment's captions as they are now as a caption revision of the library's version. */
	sendCaptions: async ({ params, request }) => {
		const { clinician, exercise } = loadExercise(params.id);
		const posted = await request.formData();
		const form = await superValidate(posted, zod4(captionsForm), { id: 'captions' });
		if (!form.valid) return fail(400, { form });
		const seen = Number(posted.get('captionsVersion') ?? Number.NaN);
		try {
			submitCaptionRevision(clinician, exercise.id, {
				captionsVersion: Number.isInteger(seen) ? seen : undefined,
				noteToReviewer: form.data.revisionNote
			});
		} catch (e) {
			if (e instanceof LibraryError) {
				if (e.status === 404) error(404, 'Not found.');
				form.valid = false;
				form.message = e.message;
				return fail(e.status, { form });
			}
			throw e;
		}
		redirect(
			303,
			resolve('/(clinician)/exercises/[id=id]/submit?sent=captions', { id: exercise.id })
		);
	},
	submit: async ({ params, request }) => {
		const { clinician, exercise, segment } = loadExercise(params.id);
		const form = await superValidate(request, zod4(submissionForm), { id: 'submission' });
		const checklist = () => previewChecklist(exercise, segment, { ...form.data, consent: true });
		if (!form.valid) return fail(400, { form, checklist: checklist() });
		try {
			submitExercise(clinician, exercise.id, toSubmission(form.data));
		} catch (e) {
			if (e instanceof LibraryError) {
				// A refusal of the whole submission (the exercise retired or its clip gone meanwhile).
				form.valid = false;
				form.message = e.message;
				return fail(e.status, { form, checklist: checklist() });
			}
			throw e;
		}
		redirect(303, resolve('/(clinician)/exercises/[id=id]/submit?sent=1', { id: exercise.id }));
	}
};
