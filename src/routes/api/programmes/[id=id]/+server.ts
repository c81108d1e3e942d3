import { json } from '@sveltejs/kit';
import { apiCaller, apiError } from '$lib/server/api';
import { findProgramme } from '$lib/server/programmes';
import { builderState, type BuilderState } from '$lib/server/programmes/builder';
import { saveDraft } from '$lib/server/programmes/save';
import type { RequestHandler } from './$types';

/** A programme as the builder shows it. */
export type ProgrammeResponse = BuilderState;

/** A refused save: the JSON error shape, plus each problem and where it belongs. */
export interface ProgrammeSaveRefusal {
	error: { status: number; message: string };
	problems: { path: string; message: string }[];
}

export const GET: RequestHandler = ({ params }) => {
	const caller = apiCaller('clinician');
	if (caller instanceof Response) return caller;
	const view = findProgramme(caller.clinicId, params.id);
	if (!view) return apiError(404, 'Not found.');
	return json(builderState(view) satisfies ProgrammeResponse);
};

/** Saves the whole programme (title, dates, note, items in order), as the builder's live save. */
export const PUT: RequestHandler = async ({ params, request }) => {
	const caller = apiCaller('clinician');
	if (caller instanceof Response) return caller;
	const view = findProgramme(caller.clinicId, params.id);
	if (!view) return apiError(404, 'Not found.');
	// A published programme is what the patient follows: it changes only through "Save changes
	// and e-mail" on the programme page, which tells them. The live save is for drafts.
	if (view.programme.status === 'published') {
		return apiError(
			409,
			'This programme is published, so it was not changed. Use “Save changes and e-mail” so the patient is told.'
		);
	}
	const body = await request.json().catch(() => undefined);
	if (body === undefined) return apiError(400, 'Send the programme as JSON.');
	const outcome = saveDraft(caller, params.id, body, true);
	if (!outcome.ok) {
		return json(
			{
				error: { status: outcome.status, message: outcome.message },
				problems: outcome.problems
			} satisfies ProgrammeSaveRefusal,
			{ status: outcome.status }
		);
	}
	return json(builderState(outcome.view) satisfies ProgrammeResponse);
};
