import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { apiCaller, apiError } from '$lib/server/api';
import { nudgeWorker } from '$lib/server/jobs';
import { findRecording } from '$lib/server/recordings';
import { jsonBody } from '$lib/server/recordings/api';
import {
	confirmSegments,
	recordingSegments,
	SegmentError,
	type RecordingSegments
} from '$lib/server/segments';
import { MAX_SEGMENTS, MAX_TITLE_LENGTH } from '$lib/segments/plan';
import type { RequestHandler } from './$types';

export type { RecordingSegments };

/** A refused confirmation lists every problem, numbered as the page numbers the segments. */
export interface ConfirmRefusal {
	error: { status: number; message: string };
	problems: string[];
}

const confirmBody = z.object({
	segments: z
		.array(
			z.object({
				title: z.string().max(MAX_TITLE_LENGTH * 2),
				start: z.number().finite(),
				end: z.number().finite()
			})
		)
		.max(MAX_SEGMENTS)
});

function ownRecording(id: string) {
	const caller = apiCaller('clinician');
	if (caller instanceof Response) return caller;
	const recording = findRecording(caller.clinicId, id);
	if (!recording) return apiError(404, 'Not found.');
	return { caller, recording };
}

/** The recording's current segments, each with its status and its cut's progress (the page polls this). */
export const GET: RequestHandler = ({ params }) => {
	const found = ownRecording(params.id);
	if (found instanceof Response) return found;
	return json(recordingSegments(found.recording) satisfies RecordingSegments, {
		headers: { 'Cache-Control': 'no-store' }
	});
};

/**
 * Confirms `{ segments: [{ title, start, end }] }`: 201 with the new segments (being cut), or 422
 * with every problem. The segments confirmed before are superseded: those an exercise or a library
 * submission uses stay, the rest are deleted with their clips and posters.
 */
export const POST: RequestHandler = async ({ params, request }) => {
	const found = ownRecording(params.id);
	if (found instanceof Response) return found;
	const parsed = confirmBody.safeParse(await jsonBody(request));
	if (!parsed.success) {
		return apiError(400, 'Send { segments: [{ title, start, end }] } with times in seconds.');
	}
	try {
		confirmSegments(found.caller, found.recording.id, parsed.data.segments);
	} catch (error) {
		if (!(error instanceof SegmentError)) throw error;
		return json(
			{
				error: { status: error.status, message: error.message },
				problems: error.problems
			} satisfies ConfirmRefusal,
			{ status: error.status }
		);
	}
	nudgeWorker();
	return json(recordingSegments(found.recording) satisfies RecordingSegments, { status: 201 });
};
