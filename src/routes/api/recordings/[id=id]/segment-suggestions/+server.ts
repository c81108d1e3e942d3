import { json } from '@sveltejs/kit';
import { apiCaller, apiError } from '$lib/server/api';
import { findRecording } from '$lib/server/recordings';
import { SegmentError, suggestionsFor, type SuggestionsAnswer } from '$lib/server/segments';
import type { RequestHandler } from './$types';

export type { SuggestionsAnswer };

/**
 * Suggested exercise boundaries with the signals behind each. Only reads: the detectors' pass
 * over the rendition is a worker's job (queued here when its result is missing), so this waits a
 * moment for its result and then answers 200 with the suggestions, or 202 `working` (ask again;
 * the page does every second).
 */
export const GET: RequestHandler = async ({ params }) => {
	const caller = apiCaller('clinician');
	if (caller instanceof Response) return caller;
	const recording = findRecording(caller.clinicId, params.id);
	if (!recording) return apiError(404, 'Not found.');
	try {
		const answer = await suggestionsFor(recording, { waitMs: 2_000 });
		return json(answer satisfies SuggestionsAnswer, {
			status: answer.state === 'working' ? 202 : 200,
			headers: { 'Cache-Control': 'no-store' }
		});
	} catch (error) {
		if (error instanceof SegmentError) return apiError(error.status, error.message);
		throw error;
	}
};
