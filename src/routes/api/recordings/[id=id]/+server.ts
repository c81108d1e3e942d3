import { json } from '@sveltejs/kit';
import { apiCaller, apiError } from '$lib/server/api';
import { findRecording, statusView, type RecordingStatusView } from '$lib/server/recordings';
import type { RequestHandler } from './$types';

export type { RecordingStatusView };

/** A recording's status and its job's stage and progress; the recording page polls it. */
export const GET: RequestHandler = ({ params }) => {
	const caller = apiCaller('clinician');
	if (caller instanceof Response) return caller;
	const recording = findRecording(caller.clinicId, params.id);
	if (!recording) return apiError(404, 'Not found.');
	return json(statusView(recording), { headers: { 'Cache-Control': 'no-store' } });
};
