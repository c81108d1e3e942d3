import { fail, redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { z } from 'zod';
import { requireRole } from '$lib/server/auth/guard';
import { createCollection, listCollections } from '$lib/server/library/collections';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = () => {
	requireRole('educator');
	return {
		collections: listCollections().map((c) => ({ ...c, updatedAt: c.updatedAt.toISOString() }))
	};
};

const newCollection = z.object({
	title: z
		.string()
		.trim()
		.min(3, 'Give the collection a title of at least 3 characters.')
		.max(120, 'Keep the title under 120 characters.')
});

export const actions: Actions = {
	create: async ({ request }) => {
		const educator = requireRole('educator');
		const form = await request.formData();
		const title = String(form.get('title') ?? '');
		const parsed = newCollection.safeParse({ title });
		if (!parsed.success) return fail(400, { title, message: parsed.error.issues[0].message });
		const collection = createCollection(educator.id, {
			title: parsed.data.title,
			introduction: ''
		});
		redirect(303, resolve('/(educator)/curate/collections/[id=id]', { id: collection.id }));
	}
};
