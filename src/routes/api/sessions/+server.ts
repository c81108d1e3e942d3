import { json } from '@sveltejs/kit';
import { apiError } from '$lib/server/api';
import { jsonBody } from '$lib/server/recordings/api';
import { tellCliniciansOfPain } from '$lib/server/followup/pain-alerts';
import { recordSession, SessionLogError } from '$lib/server/sessions';
import { apiPatient } from '$lib/server/sessions/guard';
import { sessionLogSchema, type SessionLogResponse } from '$lib/sessions/log';
import type { RequestHandler } from './$types';

export type { SessionLogResponse };

/**
 * Logs one session of the signed-in patient; a log with severe pain or "sharp or new pain" also
 * e-mails their clinicians (at most once a patient a day). Idempotent on the device-made `clientId`: the first
 * send answers 201, any later send of the same log 200 with the log as first stored. An exercise
 * outside the patient's programmes is 404, like any other patient's record.
 */
export const POST: RequestHandler = async ({ request }) => {
	const caller = apiPatient();
	if (caller instanceof Response) return caller;
	const parsed = sessionLogSchema.safeParse(await jsonBody(request));
	if (!parsed.success) {
		return apiError(400, parsed.error.issues[0]?.message ?? 'The session log is not complete.');
	}
	try {
		const result = recordSession(caller.patient, parsed.data);
		// Severe or sharp pain reaches the clinicians by e-mail; the patient's answer does not wait.
		if (result.created) void tellCliniciansOfPain(caller.patient, result.log);
		return json(result satisfies SessionLogResponse, { status: result.created ? 201 : 200 });
	} catch (error) {
		if (error instanceof SessionLogError) return apiError(error.status, error.message);
		throw error;
	}
};
