import { apiCaller, apiError } from '$lib/server/api';
import { findRecording } from '$lib/server/recordings';
import {
	assetKey,
	redirectToObject,
	serveObject,
	versionAsked
} from '$lib/server/recordings/media';
import type { RequestHandler } from './$types';

/**
 * A recording's rendition, posters, sprite or waveform. Only clinicians of the recording's
 * clinic; anyone else's id reads as not found. The rendition and pictures are redirects to a
 * short-lived storage address; the waveform, read by the page's script, is streamed from here
 * (a few kilobytes, and same-origin needs no cross-origin rules at storage). `?v=360` or `?v=540`
 * asks for a smaller version of the rendition (the largest when it has none of that size).
 */
export const GET: RequestHandler = ({ params, request }) => {
	const caller = apiCaller('clinician');
	if (caller instanceof Response) return caller;
	const recording = findRecording(caller.clinicId, params.id);
	if (!recording) return apiError(404, 'Not found.');
	const short = versionAsked(request);
	if (short instanceof Response) return short;
	const asset = assetKey(recording, params.asset, short);
	if (!asset) return apiError(404, 'Not found.');
	if (params.asset === 'waveform.json') return serveObject(request, asset.key, asset.type);
	return redirectToObject(request, asset.key, asset.type);
};

export const HEAD = GET;
