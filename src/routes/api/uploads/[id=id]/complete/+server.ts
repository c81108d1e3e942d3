import { json } from '@sveltejs/kit';
import { apiCaller } from '$lib/server/api';
import { nudgeWorker } from '$lib/server/jobs';
import { answering } from '$lib/server/recordings/api';
import { completeUpload } from '$lib/server/recordings/uploads';
import type { RequestHandler } from './$types';

/**
 * Finishes an upload and checks the file. 201 with the new recording's id, or 422 with the plain
 * reason it was refused (the file is already deleted then), or 409 while parts are missing.
 */
export const POST: RequestHandler = ({ params }) => {
	const caller = apiCaller('clinician');
	if (caller instanceof Response) return caller;
	return answering(async () => {
		const recording = await completeUpload(caller, params.id);
		nudgeWorker();
		return json({ recordingId: recording.id }, { status: 201 });
	});
};
