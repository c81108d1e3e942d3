import { z } from 'zod';
import { PASSWORD_MIN_LENGTH } from '$lib/server/auth/passwords';
import { normaliseEmail } from '$lib/server/invitations';

// Longer would only make the slow hash slower; no person types more.
const PASSWORD_MAX = 1024;
const PASSWORD_TOO_LONG = 'A password here has at most 1,024 characters.';

/** An e-mail address as a person types it, kept in the one form it is stored and compared in. */
export const emailAddress = z
	.email('Enter a valid e-mail address.')
	.max(320, 'An e-mail address has at most 320 characters.')
	.transform(normaliseEmail);

/** What a password sign-in carries: checked alike by the sign-in form and Auth.js's authorize(). */
export const credentialsSchema = z.object({
	email: emailAddress,
	password: z.string().min(1, 'Enter your password.').max(PASSWORD_MAX, PASSWORD_TOO_LONG)
});

/** A password someone chooses: long enough, and one that sign-in will take. */
export const newPassword = z
	.string()
	.min(PASSWORD_MIN_LENGTH, `Choose a password of at least ${PASSWORD_MIN_LENGTH} characters.`)
	.max(PASSWORD_MAX, PASSWORD_TOO_LONG);
