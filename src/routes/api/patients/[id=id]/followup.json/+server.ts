import { json } from '@sveltejs/kit';
import { NORM_SOURCE_IDS } from '$lib/followup/rom-form';
import type { NormSourceId } from '$lib/clinical/rom';
import { apiCaller, apiError } from '$lib/server/api';
import { patientFollowup, type PatientFollowup } from '$lib/server/followup';
import type { RequestHandler } from './$types';

export type { PatientFollowup };

/**
 * A patient's follow-up — figures with their basis, weekly adherence, daily pain, range-of-motion
 * readings with their comparisons, and the session logs — for a clinician of the patient's
 * clinic; `?norms=` picks the normative table (AAOS by default). Another clinic's patient is 404.
 */
export const GET: RequestHandler = ({ params, url }) => {
	const caller = apiCaller('clinician');
	if (caller instanceof Response) return caller;
	const norms = url.searchParams.get('norms') ?? 'aaos';
	if (!(NORM_SOURCE_IDS as string[]).includes(norms)) {
		return apiError(
			400,
			`Unknown normative table "${norms}"; use one of ${NORM_SOURCE_IDS.join(', ')}.`
		);
	}
	const followup = patientFollowup(caller.clinicId, params.id, {
		normSource: norms as NormSourceId
	});
	if (!followup) return apiError(404, 'Not found.');
	return json(followup, { headers: { 'Cache-Control': 'private, no-store' } });
};
