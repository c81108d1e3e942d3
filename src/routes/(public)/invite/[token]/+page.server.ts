import { error, fail, redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { z } from 'zod';
import { ROLE_LABELS } from '$lib/auth/roles';
import { recordAudit } from '$lib/server/audit';
import { PASSWORD_MIN_LENGTH } from '$lib/server/auth/passwords';
import { startSession } from '$lib/server/auth/session';
import {
	acceptInvitation,
	findInvitation,
	InvitationError,
	statusSentence
} from '$lib/server/invitations';
import type { Actions, PageServerLoad } from './$types';

function pendingInvitation(token: string) {
	const found = findInvitation(token);
	if (!found) error(404, 'This invitation link is not valid. Check that you copied all of it.');
	if (found.status !== 'pending') error(410, statusSentence(found.status));
	return found;
}

export const load: PageServerLoad = ({ params }) => {
	const found = pendingInvitation(params.token);
	return {
		email: found.invitation.email,
		role: found.invitation.role,
		roleLabel: ROLE_LABELS[found.invitation.role],
		clinicName: found.clinicName,
		accountExists: found.accountExists,
		passwordRequired: found.invitation.role !== 'patient',
		passwordMinLength: PASSWORD_MIN_LENGTH
	};
};

const acceptForm = z
	.object({
		name: z
			.string()
			.trim()
			.min(1, 'Enter your name.')
			.max(120, 'Keep your name under 120 characters.'),
		password: z.string().max(1024),
		confirm: z.string().max(1024)
	})
	.refine((f) => f.password === f.confirm, {
		message: 'The two passwords differ.',
		path: ['confirm']
	});

export const actions: Actions = {
	default: async ({ params, request, cookies, url }) => {
		const found = pendingInvitation(params.token);
		const raw = Object.fromEntries(await request.formData());
		const parsed = acceptForm.safeParse({
			name: raw.name ?? '',
			password: raw.password ?? '',
			confirm: raw.confirm ?? ''
		});
		const name = String(raw.name ?? '');
		if (!parsed.success) return fail(400, { name, message: parsed.error.issues[0].message });
		const { password } = parsed.data;
		const required = found.invitation.role !== 'patient';
		if ((required || password) && password.length < PASSWORD_MIN_LENGTH) {
			return fail(400, {
				name,
				message: `Choose a password of at least ${PASSWORD_MIN_LENGTH} characters.`
			});
		}
		let accepted: { userId: string; email: string };
		try {
			accepted = await acceptInvitation(params.token, {
				name: parsed.data.name,
				password: password || null
			});
		} catch (thrown) {
			if (thrown instanceof InvitationError) return fail(409, { name, message: thrown.message });
			throw thrown;
		}
		if (found.invitation.role === 'patient') {
			// The link came to their address, which is proof enough: a patient is signed in at
			// once and goes straight to their programme, with or without a password.
			await startSession(cookies, url, {
				id: accepted.userId,
				email: accepted.email,
				name: parsed.data.name,
				role: 'patient'
			});
			recordAudit({
				kind: 'sign-in',
				clinicId: found.invitation.clinicId,
				actorUserId: accepted.userId,
				subject: accepted.email,
				detail: { method: 'invitation link' }
			});
			redirect(303, resolve('/today'));
		}
		redirect(303, resolve(`/signin?welcome=1&email=${encodeURIComponent(accepted.email)}`));
	}
};
