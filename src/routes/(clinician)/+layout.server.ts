import { requireRole } from '$lib/server/auth/guard';
import type { LayoutServerLoad } from './$types';

/** Every page of this group is for the clinician role; the hook checked first, this draws the 403. */
export const load: LayoutServerLoad = () => {
	requireRole('clinician');
};
