import { fail, redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { collectionDetails } from '$lib/library/collection-form';
import { requireRole } from '$lib/server/auth/guard';
import { createCollection, listCollections } from '$lib/server/library/collections';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	requireRole('educator');
	return {
		collections: listCollections().map((c) => ({ ...c, updatedAt: c.updatedAt.toISOString() })),
		form: await superValidate(zod4(newCollection), { errors: false })
	};
};

const newCollection = collectionDetails.pick({ title: true });

export const actions: Actions = {
	create: async ({ request }) => {
		const educator = requireRole('educator');
		const form = await superValidate(request, zod4(newCollection));
		if (!form.valid) return fail(400, { form });
		const collection = createCollection(educator.id, {
			title: form.data.title,
			introduction: ''
		});
		redirect(303, resolve('/(educator)/curate/collections/[id=id]', { id: collection.id }));
	}
};
