import { OFFLINE_KEY_HEADER } from '$lib/offline/scope';
import { requireRole } from '$lib/server/auth/guard';
import { offlineKey } from '$lib/server/offline/key';
import type { LayoutServerLoad } from './$types';

/** Every page of this group is for the patient role; the hook checked first, this draws the 403. */
export const load: LayoutServerLoad = ({ locals, setHeaders }) => {
	const user = requireRole('patient');
	// Names whose offline copies these pages are (src/service-worker saves only those).
	const key = offlineKey(locals.sessionId, user.id);
	setHeaders({ [OFFLINE_KEY_HEADER]: key });
	return { offlineKey: key };
};
