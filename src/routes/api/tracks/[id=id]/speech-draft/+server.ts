import { json } from '@sveltejs/kit';
import { apiError } from '$lib/server/api';
import { callerTrack } from '$lib/server/captions/api';
import { findRecording } from '$lib/server/recordings';
import { SpeechDraftError, speechDraftFor, type SpeechDraftAnswer } from '$lib/server/speech';
import type { RequestHandler } from './$types';

export type { SpeechDraftAnswer };

/**
 * Draft cues timed to the recording's speech for an empty captions or subtitles track, with a
 * speech-to-text service's words when one is set. Nothing is saved. Reading the sound can take a
 * while: 200 with the draft, or 202 `working` while it is still being read (ask again; the work
 * carries on and its result is kept).
 */
export const GET: RequestHandler = async ({ params }) => {
	const found = callerTrack(params.id);
	if (found instanceof Response) return found;
	const { caller, track } = found;
	const recording = findRecording(caller.clinicId, track.recordingId);
	if (!recording) return apiError(404, 'Not found.');
	try {
		const answer = await speechDraftFor(recording, track, { waitMs: 15_000 });
		return json(answer satisfies SpeechDraftAnswer, {
			status: answer.state === 'working' ? 202 : 200,
			headers: { 'Cache-Control': 'no-store' }
		});
	} catch (error) {
		if (error instanceof SpeechDraftError) return apiError(error.status, error.message);
		throw error;
	}
};
