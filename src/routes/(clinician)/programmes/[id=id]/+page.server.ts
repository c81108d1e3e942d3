import { error, fail, redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { requireRole } from '$lib/server/auth/guard';
import {
	copyProgramme,
	endProgramme,
	findProgramme,
	patientToday,
	ProgrammeError,
	publishProgramme
} from '$lib/server/programmes';
import { builderCatalogue, builderState } from '$lib/server/programmes/builder';
import { saveDraft } from '$lib/server/programmes/save';
import { applyIntent, draftFromForm } from '$lib/programmes/builder';
import type { Actions, PageServerLoad } from './$types';

function ownProgramme(id: string) {
	const clinician = requireRole('clinician');
	const view = findProgramme(clinician.clinicId, id);
	if (!view) error(404, 'Not found.');
	return { clinician, view };
}

export const load: PageServerLoad = ({ params }) => {
	const { clinician, view } = ownProgramme(params.id);
	return {
		...builderState(view),
		catalogue: builderCatalogue(
			clinician.clinicId,
			view.items.map((i) => i.exerciseId)
		)
	};
};

export const actions: Actions = {
	/** Saves what the form holds, after the move a button asked for (the builder without scripts). */
	save: async ({ params, request }) => {
		const { clinician, view } = ownProgramme(params.id);
		const { draft: posted, intent } = draftFromForm(await request.formData());
		const catalogue = builderCatalogue(
			clinician.clinicId,
			view.items.map((i) => i.exerciseId)
		);
		const draft = applyIntent(posted, intent, catalogue);
		// A published programme changes only when the clinician also tells the patient; until
		// then moves stay on the page.
		if (view.programme.status === 'published' && intent.kind !== 'publish')
			return { moved: true, draft };
		const outcome = saveDraft(clinician, params.id, draft);
		if (!outcome.ok)
			return fail(outcome.status, { message: outcome.message, problems: outcome.problems, draft });
		if (intent.kind === 'publish') {
			try {
				const published = await publishProgramme(clinician, params.id);
				return { published: true, changed: published.changed, ended: published.ended };
			} catch (e) {
				if (e instanceof ProgrammeError)
					return fail(e.status, { message: e.message, problems: [], draft });
				throw e;
			}
		}
		return { saved: true };
	},
	end: async ({ params }) => {
		const { clinician } = ownProgramme(params.id);
		endProgramme(clinician, params.id);
		return { endedNow: true };
	},
	copy: async ({ params }) => {
		const { clinician, view } = ownProgramme(params.id);
		const copy = copyProgramme(clinician, params.id, patientToday(view.patient));
		redirect(303, resolve('/(clinician)/programmes/[id=id]', { id: copy.id }));
	}
};
