import { redirect } from '@sveltejs/kit';
import { endSession } from '$lib/server/auth/sessions';
import { signOut } from '../../../auth';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals }) => ({ signedIn: Boolean(locals.user) });

export const actions: Actions = {
	default: async (event) => {
		// Ending the server's record is what ends the session; Auth.js then clears the cookie.
		endSession(event.locals.sessionId ?? undefined);
		try {
			await signOut(event);
		} catch (thrown) {
			// Auth.js answers with a redirect; we choose where it lands.
			if (!(thrown && typeof thrown === 'object' && 'location' in thrown)) throw thrown;
		}
		redirect(303, '/signin');
	}
};
