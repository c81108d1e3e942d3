import { SvelteKitAuth, type SvelteKitAuthConfig } from '@auth/sveltekit';
import Credentials from '@auth/sveltekit/providers/credentials';
import Nodemailer from '@auth/sveltekit/providers/nodemailer';
import { DrizzleAdapter } from '@auth/drizzle-adapter';
import { and, eq, lt } from 'drizzle-orm';
import { config } from '$lib/server/config';
import { db, schema } from '$lib/server/db';
import { recordAudit } from '$lib/server/audit';
import { authSecret } from '$lib/server/auth/secret';
import { LONGEST_SESSION_SECONDS } from '$lib/auth/session-policy';
import { safeRedirect } from '$lib/forms/safe-redirect';
import { credentialsSchema } from '$lib/server/auth/credentials';
import { verifyPassword } from '$lib/server/auth/passwords';
import { loadPrincipal } from '$lib/server/auth/principal';
import { currentClientAddress } from '$lib/server/auth/request-context';
import { createSession, endSession } from '$lib/server/auth/sessions';
import {
	attemptLockout,
	auditLinkRequest,
	auditPasswordFailure,
	clearPasswordFailures,
	countLinkRequest,
	countPasswordAttempt
} from '$lib/server/auth/sign-in-limits';
import { sendMail, smtpOptions } from '$lib/server/mail';
import { signInLinkMail } from '$lib/server/mail/templates';
import { normaliseEmail } from '$lib/server/invitations';

/**
 * The e-mailed link on this site's own origin. Auth.js builds it from the request's Host and
 * X-Forwarded-Host headers, which the sender of the request chooses: trusted, a link request with
 * a forged header would send the clinic's own e-mail pointing at another host, and its token to
 * whoever holds that host. Path and query are Auth.js's; the origin is ORIGIN.
 */
function onThisSite(url: string): string {
	const origin = config().ORIGIN;
	const link = new URL(url);
	// Where the link lands after signing in was made absolute from the same headers.
	const callback = link.searchParams.get('callbackUrl');
	if (callback !== null) {
		const parsed = URL.canParse(callback) ? new URL(callback) : null;
		const path = parsed ? `${parsed.pathname}${parsed.search}` : callback;
		link.searchParams.set('callbackUrl', new URL(safeRedirect(path, origin), origin).toString());
	}
	return new URL(`${link.pathname}${link.search}`, origin).toString();
}

function userByEmail(email: string) {
	return db()
		.query.users.findFirst({ where: eq(schema.users.email, normaliseEmail(email)) })
		.sync();
}

/**
 * Auth.js for Kinelume: a password, or a one-time link by e-mail. Sessions are JWTs (required by
 * the credentials provider) carrying the user id and the id of the server's session record
 * (`user_session`, src/lib/server/auth/sessions.ts), which hooks.server.ts checks on every request
 * so a session can be ended; role and clinic are re-read from the database each time.
 *
 * The sign-in limits live here, inside `authorize()` and the e-mailed link's `signIn` callback, so
 * they hold whichever route reaches Auth.js (hooks.server.ts also refuses Auth.js's raw POST
 * routes, leaving only Kinelume's own forms).
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
		// The cookie lives as long as the longest session may; the server record decides sooner.
		session: { strategy: 'jwt', maxAge: LONGEST_SESSION_SECONDS },
		pages: { signIn: '/signin', verifyRequest: '/signin/link-sent', error: '/signin' },
		providers: [
			Credentials({
				credentials: { email: {}, password: {} },
				async authorize(raw) {
					const parsed = credentialsSchema.safeParse(raw);
					if (!parsed.success) return null;
					const { email, password } = parsed.data;
					const address = currentClientAddress();
					// A locked account or address is refused before any password is checked; an
					// attempt let through is counted in the same step, before the slow check, so
					// requests sent all at once cannot all pass.
					if (attemptLockout('password-failure', email, address).locked) return null;
					countPasswordAttempt(email, address);
					const user = userByEmail(email);
					const ok = await verifyPassword(user?.passwordHash ?? null, password);
					// Someone without a role in any clinic cannot use the product yet.
					if (!user || !ok || !loadPrincipal(user.id)) {
						auditPasswordFailure(email, address, !user || !ok ? 'wrong' : 'no role');
						return null;
					}
					clearPasswordFailures(email);
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
					auditLinkRequest(identifier, currentClientAddress(), Boolean(principal));
					if (!principal) return;
					// Only the newest link works: the older unused ones are retired. Auth.js stores
					// this one alongside with exactly `expires`, which the condition keeps.
					const tokens = schema.verificationTokens;
					db()
						.delete(tokens)
						.where(and(eq(tokens.identifier, identifier), lt(tokens.expires, expires)))
						.run();
					await sendMail({
						clinicId: principal.clinicId,
						to: identifier,
						...signInLinkMail({
							url: onThisSite(url),
							expiresAt: expires,
							timeZone: principal.timeZone
						})
					});
				}
			})
		],
		callbacks: {
			signIn({ user, email }) {
				if (email?.verificationRequest) {
					// Past the limit no link is made or sent; the sign-in page answers the same as
					// always, so the form reveals neither the limit nor who has an account.
					const address = normaliseEmail(user.email ?? '');
					const client = currentClientAddress();
					if (attemptLockout('link-request', address, client).locked) return false;
					countLinkRequest(address, client);
					return true;
				}
				// Never create an account from a sign-in link: accounts come from invitations only.
				const existing = user.email ? userByEmail(user.email) : undefined;
				return Boolean(existing && loadPrincipal(existing.id));
			},
			jwt({ token, user }) {
				// Only at sign-in is `user` given: start the server's record of this session.
				if (user?.id) {
					const principal = loadPrincipal(user.id);
					token.sub = user.id;
					token.sid = principal ? createSession(user.id, principal.role) : undefined;
				}
				return token;
			},
			session({ session, token }) {
				if (token.sub) session.user.id = token.sub;
				if (typeof token.sid === 'string') session.sessionId = token.sid;
				return session;
			},
			redirect({ url }) {
				// Auth.js hands absolute URLs built from the request's Host headers; only a path
				// on this site (ORIGIN, never a header) survives.
				const origin = config().ORIGIN;
				const parsed = URL.canParse(url) ? new URL(url) : null;
				const target =
					parsed && parsed.origin === new URL(origin).origin
						? `${parsed.pathname}${parsed.search}`
						: url;
				return new URL(safeRedirect(target, origin), origin).toString();
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
				const token = 'token' in message ? message.token : null;
				const sid = token?.sid;
				endSession(typeof sid === 'string' ? sid : undefined);
				recordAudit({ kind: 'sign-out', actorUserId: token?.sub ?? null, subject: '' });
			}
		}
	};
}
