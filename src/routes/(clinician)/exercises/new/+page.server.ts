import { fail, redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { requireRole } from '$lib/server/auth/guard';
import { createExercise, ExerciseError, segmentChoices } from '$lib/server/exercises';
import { draftFromForm, newExerciseDraft, parseDraft } from '$lib/exercises/form';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ url }) => {
	const clinician = requireRole('clinician');
	const segments = segmentChoices(clinician.clinicId);
	// A recording's segments page may link here with the segment chosen.
	const wanted = url.searchParams.get('segment') ?? '';
	const segmentId = segments.some((s) => s.id === wanted) ? wanted : '';
	return { segments, draft: newExerciseDraft(segmentId) };
};

export const actions: Actions = {
	create: async ({ request }) => {
		const clinician = requireRole('clinician');
		const draft = draftFromForm(await request.formData());
		const parsed = parseDraft(draft);
		if (!parsed.ok) return fail(400, { draft, problems: parsed.problems });
		let id: string;
		try {
			id = createExercise(clinician, parsed.input).id;
		} catch (e) {
			if (e instanceof ExerciseError)
				return fail(409, { draft, problems: [{ path: 'segmentId', message: e.message }] });
			throw e;
		}
		redirect(303, resolve('/(clinician)/exercises/[id=id]?saved=1', { id }));
	}
};
