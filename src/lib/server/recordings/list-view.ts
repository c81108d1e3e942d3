import { z } from 'zod';
import { RECORDING_STATUSES } from '../db/schema/recordings';
import { listRecordings, SORTS } from './index';

/** Rows on one page of the recordings list. */
export const RECORDINGS_PAGE_SIZE = 20;

// Anything unreadable in the address falls back to the default rather than failing the page.
const query = z.object({
	sort: z.enum(SORTS).catch('date'),
	dir: z.enum(['asc', 'desc']).catch('desc'),
	status: z.enum([...RECORDING_STATUSES, 'all']).catch('all'),
	q: z.string().trim().max(100).catch(''),
	page: z.coerce.number().int().min(1).max(10_000).catch(1)
});

export type RecordingListQuery = z.infer<typeof query>;

/** The list's sort, filter and page as the address gives them (defaults for anything odd). */
export function recordingListQuery(params: URLSearchParams): RecordingListQuery {
	return query.parse({
		sort: params.get('sort') ?? undefined,
		dir: params.get('dir') ?? undefined,
		status: params.get('status') ?? undefined,
		q: params.get('q') ?? '',
		page: params.get('page') ?? undefined
	});
}

/**
 * One page of the clinic's recordings as the list shows it: the same for the page's load and
 * for `GET /api/recordings`, which the list polls while a row is still processing.
 */
export function recordingListView(clinicId: string, params: RecordingListQuery) {
	const { rows, total } = listRecordings(clinicId, {
		sort: params.sort,
		direction: params.dir,
		status: params.status,
		search: params.q,
		page: params.page,
		pageSize: RECORDINGS_PAGE_SIZE
	});
	return {
		query: params,
		total,
		pageCount: Math.max(1, Math.ceil(total / RECORDINGS_PAGE_SIZE)),
		recordings: rows.map((r) => ({
			id: r.id,
			title: r.title,
			originalFilename: r.originalFilename,
			status: r.status,
			durationSeconds: r.durationSeconds,
			width: r.width,
			height: r.height,
			sizeBytes: r.sizeBytes,
			posterCount: r.posterCount,
			createdAt: r.createdAt.toISOString(),
			progress: r.status === 'processing' ? r.progress : null,
			stage: r.status === 'processing' ? r.stage : null
		}))
	};
}

export type RecordingListView = ReturnType<typeof recordingListView>;
