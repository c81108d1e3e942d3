import { redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { endSession } from '$lib/server/auth/sessions';
import { signOut } from '../../../auth';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals }) => ({ signedIn: Boolean(locals.user) });

export const actions: Actions = {
	default: async (event) => {
		// Ending the server's record is what ends the session; Auth.js then clears the cookie.
		endSession(event.locals.sessionId ?? undefined);
		// The browser's HTTP cache may still hold this person's clips (private, max-age=300).
		// Not "storage": that would also delete session logs still waiting to be sent, which
		// are kept per patient until they reach the server; the sign-out form and the signed-out
		// page delete the offline copies themselves (src/lib/offline/forget.ts).
		event.setHeaders({ 'Clear-Site-Data': '"cache"' });
		try {
			await signOut(event);
		} catch (thrown) {
			// Auth.js answers with a redirect; we choose where it lands.
			if (!(thrown && typeof thrown === 'object' && 'location' in thrown)) throw thrown;
		}
		redirect(303, resolve('/signin'));
	}
};
