import { error, fail } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import {
	ExerciseError,
	findExercise,
	programmesUsing,
	segmentChoices,
	updateExercise
} from '$lib/server/exercises';
import { renderSafetyNotes } from '$lib/server/markdown';
import { draftFromExercise, draftFromForm, parseDraft } from '$lib/exercises/form';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ params }) => {
	const clinician = requireRole('clinician');
	const exercise = findExercise(clinician.clinicId, params.id);
	if (!exercise) error(404, 'Not found.');
	return {
		exercise: {
			id: exercise.id,
			title: exercise.title,
			status: exercise.status,
			updatedAt: exercise.updatedAt.toISOString(),
			hasSegment: exercise.segment !== null
		},
		programmeCount: programmesUsing(exercise.id),
		segments: segmentChoices(clinician.clinicId, exercise.segment),
		draft: draftFromExercise(exercise),
		safetyHtml: renderSafetyNotes(exercise.safetyNotes)
	};
};

export const actions: Actions = {
	save: async ({ params, request }) => {
		const clinician = requireRole('clinician');
		const draft = draftFromForm(await request.formData());
		const parsed = parseDraft(draft);
		if (!parsed.ok) return fail(400, { draft, problems: parsed.problems });
		try {
			const saved = updateExercise(clinician, params.id, parsed.input);
			if (!saved) error(404, 'Not found.');
			return { saved: true, draft: draftFromExercise(saved) };
		} catch (e) {
			if (e instanceof ExerciseError)
				return fail(409, { draft, problems: [{ path: 'segmentId', message: e.message }] });
			throw e;
		}
	}
};
