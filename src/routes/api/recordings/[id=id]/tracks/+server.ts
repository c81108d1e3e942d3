import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { TRACK_KINDS } from '$lib/captions/types';
import { apiCaller, apiError } from '$lib/server/api';
import { createTrack, listTracks, trackSummary, type TrackSummary } from '$lib/server/captions';
import { answering } from '$lib/server/captions/api';
import { findRecording } from '$lib/server/recordings';
import { jsonBody } from '$lib/server/recordings/api';
import type { RequestHandler } from './$types';

export type { TrackSummary };
export interface TracksResponse {
	tracks: TrackSummary[];
}

const createBody = z.object({
	kind: z.enum(TRACK_KINDS),
	language: z.string().trim().min(1).max(35),
	label: z.string().trim().max(100).optional()
});

/** The recording's caption tracks. */
export const GET: RequestHandler = ({ params }) => {
	const caller = apiCaller('clinician');
	if (caller instanceof Response) return caller;
	const recording = findRecording(caller.clinicId, params.id);
	if (!recording) return apiError(404, 'Not found.');
	return json({ tracks: listTracks(caller.clinicId, recording.id) } satisfies TracksResponse, {
		headers: { 'Cache-Control': 'no-store' }
	});
};

/** Makes an empty track: `{ kind, language, label? }` → 201 with the track. */
export const POST: RequestHandler = ({ params, request }) =>
	answering(async () => {
		const caller = apiCaller('clinician');
		if (caller instanceof Response) return caller;
		const recording = findRecording(caller.clinicId, params.id);
		if (!recording) return apiError(404, 'Not found.');
		const body = createBody.safeParse(await jsonBody(request));
		if (!body.success) {
			return apiError(
				400,
				'Send a kind (captions, subtitles, chapters or descriptions) and a language tag.'
			);
		}
		const track = createTrack(recording, body.data);
		return json(trackSummary(track), { status: 201 });
	});
