import { fail } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import {
	listEntries,
	republishEntry,
	retireEntry,
	unpublishEntry
} from '$lib/server/library/publishing';
import { LibraryError } from '$lib/server/library/submissions';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = () => {
	requireRole('educator');
	return {
		entries: listEntries().map((e) => ({ ...e, publishedAt: e.publishedAt.toISOString() }))
	};
};

/** Runs one change of an exercise's state, answering a refusal as a form message. */
async function change(request: Request, step: (id: string) => unknown, done: string) {
	requireRole('educator');
	const form = await request.formData();
	const id = String(form.get('id') ?? '');
	try {
		await step(id);
		return { message: done, id, problem: false };
	} catch (e) {
		if (e instanceof LibraryError) return fail(e.status, { message: e.message, id, problem: true });
		throw e;
	}
}

export const actions: Actions = {
	unpublish: ({ request }) =>
		change(
			request,
			unpublishEntry,
			'Unpublished: its page now answers “not found” until you publish it again.'
		),
	republish: ({ request }) => change(request, republishEntry, 'Published again.'),
	retire: async ({ request }) => {
		const form = await request.clone().formData();
		if (form.get('confirm') !== 'yes') {
			requireRole('educator');
			return fail(400, {
				message: 'Tick “I understand” to retire an exercise; it cannot be undone.',
				id: String(form.get('id') ?? ''),
				problem: true
			});
		}
		return change(
			request,
			retireEntry,
			'Retired: its page now says it was retired from the library, and its files are deleted.'
		);
	}
};
