import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { inboxEnabled, readInboxMessage } from '$lib/server/mail/inbox';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const admin = requireRole('admin');
	if (!inboxEnabled()) error(404, 'Not found.');
	const message = await readInboxMessage(admin.clinicId, params.id);
	if (!message) error(404, 'That message is not in the inbox.');
	return {
		message: {
			id: message.id,
			from: message.from,
			to: message.to,
			subject: message.subject,
			date: message.date,
			text: message.text ?? ''
		}
	};
};
