import { z } from 'zod';
import { normaliseEmail } from '$lib/server/invitations';

/** An e-mail address as a person types it, kept in the one form it is stored and compared in. */
export const emailAddress = z
	.email('Enter a valid e-mail address.')
	.max(320, 'An e-mail address has at most 320 characters.')
	.transform(normaliseEmail);

/** What a password sign-in carries: checked alike by the sign-in form and Auth.js's authorize(). */
export const credentialsSchema = z.object({
	email: emailAddress,
	password: z
		.string()
		.min(1, 'Enter your password.')
		.max(1024, 'A password here has at most 1,024 characters.')
});
