import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { apiCaller, apiError } from '$lib/server/api';
import { renderSafetyNotes } from '$lib/server/markdown';
import { LIMITS } from '$lib/exercises/schema';
import type { RequestHandler } from './$types';

const body = z.object({ markdown: z.string().max(LIMITS.safetyNotes) });

/** The response: safety notes rendered and sanitised exactly as patients will see them. */
export interface PreviewResponse {
	html: string;
}

export const POST: RequestHandler = async ({ request }) => {
	const caller = apiCaller('clinician', 'educator');
	if (caller instanceof Response) return caller;
	const parsed = body.safeParse(await request.json().catch(() => null));
	if (!parsed.success)
		return apiError(400, `Send {"markdown": "…"} of at most ${LIMITS.safetyNotes} characters.`);
	return json({ html: renderSafetyNotes(parsed.data.markdown) } satisfies PreviewResponse);
};
