import { config } from '$lib/server/config';
import { inboxEnabled } from '$lib/server/mail/inbox';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = ({ locals }) => {
	const user = locals.user;
	return {
		viewer: user
			? {
					name: user.name,
					email: user.email,
					role: user.role,
					clinicName: user.clinicName,
					timeZone: user.timeZone
				}
			: null,
		inboxEnabled: user?.role === 'admin' && inboxEnabled(),
		// How long media's storage addresses work: players renew theirs (lib/media/renew-expired).
		mediaUrlLifetimeSeconds: config().MEDIA_URL_LIFETIME_SECONDS
	};
};
