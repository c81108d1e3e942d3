import { SvelteKitAuth, type SvelteKitAuthConfig } from '@auth/sveltekit';
import Credentials from '@auth/sveltekit/providers/credentials';
import Nodemailer from '@auth/sveltekit/providers/nodemailer';
import { DrizzleAdapter } from '@auth/drizzle-adapter';
import { eq } from 'drizzle-orm';
import { z } from 'zod';
import { config } from '$lib/server/config';
import { db, schema } from '$lib/server/db';
import { recordAudit } from '$lib/server/audit';
import { authSecret } from '$lib/server/auth/secret';
import { SESSION_MAX_AGE_SECONDS } from '$lib/server/auth/session';
import { verifyPassword } from '$lib/server/auth/passwords';
import { loadPrincipal } from '$lib/server/auth/principal';
import { sendMail, smtpOptions } from '$lib/server/mail';
import { signInLinkMail } from '$lib/server/mail/templates';
import { normaliseEmail } from '$lib/server/invitations';

const credentialsSchema = z.object({
	email: z.email().transform(normaliseEmail),
	password: z.string().min(1).max(1024)
});

function userByEmail(email: string) {
	return db()
		.query.users.findFirst({ where: eq(schema.users.email, normaliseEmail(email)) })
		.sync();
}

/**
 * Auth.js for Kinelume: a password, or a one-time link by e-mail. Sessions are JWTs (required by
 * the credentials provider); each request re-reads the person's role and clinic from the database
 * (hooks.server.ts), so the token carries only the user id.
 *
 * @auth/sveltekit calls the configuration function on every request. It is made once, on the
 * first request rather than at import (the database opens lazily), because building the Drizzle
 * adapter each time cost more than the rest of a small request.
 */
export const {
	handle: authHandle,
	signIn,
	signOut
} = SvelteKitAuth(async () => (authConfig ??= makeAuthConfig()));

let authConfig: SvelteKitAuthConfig | undefined;

function makeAuthConfig(): SvelteKitAuthConfig {
	return {
		adapter: DrizzleAdapter(db(), {
			usersTable: schema.users,
			accountsTable: schema.accounts,
			sessionsTable: schema.sessions,
			verificationTokensTable: schema.verificationTokens
		}),
		secret: authSecret(),
		trustHost: true,
		session: { strategy: 'jwt', maxAge: SESSION_MAX_AGE_SECONDS },
		pages: { signIn: '/signin', verifyRequest: '/signin/link-sent', error: '/signin' },
		providers: [
			Credentials({
				credentials: { email: {}, password: {} },
				async authorize(raw) {
					const parsed = credentialsSchema.safeParse(raw);
					if (!parsed.success) return null;
					const user = userByEmail(parsed.data.email);
					const ok = await verifyPassword(user?.passwordHash ?? null, parsed.data.password);
					// Someone without a role in any clinic cannot use the product yet.
					if (!user || !ok || !loadPrincipal(user.id)) return null;
					return { id: user.id, email: user.email, name: user.name };
				}
			}),
			Nodemailer({
				// Our sendVerificationRequest sends through the app's own transport; the provider
				// still requires its settings.
				server: smtpOptions(),
				from: config().MAIL_FROM,
				maxAge: 30 * 60,
				async sendVerificationRequest({ identifier, url, expires }) {
					// Unknown addresses get no e-mail, yet the page says the same thing to everyone,
					// so the form does not reveal who has an account.
					const user = userByEmail(identifier);
					const principal = user ? loadPrincipal(user.id) : null;
					if (!principal) return;
					await sendMail({
						to: identifier,
						...signInLinkMail({ url, expiresAt: expires, timeZone: principal.timeZone })
					});
				}
			})
		],
		callbacks: {
			signIn({ user, email }) {
				if (email?.verificationRequest) return true;
				// Never create an account from a sign-in link: accounts come from invitations only.
				const existing = user.email ? userByEmail(user.email) : undefined;
				return Boolean(existing && loadPrincipal(existing.id));
			},
			jwt({ token, user }) {
				if (user?.id) token.sub = user.id;
				return token;
			},
			session({ session, token }) {
				if (token.sub) session.user.id = token.sub;
				return session;
			}
		},
		logger: {
			// A wrong password or a spent link is an expected answer, already shown to the person and
			// audited; logging each as an error would bury the real ones.
			error(error) {
				if (error.name === 'CredentialsSignin' || error.name === 'Verification') return;
				console.error('[auth]', error);
			}
		},
		events: {
			signIn({ user, account }) {
				const principal = user.id ? loadPrincipal(user.id) : null;
				recordAudit({
					kind: 'sign-in',
					clinicId: principal?.clinicId,
					actorUserId: user.id,
					subject: user.email ?? '',
					detail: { method: account?.provider === 'credentials' ? 'password' : 'e-mail link' }
				});
			},
			signOut(message) {
				const sub = 'token' in message ? message.token?.sub : undefined;
				recordAudit({ kind: 'sign-out', actorUserId: sub ?? null, subject: '' });
			}
		}
	};
}
