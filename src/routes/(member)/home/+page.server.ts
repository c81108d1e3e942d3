import { redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { ROLE_HOME } from '$lib/auth/roles';
import { requireUser } from '$lib/server/auth/guard';
import type { PageServerLoad } from './$types';

/** Sends each person to their own role's home. */
export const load: PageServerLoad = () => {
	redirect(303, resolve(ROLE_HOME[requireUser().role]));
};
