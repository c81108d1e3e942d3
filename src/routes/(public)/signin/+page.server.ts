import { CredentialsSignin } from '@auth/sveltekit';
import { resolve } from '$app/paths';
import { fail, isRedirect, redirect } from '@sveltejs/kit';
import { message, setError, superValidate, type SuperValidated } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { z } from 'zod';
import { ROLE_HOME } from '$lib/auth/roles';
import { safeRedirect } from '$lib/forms/safe-redirect';
import { config } from '$lib/server/config';
import { credentialsSchema } from '$lib/server/auth/credentials';
import { attemptLockout, waitInWords } from '$lib/server/auth/sign-in-limits';
import { signIn } from '../../../auth';
import type { Actions, PageServerLoad } from './$types';

const GENERIC_FAILURE =
	'That e-mail address and password do not match an account. Check both and try again.';

const AUTH_ERRORS: Record<string, string> = {
	Verification:
		'That sign-in link has expired or was already used. Ask for a new link below, or sign in with your password.',
	AccessDenied: 'That address cannot sign in here. Ask your clinic for an invitation.',
	CredentialsSignin: GENERIC_FAILURE
};

export const load: PageServerLoad = async ({ locals, url }) => {
	if (locals.user)
		redirect(
			303,
			safeRedirect(
				url.searchParams.get('next'),
				config().ORIGIN,
				resolve(ROLE_HOME[locals.user.role])
			)
		);
	const code = url.searchParams.get('error');
	const email = url.searchParams.get('email') ?? '';
	return {
		next: safeRedirect(url.searchParams.get('next'), config().ORIGIN),
		authError: code ? (AUTH_ERRORS[code] ?? 'Signing in did not work. Please try again.') : null,
		notice: url.searchParams.get('welcome')
			? 'Your account is ready. Sign in below.'
			: url.searchParams.get('ended') === 'everywhere'
				? 'You are signed out on every device. Sign in again below.'
				: null,
		passwordForm: await superValidate({ email }, zod4(passwordForm), {
			id: 'password',
			errors: false
		}),
		linkForm: await superValidate({ email }, zod4(linkForm), { id: 'link', errors: false })
	};
};

// Auth.js's action reads the provider from the form's `providerId`; without it, it would only
// redirect, so a post missing it is refused as incomplete rather than "signed in" nowhere.
const passwordForm = credentialsSchema.extend({
	providerId: z.literal('credentials'),
	redirectTo: z.string().optional()
});

const linkForm = credentialsSchema.pick({ email: true }).extend({
	providerId: z.literal('nodemailer'),
	redirectTo: z.string().optional()
});

/** Auth.js ends sign-in with a redirect; one carrying `error=` means it failed. */
function redirectFailed(location: string, base: URL): boolean {
	return new URL(location, base).searchParams.has('error');
}

/** A post missing its hidden fields is no person's mistake to point at: it is said for the form. */
function noteIncomplete(form: SuperValidated<Record<string, unknown>>) {
	if (form.errors.providerId || form.errors.redirectTo)
		setError(form, '', 'This form arrived incomplete. Reload the page and try again.');
}

export const actions: Actions = {
	password: async (event) => {
		// Auth.js reads the original body afterwards; this reads a copy.
		const body = await event.request.clone().formData();
		const form = await superValidate(body, zod4(passwordForm), { id: 'password' });
		noteIncomplete(form);
		// The password never goes back to the page, whatever the answer.
		form.data.password = '';
		if (!form.valid) return fail(400, { form });
		const { email } = form.data;
		const address = event.getClientAddress();
		// authorize() (src/auth.ts) enforces the limit and counts failures wherever a sign-in
		// comes from; asking here first lets the page answer 429 with the wait in words.
		const lockout = attemptLockout('password-failure', email, address);
		if (lockout.locked) {
			event.setHeaders({ 'Retry-After': String(lockout.retryAfterSeconds) });
			return message(
				form,
				`Too many failed sign-ins. Wait ${waitInWords(lockout)} and try again, or ask for a sign-in link by e-mail.`,
				{ status: 429 }
			);
		}
		try {
			await signIn(event);
		} catch (thrown) {
			// Called from an action, Auth.js throws CredentialsSignin; through its own routes it
			// would redirect with ?error=. Both mean the same failed attempt, said for both fields
			// together so it never tells which of them was wrong.
			const failed =
				thrown instanceof CredentialsSignin ||
				(isRedirect(thrown) && redirectFailed(thrown.location, event.url));
			if (failed) return message(form, GENERIC_FAILURE, { status: 400 });
			if (!isRedirect(thrown)) throw thrown;
			redirect(303, safeRedirect(form.data.redirectTo, config().ORIGIN));
		}
		return message(form, 'Signing in did not finish. Please try again.', { status: 500 });
	},

	link: async (event) => {
		const body = await event.request.clone().formData();
		const form = await superValidate(body, zod4(linkForm), { id: 'link' });
		noteIncomplete(form);
		if (!form.valid) return fail(400, { form });
		const { email } = form.data;
		// Past the limit nothing is sent, yet the answer is the same as always, so the form
		// reveals neither the limit nor whether the address has an account. The signIn callback
		// (src/auth.ts) enforces the limit and counts requests wherever they come from.
		if (attemptLockout('link-request', email, event.getClientAddress()).locked)
			redirect(303, resolve('/signin/link-sent'));
		try {
			await signIn(event);
		} catch (thrown) {
			if (!isRedirect(thrown)) throw thrown;
			// A refusal by the limit (a request racing past the check above) looks like any other.
			const code = new URL(thrown.location, event.url).searchParams.get('error');
			if (code === 'AccessDenied') redirect(303, resolve('/signin/link-sent'));
			if (code) {
				return message(form, 'We could not send a link just now. Please try again in a minute.', {
					status: 400
				});
			}
			redirect(303, resolve('/signin/link-sent'));
		}
		return message(form, 'Please try again.', { status: 500 });
	}
};
