import { json } from '@sveltejs/kit';
import { apiCaller } from '$lib/server/api';
import { answering } from '$lib/server/recordings/api';
import { abortUpload, uploadState } from '$lib/server/recordings/uploads';
import type { RequestHandler } from './$types';

/** The session and the parts storage already holds: what a resumed upload may skip. */
export const GET: RequestHandler = ({ params }) => {
	const caller = apiCaller('clinician');
	if (caller instanceof Response) return caller;
	return answering(async () => json(await uploadState(caller, params.id)));
};

/** Gives up an upload: storage frees its parts. */
export const DELETE: RequestHandler = ({ params }) => {
	const caller = apiCaller('clinician');
	if (caller instanceof Response) return caller;
	return answering(async () => {
		await abortUpload(caller, params.id);
		return new Response(null, { status: 204 });
	});
};
