import { CredentialsSignin } from '@auth/sveltekit';
import { resolve } from '$app/paths';
import { fail, isRedirect, redirect } from '@sveltejs/kit';
import { z } from 'zod';
import { ROLE_HOME } from '$lib/auth/roles';
import { safeRedirect } from '$lib/forms/safe-redirect';
import { config } from '$lib/server/config';
import { attemptLockout, waitInWords } from '$lib/server/auth/sign-in-limits';
import { normaliseEmail } from '$lib/server/invitations';
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

export const load: PageServerLoad = ({ locals, url }) => {
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
	return {
		next: safeRedirect(url.searchParams.get('next'), config().ORIGIN),
		authError: code ? (AUTH_ERRORS[code] ?? 'Signing in did not work. Please try again.') : null,
		notice: url.searchParams.get('welcome')
			? 'Your account is ready. Sign in below.'
			: url.searchParams.get('ended') === 'everywhere'
				? 'You are signed out on every device. Sign in again below.'
				: null,
		email: url.searchParams.get('email') ?? ''
	};
};

// Auth.js's action reads the provider from the form's `providerId`; without it, it would only
// redirect, so a post missing it is refused as incomplete rather than "signed in" nowhere.
const passwordForm = z.object({
	providerId: z.literal('credentials'),
	email: z.email().max(320).transform(normaliseEmail),
	password: z.string().min(1).max(1024),
	redirectTo: z.string().optional()
});

const linkForm = z.object({
	providerId: z.literal('nodemailer'),
	email: z.email().max(320).transform(normaliseEmail),
	redirectTo: z.string().optional()
});

/** Auth.js ends sign-in with a redirect; one carrying `error=` means it failed. */
function redirectFailed(location: string, base: URL): boolean {
	return new URL(location, base).searchParams.has('error');
}

export const actions: Actions = {
	password: async (event) => {
		// Auth.js reads the original body; we read a copy to validate and rate-limit first.
		const form = Object.fromEntries(await event.request.clone().formData());
		const parsed = passwordForm.safeParse(form);
		if (!parsed.success) {
			return fail(400, {
				method: 'password',
				email: String(form.email ?? ''),
				message: 'Enter your e-mail address and your password.'
			});
		}
		const { email } = parsed.data;
		const address = event.getClientAddress();
		// authorize() (src/auth.ts) enforces the limit and counts failures wherever a sign-in
		// comes from; asking here first lets the page answer 429 with the wait in words.
		const lockout = attemptLockout('password-failure', email, address);
		if (lockout.locked) {
			event.setHeaders({ 'Retry-After': String(lockout.retryAfterSeconds) });
			return fail(429, {
				method: 'password',
				email,
				message: `Too many failed sign-ins. Wait ${waitInWords(lockout)} and try again, or ask for a sign-in link by e-mail.`
			});
		}
		try {
			await signIn(event);
		} catch (thrown) {
			// Called from an action, Auth.js throws CredentialsSignin; through its own routes it
			// would redirect with ?error=. Both mean the same failed attempt.
			const failed =
				thrown instanceof CredentialsSignin ||
				(isRedirect(thrown) && redirectFailed(thrown.location, event.url));
			if (failed) return fail(400, { method: 'password', email, message: GENERIC_FAILURE });
			if (!isRedirect(thrown)) throw thrown;
			redirect(303, safeRedirect(parsed.data.redirectTo, config().ORIGIN));
		}
		return fail(500, {
			method: 'password',
			email,
			message: 'Signing in did not finish. Please try again.'
		});
	},

	link: async (event) => {
		const form = Object.fromEntries(await event.request.clone().formData());
		const parsed = linkForm.safeParse(form);
		if (!parsed.success) {
			return fail(400, {
				method: 'link',
				email: String(form.email ?? ''),
				message: 'Enter the e-mail address your clinic invited.'
			});
		}
		const { email } = parsed.data;
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
				return fail(400, {
					method: 'link',
					email,
					message: 'We could not send a link just now. Please try again in a minute.'
				});
			}
			redirect(303, resolve('/signin/link-sent'));
		}
		return fail(500, { method: 'link', email, message: 'Please try again.' });
	}
};
