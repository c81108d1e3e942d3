import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { MAX_UPLOAD_BYTES } from '$lib/media/validate';
import { apiCaller, apiError } from '$lib/server/api';
import { answering, jsonBody } from '$lib/server/recordings/api';
import { createUpload, listOpenUploads, type UploadSession } from '$lib/server/recordings/uploads';
import type { RequestHandler } from './$types';

export type { UploadSession };

const createBody = z.object({
	filename: z.string().trim().min(1).max(255),
	contentType: z.string().max(100),
	sizeBytes: z.number().int().min(0).max(MAX_UPLOAD_BYTES, 'Videos can be at most 2 GB.')
});

/** The caller's unfinished uploads (to offer resuming them). */
export const GET: RequestHandler = () => {
	const caller = apiCaller('clinician');
	if (caller instanceof Response) return caller;
	return json(listOpenUploads(caller));
};

/** Starts a multipart upload for a declared file; answers the session with its part size. */
export const POST: RequestHandler = async ({ request }) => {
	const caller = apiCaller('clinician');
	if (caller instanceof Response) return caller;
	const parsed = createBody.safeParse(await jsonBody(request));
	if (!parsed.success) {
		return apiError(400, parsed.error.issues[0]?.message ?? 'Describe the file to upload.');
	}
	return answering(async () => json(await createUpload(caller, parsed.data), { status: 201 }));
};
