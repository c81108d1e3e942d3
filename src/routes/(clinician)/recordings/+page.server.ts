import { z } from 'zod';
import { RECORDING_STATUSES } from '$lib/server/db/schema/recordings';
import { requireRole } from '$lib/server/auth/guard';
import { listRecordings, SORTS } from '$lib/server/recordings';
import { listOpenUploads } from '$lib/server/recordings/uploads';
import type { PageServerLoad } from './$types';

const PAGE_SIZE = 20;

// Anything unreadable in the address falls back to the default rather than failing the page.
const query = z.object({
	sort: z.enum(SORTS).catch('date'),
	dir: z.enum(['asc', 'desc']).catch('desc'),
	status: z.enum([...RECORDING_STATUSES, 'all']).catch('all'),
	q: z.string().trim().max(100).catch(''),
	page: z.coerce.number().int().min(1).max(10_000).catch(1)
});

export const load: PageServerLoad = ({ url }) => {
	const clinician = requireRole('clinician');
	const params = query.parse({
		sort: url.searchParams.get('sort') ?? undefined,
		dir: url.searchParams.get('dir') ?? undefined,
		status: url.searchParams.get('status') ?? undefined,
		q: url.searchParams.get('q') ?? '',
		page: url.searchParams.get('page') ?? undefined
	});
	const { rows, total } = listRecordings(clinician.clinicId, {
		sort: params.sort,
		direction: params.dir,
		status: params.status,
		search: params.q,
		page: params.page,
		pageSize: PAGE_SIZE
	});
	return {
		clinicName: clinician.clinicName,
		query: params,
		total,
		pageCount: Math.max(1, Math.ceil(total / PAGE_SIZE)),
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
		})),
		openUploads: listOpenUploads(clinician)
	};
};
