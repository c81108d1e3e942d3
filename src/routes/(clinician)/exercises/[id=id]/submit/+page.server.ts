import { error, fail, redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { captionChangeRows, captionChangeSummary } from '$lib/library/caption-changes';
import { computeCaptionChecklist, computeChecklist } from '$lib/library/checklist';
import { isCueFix } from '$lib/library/cue-fixes';
import { draftFromForm, parseSubmission, type SubmissionDraft } from '$lib/library/submission-form';
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
		cueCount: segment ? segmentCaptions(segment).cues.length : 0,
		cueFixes: segment ? cueFixesFor(segment) : null,
		revision: revisionView(exercise, segment),
		draft,
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
	/**
	 * Saves one offered caption fix as the track's next version (the studio's save, refused when
	 * someone saved since), then checks again what is typed: the segment follows the track.
	 */
	fixCue: async ({ params, request }) => {
		const { clinician, exercise, segment } = loadExercise(params.id);
		const form = await request.formData();
		const draft = draftFromForm(form);
		const [index, fix] = String(form.get('fix') ?? '').split(':');
		const input = {
			trackId: String(form.get('captionsTrack') ?? ''),
			baseVersion: Number(form.get('captionsVersion')),
			trackIndex: Number(index),
			fix
		};
		// The segment's captions are read afresh from the track, so this is after the fix.
		const checked = () => previewChecklist(exercise, segment, { ...draft, consent: true });
		if (
			!isCueFix(input.fix) ||
			!Number.isInteger(input.trackIndex) ||
			!Number.isInteger(input.baseVersion)
		) {
			return fail(400, {
				draft,
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
					draft,
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
		if (!result.ok) return fail(409, { draft, checked: true, checklist: checked(), fixed });
		return { draft, checked: true, checklist: checked(), fixed };
	},
	/** Sends the segment's captions as they are now as a caption revision of the library's version. */
	sendCaptions: async ({ params, request }) => {
		const { clinician, exercise } = loadExercise(params.id);
		const form = await request.formData();
		const note = String(form.get('revisionNote') ?? '').slice(0, 2000);
		const seen = Number(form.get('captionsVersion') ?? Number.NaN);
		try {
			submitCaptionRevision(clinician, exercise.id, {
				captionsVersion: Number.isInteger(seen) ? seen : undefined,
				noteToReviewer: note
			});
		} catch (e) {
			if (e instanceof LibraryError) {
				if (e.status === 404) error(404, 'Not found.');
				return fail(e.status, { revisionNote: note, revisionProblem: e.message });
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
		redirect(303, resolve('/(clinician)/exercises/[id=id]/submit?sent=1', { id: exercise.id }));
	}
};
