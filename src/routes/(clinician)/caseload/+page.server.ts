import { z } from 'zod';
import { requireRole } from '$lib/server/auth/guard';
import { CASELOAD_FILTERS, CASELOAD_SORTS, listCaseload } from '$lib/server/followup';
import type { PageServerLoad } from './$types';

const PAGE_SIZE = 25;

// Anything unreadable in the address falls back to the default rather than failing the page.
const query = z.object({
	sort: z.enum(CASELOAD_SORTS).catch('name'),
	dir: z.enum(['asc', 'desc']).catch('asc'),
	flag: z.enum(CASELOAD_FILTERS).catch('all'),
	q: z.string().trim().max(100).catch(''),
	mine: z
		.enum(['1'])
		.optional()
		.catch(undefined)
		.transform((v) => v === '1'),
	page: z.coerce.number().int().min(1).max(10_000).catch(1)
});

export const load: PageServerLoad = ({ url }) => {
	const clinician = requireRole('clinician');
	const params = query.parse({
		sort: url.searchParams.get('sort') ?? undefined,
		dir: url.searchParams.get('dir') ?? undefined,
		flag: url.searchParams.get('flag') ?? undefined,
		q: url.searchParams.get('q') ?? '',
		mine: url.searchParams.get('mine') ?? undefined,
		page: url.searchParams.get('page') ?? undefined
	});
	const caseload = listCaseload(clinician, { ...params, pageSize: PAGE_SIZE });
	return {
		clinicName: clinician.clinicName,
		query: { ...params, page: caseload.page },
		pageSize: PAGE_SIZE,
		...caseload
	};
};
