import type { Principal } from '$lib/server/auth/principal';

declare global {
	namespace App {
		interface Locals {
			/** The signed-in person with their current role and clinic, or null when signed out. */
			user: Principal | null;
		}
		interface Error {
			message: string;
		}
	}
}

export {};
