import { error, redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { readReplayCode } from '$lib/programmes/replay-code';
import { ownItemByCode } from '$lib/server/programmes/sheet';
import { requirePatient } from '$lib/server/sessions/guard';
import type { PageServerLoad } from './$types';

/**
 * The short address printed on a programme sheet. The signed-out are sent to sign in first (by
 * the hook and requirePatient); a signed-in patient goes on to the replay of their own item,
 * which checks again. Any other code — another patient's, a draft's, a mistyped one — is a 404.
 */
export const load: PageServerLoad = async ({ params }) => {
	const { patient } = requirePatient();
	const code = readReplayCode(params.code);
	const itemId = code ? await ownItemByCode(patient.id, code) : undefined;
	if (!itemId) error(404, 'Not found.');
	redirect(303, resolve('/(patient)/replay/[id=id]', { id: itemId }));
};
