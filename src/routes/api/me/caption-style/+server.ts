import { json } from '@sveltejs/kit';
import { apiError } from '$lib/server/api';
import { jsonBody } from '$lib/server/recordings/api';
import { captionStyleOf, saveCaptionStyle } from '$lib/server/sessions';
import { apiPatient } from '$lib/server/sessions/guard';
import { captionStyleSchema, judgeContrast, type CaptionStyle } from '$lib/sessions/caption-style';
import type { RequestHandler } from './$types';

export interface CaptionStyleResponse {
	style: CaptionStyle;
	/** E.g. "21.0 : 1". */
	ratio: string;
}

function answer(style: CaptionStyle): Response {
	return json({
		style,
		ratio: judgeContrast(style.color, style.background).ratioText
	} satisfies CaptionStyleResponse);
}

/** The signed-in patient's caption look (the default until they choose). */
export const GET: RequestHandler = () => {
	const caller = apiPatient();
	if (caller instanceof Response) return caller;
	return answer(captionStyleOf(caller.patient));
};

/**
 * Saves the patient's caption look. Colours must be hex and at least 4.5 : 1 apart (WCAG 2.2
 * SC 1.4.3) — the browser checks the same, this is the check that counts.
 */
export const PUT: RequestHandler = async ({ request }) => {
	const caller = apiPatient();
	if (caller instanceof Response) return caller;
	const parsed = captionStyleSchema.safeParse(await jsonBody(request));
	if (!parsed.success) {
		return apiError(422, parsed.error.issues[0]?.message ?? 'Choose a caption size and colours.');
	}
	saveCaptionStyle(caller.patient.id, parsed.data);
	return answer(parsed.data);
};
