import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { MAX_UPLOAD_BYTES } from '$lib/media/validate';
import { FINGERPRINT_PATTERN } from '$lib/recordings/upload-plan';
import { apiCaller, apiError } from '$lib/server/api';
import { answering, jsonBody } from '$lib/server/recordings/api';
import {
	createUpload,
	listOpenUploads,
	type OpenedUpload,
	type OpenUploadView,
	type UploadSession
} from '$lib/server/recordings/uploads';
import type { RequestHandler } from './$types';

export type { OpenedUpload, OpenUploadView, UploadSession };

const createBody = z.object({
	filename: z.string().trim().min(1).max(255),
	contentType: z.string().max(100),
	sizeBytes: z.number().int().min(0).max(MAX_UPLOAD_BYTES, 'Videos can be at most 2 GB.'),
	fingerprint: z
		.string()
		.regex(FINGERPRINT_PATTERN, 'The file’s fingerprint is not 64 hexadecimal digits.')
		.nullable()
		.optional()
});

/** The caller's own unfinished uploads with how much storage holds of each (to offer resuming). */
export const GET: RequestHandler = () => {
	const caller = apiCaller('clinician');
	if (caller instanceof Response) return caller;
	return answering(async () =>
		json(await listOpenUploads(caller), { headers: { 'Cache-Control': 'no-store' } })
	);
};

/**
 * Starts a multipart upload for a declared file (201), or carries on the caller's unfinished
 * upload of the same file — same name, size and fingerprint — from any browser (200); either
 * answer holds the session with its part size and the parts storage already has.
 */
export const POST: RequestHandler = async ({ request }) => {
	const caller = apiCaller('clinician');
	if (caller instanceof Response) return caller;
	const parsed = createBody.safeParse(await jsonBody(request));
	if (!parsed.success) {
		return apiError(400, parsed.error.issues[0]?.message ?? 'Describe the file to upload.');
	}
	return answering(async () => {
		const opened = await createUpload(caller, parsed.data);
		return json(opened, { status: opened.resumed ? 200 : 201 });
	});
};
