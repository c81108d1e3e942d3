import { z } from 'zod';
import { requireRole } from '$lib/server/auth/guard';
import { listQueue, QUEUE_VIEWS, queueCounts } from '$lib/server/library/submissions';
import type { PageServerLoad } from './$types';

const viewParam = z.enum(QUEUE_VIEWS).catch('waiting');

/**
 * The review queue. Educators review submissions from every clinic: the library is one shared,
 * public collection, so a clinic's educator is not limited to their own clinic's work. What
 * they see of a submission is only what was submitted (and which clinic and person sent it).
 */
export const load: PageServerLoad = ({ url }) => {
	const educator = requireRole('educator');
	const view = viewParam.parse(url.searchParams.get('view') ?? undefined);
	return {
		firstName: educator.name.split(/\s+/)[0],
		view,
		counts: queueCounts(),
		rows: listQueue(view).map((r) => ({
			...r,
			createdAt: r.createdAt.toISOString(),
			decidedAt: r.decidedAt?.toISOString() ?? null
		}))
	};
};
