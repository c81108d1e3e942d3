import { fail, redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { eq } from 'drizzle-orm';
import { setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { z } from 'zod';
import { ROLE_LABELS } from '$lib/auth/roles';
import { newPassword } from '$lib/server/auth/credentials';
import { requireUser } from '$lib/server/auth/guard';
import { hashPassword, PASSWORD_MIN_LENGTH, verifyPassword } from '$lib/server/auth/passwords';
import { endSessionsOf, sessionCountOf } from '$lib/server/auth/sessions';
import { sessionCookieName } from '$lib/server/auth/session';
import { config } from '$lib/server/config';
import { db, schema } from '$lib/server/db';
import { sendMail } from '$lib/server/mail';
import { passwordChangedMail } from '$lib/server/mail/templates';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const user = requireUser();
	const row = db()
		.query.users.findFirst({ where: eq(schema.users.id, user.id) })
		.sync();
	return {
		name: user.name,
		email: user.email,
		roleLabel: ROLE_LABELS[user.role],
		clinicName: user.clinicName,
		hasPassword: Boolean(row?.passwordHash),
		otherSessions: Math.max(0, sessionCountOf(user.id) - 1),
		passwordMinLength: PASSWORD_MIN_LENGTH,
		passwordForm: await superValidate(zod4(passwordForm), { id: 'password' })
	};
};

const passwordForm = z
	.object({
		current: z.string().max(1024),
		password: newPassword,
		confirm: z.string()
	})
	.refine((f) => f.password === f.confirm, {
		message: 'The two new passwords differ.',
		path: ['confirm'],
		// Said even when another field is wrong too, so one try shows every problem.
		when: (payload) => {
			const value = payload.value as Record<string, unknown>;
			return typeof value.password === 'string' && typeof value.confirm === 'string';
		}
	});

export const actions: Actions = {
	/** Ends every session of this person, this one included (a phone left somewhere, a shared computer). */
	everywhere: ({ locals, cookies, url }) => {
		const user = requireUser();
		endSessionsOf(user.id, 'signed-out-everywhere', { by: user });
		locals.user = null;
		cookies.delete(sessionCookieName(url), { path: '/' });
		redirect(303, resolve('/signin?ended=everywhere'));
	},

	password: async ({ request, locals }) => {
		const user = requireUser();
		const form = await superValidate(request, zod4(passwordForm), { id: 'password' });
		const { current, password } = form.data;
		// Passwords are never sent back to the page, refused or not.
		form.data = { current: '', password: '', confirm: '' };
		const row = db()
			.query.users.findFirst({ where: eq(schema.users.id, user.id) })
			.sync();
		if (row?.passwordHash && !(await verifyPassword(row.passwordHash, current))) {
			setError(form, 'current', 'Your current password is not right.');
		}
		if (!form.valid) return fail(400, { form });
		db()
			.update(schema.users)
			.set({ passwordHash: await hashPassword(password) })
			.where(eq(schema.users.id, user.id))
			.run();
		// Whoever knew the old password may hold a session: every other one ends.
		const ended = endSessionsOf(user.id, 'password-changed', {
			keep: locals.sessionId ?? undefined,
			by: user
		});
		// The owner hears of it by e-mail, in case the session that did it was not theirs.
		try {
			await sendMail({
				clinicId: user.clinicId,
				to: user.email,
				...passwordChangedMail({
					name: user.name,
					firstPassword: !row?.passwordHash,
					at: new Date(),
					timeZone: user.timeZone,
					signInUrl: new URL('/signin', config().ORIGIN).toString()
				})
			});
		} catch (error) {
			console.error(`[account] the password notice to ${user.email} failed:`, error);
		}
		return { form, saved: true, ended };
	}
};
