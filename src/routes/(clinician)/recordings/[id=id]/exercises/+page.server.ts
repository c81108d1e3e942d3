import { fail } from '@sveltejs/kit';
import { rowsFromForm } from '$lib/authoring/exercise-proposals';
import {
	MAX_PROPOSAL_ROWS,
	makeExercisesFromSegments,
	segmentProposals
} from '$lib/server/exercises/from-segments';
import { requireOwnRecording } from '$lib/server/recordings/guard';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ params }) => {
	const { recording } = requireOwnRecording(params.id);
	return {
		recording: { id: recording.id, title: recording.title },
		proposals: segmentProposals(recording)
	};
};

export const actions: Actions = {
	make: async ({ params, request }) => {
		const { clinician, recording } = requireOwnRecording(params.id);
		const form = await request.formData();
		const rows = rowsFromForm(form, MAX_PROPOSAL_ROWS);
		const ready = form.get('ready') === 'on';
		const outcome = makeExercisesFromSegments(
			clinician,
			recording,
			rows,
			ready ? 'ready' : 'draft'
		);
		if (!outcome.ok) {
			// Every row comes back as typed, with its problems: nothing was made.
			return fail(400, { rows, ready, problems: outcome.problems });
		}
		return { made: outcome.created.map((e) => ({ id: e.id, title: e.title })), ready };
	}
};
