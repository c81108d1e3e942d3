import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { apiCaller, apiError } from '$lib/server/api';
import { answering, jsonBody } from '$lib/server/recordings/api';
import { presignParts } from '$lib/server/recordings/uploads';
import type { RequestHandler } from './$types';

const body = z.object({ partNumbers: z.array(z.number().int().min(1).max(10_000)).min(1).max(50) });

/** Presigned PUT URLs for some parts, each valid for at most 10 minutes. */
export const POST: RequestHandler = async ({ params, request }) => {
	const caller = apiCaller('clinician');
	if (caller instanceof Response) return caller;
	const parsed = body.safeParse(await jsonBody(request));
	if (!parsed.success) return apiError(400, 'Name between 1 and 50 part numbers.');
	return answering(async () =>
		json({ parts: await presignParts(caller, params.id, parsed.data.partNumbers) })
	);
};
