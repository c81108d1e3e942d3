import type { Principal } from '$lib/server/auth/principal';

declare global {
	namespace App {
		interface Locals {
			/** The signed-in person with their current role and clinic, or null when signed out. */
			user: Principal | null;
			/** The server's record of this sign-in (src/lib/server/auth/sessions.ts), when signed in. */
			sessionId: string | null;
		}
		interface Error {
			message: string;
		}
	}
}

declare module '@auth/core/jwt' {
	interface JWT {
		/** The id of the server's session record (table user_session). */
		sid?: string;
	}
}

declare module '@auth/core/types' {
	interface Session {
		sessionId?: string;
	}
}

export {};
