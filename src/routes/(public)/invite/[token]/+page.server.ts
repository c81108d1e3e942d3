import { error, fail, redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { z } from 'zod';
import { ROLE_LABELS } from '$lib/auth/roles';
import { recordAudit } from '$lib/server/audit';
import { newPassword } from '$lib/server/auth/credentials';
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

export const load: PageServerLoad = async ({ params }) => {
	const found = pendingInvitation(params.token);
	return {
		email: found.invitation.email,
		role: found.invitation.role,
		roleLabel: ROLE_LABELS[found.invitation.role],
		clinicName: found.clinicName,
		accountExists: found.accountExists,
		passwordRequired: found.invitation.role !== 'patient',
		passwordMinLength: PASSWORD_MIN_LENGTH,
		form: await superValidate(zod4(acceptForm), { errors: false })
	};
};

// A patient may go without a password and sign in by e-mailed links; staff must choose one
// (the action says so on the field).
const acceptForm = z
	.object({
		name: z
			.string()
			.trim()
			.min(1, 'Enter your name.')
			.max(120, 'Keep your name under 120 characters.'),
		password: newPassword.optional(),
		confirm: z.string().optional()
	})
	.refine((f) => f.password === f.confirm, {
		message: 'The two passwords differ.',
		path: ['confirm'],
		// Said even when another field is wrong too, so one try shows every problem.
		when: (payload) => {
			const value = payload.value as Record<string, unknown>;
			const text = (v: unknown) => v === undefined || typeof v === 'string';
			return text(value.password) && text(value.confirm);
		}
	});

export const actions: Actions = {
	default: async ({ params, request, cookies, url }) => {
		const found = pendingInvitation(params.token);
		const form = await superValidate(request, zod4(acceptForm));
		const { password } = form.data;
		// Passwords are never sent back to the page, refused or not.
		form.data = { ...form.data, password: '', confirm: '' };
		if (found.invitation.role !== 'patient' && !password)
			setError(
				form,
				'password',
				`Choose a password of at least ${PASSWORD_MIN_LENGTH} characters.`
			);
		if (!form.valid) return fail(400, { form });
		let accepted: { userId: string; email: string };
		try {
			accepted = await acceptInvitation(params.token, {
				name: form.data.name,
				password: password || null
			});
		} catch (thrown) {
			if (thrown instanceof InvitationError) return message(form, thrown.message, { status: 409 });
			throw thrown;
		}
		if (found.invitation.role === 'patient') {
			// The link came to their address, which is proof enough: a patient is signed in at
			// once and goes straight to their programme, with or without a password.
			await startSession(cookies, url, {
				id: accepted.userId,
				email: accepted.email,
				name: form.data.name,
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
