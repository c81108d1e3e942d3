import { apiCaller, apiError } from '$lib/server/api';
import { findRecording } from '$lib/server/recordings';
import { assetKey, serveObject } from '$lib/server/recordings/media';
import type { RequestHandler } from './$types';

/**
 * A recording's rendition, posters, sprite or waveform, streamed with byte ranges for seeking.
 * Only clinicians of the recording's clinic; anyone else's id reads as not found.
 */
export const GET: RequestHandler = ({ params, request }) => {
	const caller = apiCaller('clinician');
	if (caller instanceof Response) return caller;
	const recording = findRecording(caller.clinicId, params.id);
	if (!recording) return apiError(404, 'Not found.');
	const asset = assetKey(recording, params.asset);
	if (!asset) return apiError(404, 'Not found.');
	return serveObject(request, asset.key, asset.type);
};

export const HEAD = GET;
