import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { apiError } from '$lib/server/api';
import {
	cuesSchema,
	getVersion,
	listVersions,
	saveVersion,
	trackSummary,
	type Conflict,
	type TrackSummary,
	type VersionSummary
} from '$lib/server/captions';
import { answering, callerTrack } from '$lib/server/captions/api';
import { jsonBody } from '$lib/server/recordings/api';
import type { Cue } from '$lib/captions/types';
import type { RequestHandler } from './$types';

export interface VersionsResponse {
	track: TrackSummary;
	versions: VersionSummary[];
	/** The current version's cues, so an editor can start from them. */
	current: { version: number; cues: Cue[] };
}
export interface SavedResponse {
	version: number;
}
export interface ConflictResponse {
	error: { status: 409; message: string };
	conflict: Conflict;
}

const saveBody = z.object({
	baseVersion: z.number().int().min(0),
	cues: cuesSchema,
	note: z.string().max(500).optional()
});

/** The track's versions, newest first, and the current cues. */
export const GET: RequestHandler = ({ params }) => {
	const found = callerTrack(params.id);
	if (found instanceof Response) return found;
	const { track } = found;
	return json(
		{
			track: trackSummary(track),
			versions: listVersions(track),
			current: { version: track.currentVersion, cues: getVersion(track)?.cues ?? [] }
		} satisfies VersionsResponse,
		{ headers: { 'Cache-Control': 'no-store' } }
	);
};

/**
 * Saves `{ baseVersion, cues, note? }` as the next version: 201 with its number, or 409 with the
 * caller's cues and the newer current ones when someone saved since `baseVersion`.
 */
export const POST: RequestHandler = ({ params, request }) =>
	answering(async () => {
		const found = callerTrack(params.id);
		if (found instanceof Response) return found;
		const body = saveBody.safeParse(await jsonBody(request));
		if (!body.success) {
			const issue = body.error.issues[0];
			return apiError(
				400,
				`The cues could not be read${issue ? ` (${issue.path.join('.') || 'body'}: ${issue.message})` : ''}.`
			);
		}
		const saved = saveVersion(found.track, { ...body.data, userId: found.caller.id });
		if (!saved.ok) {
			return json(
				{
					error: {
						status: 409,
						message: `Someone saved version ${saved.conflict.current.version} after the version ${saved.conflict.baseVersion} you started from. Nothing was overwritten: both are here.`
					},
					conflict: saved.conflict
				} satisfies ConflictResponse,
				{ status: 409 }
			);
		}
		return json({ version: saved.version } satisfies SavedResponse, { status: 201 });
	});
