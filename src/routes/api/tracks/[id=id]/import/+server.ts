import { json } from '@sveltejs/kit';
import type { CaptionProblem } from '$lib/captions/types';
import { apiError } from '$lib/server/api';
import { importFile } from '$lib/server/captions';
import { answering, callerTrack } from '$lib/server/captions/api';
import type { RequestHandler } from './$types';

export interface ImportedResponse {
	version: number;
	cueCount: number;
	warnings: CaptionProblem[];
}
export interface RefusedResponse {
	error: { status: 422; message: string };
	problems: CaptionProblem[];
}

/**
 * Imports a multipart `file` (.vtt or .srt) as the track's next version: 201, or 422 with every
 * problem by line and column and the track left as it was. `baseVersion` is optional.
 */
export const POST: RequestHandler = ({ params, request }) =>
	answering(async () => {
		const found = callerTrack(params.id);
		if (found instanceof Response) return found;
		let form: FormData;
		try {
			form = await request.formData();
		} catch {
			return apiError(400, 'Send the caption file as multipart form data, in a field named file.');
		}
		const file = form.get('file');
		if (!(file instanceof File)) return apiError(400, 'Choose a caption file to import.');
		const base = form.get('baseVersion');
		const baseVersion = typeof base === 'string' && /^\d+$/.test(base) ? Number(base) : undefined;
		const result = importFile(found.track, new Uint8Array(await file.arrayBuffer()), file.name, {
			userId: found.caller.id,
			baseVersion
		});
		if (result.ok) {
			return json(
				{
					version: result.version,
					cueCount: result.cueCount,
					warnings: result.warnings
				} satisfies ImportedResponse,
				{ status: 201 }
			);
		}
		if ('conflict' in result) {
			return json(
				{
					error: {
						status: 409,
						message: `The track moved on to version ${result.conflict.current.version}; nothing was imported.`
					},
					conflict: result.conflict
				},
				{ status: 409 }
			);
		}
		return json(
			{
				error: { status: 422, message: result.message },
				problems: result.errors
			} satisfies RefusedResponse,
			{ status: 422 }
		);
	});
