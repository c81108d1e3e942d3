import { apiCaller, apiError } from '$lib/server/api';
import { exportTrack } from '$lib/server/captions';
import { serveCaptionFile } from '$lib/server/captions/serve';
import { findRecording } from '$lib/server/recordings';
import { findChaptersTrack } from '$lib/server/segments';
import type { RequestHandler } from './$types';

/** The recording's chapters track (one chapter per confirmed segment) as WebVTT. */
export const GET: RequestHandler = ({ params, request }) => {
	const caller = apiCaller('clinician');
	if (caller instanceof Response) return caller;
	const recording = findRecording(caller.clinicId, params.id);
	if (!recording) return apiError(404, 'Not found.');
	const track = findChaptersTrack(recording);
	const file = track && track.currentVersion > 0 ? exportTrack(track, 'vtt') : null;
	if (!file)
		return apiError(404, 'This recording has no chapters yet; confirm its segments first.');
	return serveCaptionFile(request, { ...file, format: 'vtt' });
};
