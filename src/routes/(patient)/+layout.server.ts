import { requireRole } from '$lib/server/auth/guard';
import type { LayoutServerLoad } from './$types';

/** Every page of this group is for the patient role; the hook checked first, this draws the 403. */
export const load: LayoutServerLoad = () => {
	requireRole('patient');
};
