import { json } from '@sveltejs/kit';
import { apiCaller } from '$lib/server/api';
import {
	recordingListQuery,
	recordingListView,
	type RecordingListView
} from '$lib/server/recordings/list-view';
import type { RequestHandler } from './$types';

export type { RecordingListView };

/**
 * One page of the clinic's recordings, sorted and filtered by the same parameters as the
 * recordings page; the page polls it while a row is processing (a failed poll stays a note on
 * the page, where a failed page-data reload would navigate away from a running upload).
 */
export const GET: RequestHandler = ({ url }) => {
	const caller = apiCaller('clinician');
	if (caller instanceof Response) return caller;
	return json(recordingListView(caller.clinicId, recordingListQuery(url.searchParams)), {
		headers: { 'Cache-Control': 'no-store' }
	});
};
