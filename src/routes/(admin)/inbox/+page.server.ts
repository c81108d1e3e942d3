import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { inboxEnabled, listInbox } from '$lib/server/mail/inbox';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const admin = requireRole('admin');
	// The development inbox exists only where the mail fake does (DEV_INBOX_URL set).
	if (!inboxEnabled()) error(404, 'Not found.');
	try {
		return { messages: await listInbox(admin.clinicId), problem: null };
	} catch (e) {
		return { messages: [], problem: e instanceof Error ? e.message : String(e) };
	}
};
