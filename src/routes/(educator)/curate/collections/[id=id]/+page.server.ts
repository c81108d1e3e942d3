import { error, fail } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { collectionDetails } from '$lib/library/collection-form';
import { requireRole } from '$lib/server/auth/guard';
import {
	addableExercises,
	addToCollection,
	collectionItems,
	findCollection,
	moveInCollection,
	publishCollection,
	removeFromCollection,
	setCover,
	unpublishCollection,
	updateCollection
} from '$lib/server/library/collections';
import { LibraryError } from '$lib/server/library/submissions';
import { renderSafetyNotes } from '$lib/server/markdown';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	requireRole('educator');
	const collection = findCollection(params.id);
	if (!collection) error(404, 'Not found.');
	const items = collectionItems(collection.id);
	return {
		collection: {
			id: collection.id,
			slug: collection.slug,
			title: collection.title,
			introduction: collection.introduction,
			introductionHtml: renderSafetyNotes(collection.introduction),
			status: collection.status,
			cover: collection.coverLibraryExerciseId
				? `${collection.coverLibraryExerciseId}:${collection.coverPoster}`
				: ''
		},
		items: items.map((i) => ({
			entryId: i.entryId,
			slug: i.slug,
			title: i.title,
			status: i.status,
			posters: i.versionId
				? Array.from({ length: i.posterCount }, (_, n) => ({
						value: `${i.entryId}:${n}`,
						url: `/api/library/versions/${i.versionId}/poster-${n}.jpg`
					}))
				: []
		})),
		addable: addableExercises(collection.id),
		detailsForm: await superValidate(
			{ title: collection.title, introduction: collection.introduction },
			zod4(collectionDetails),
			{ id: 'details', errors: false }
		)
	};
};

type Step = (collectionId: string, form: FormData) => unknown;

/** Runs one change of the buttons' forms, answering a refusal as a message. */
async function run(params: { id: string }, request: Request, step: Step, done: string) {
	requireRole('educator');
	const form = await request.formData();
	if (!findCollection(params.id)) error(404, 'Not found.');
	try {
		await step(params.id, form);
		return { message: done };
	} catch (e) {
		if (e instanceof LibraryError) {
			return fail(e.status, { message: e.message, problem: true });
		}
		throw e;
	}
}

const entry = (form: FormData) => String(form.get('entryId') ?? '');

export const actions: Actions = {
	save: async ({ params, request }) => {
		requireRole('educator');
		if (!findCollection(params.id)) error(404, 'Not found.');
		const form = await superValidate(request, zod4(collectionDetails), { id: 'details' });
		if (!form.valid) return fail(400, { form });
		try {
			updateCollection(params.id, form.data);
		} catch (e) {
			if (e instanceof LibraryError) {
				form.valid = false;
				form.message = e.message;
				return fail(e.status, { form });
			}
			throw e;
		}
		return { form, message: 'Saved.' };
	},
	add: ({ params, request }) =>
		run(params, request, (id, form) => addToCollection(id, entry(form)), 'Added.'),
	up: ({ params, request }) =>
		run(params, request, (id, form) => moveInCollection(id, entry(form), -1), 'Moved up.'),
	down: ({ params, request }) =>
		run(params, request, (id, form) => moveInCollection(id, entry(form), 1), 'Moved down.'),
	remove: ({ params, request }) =>
		run(params, request, (id, form) => removeFromCollection(id, entry(form)), 'Removed.'),
	cover: ({ params, request }) =>
		run(
			params,
			request,
			(id, form) => {
				const [entryId, poster] = String(form.get('cover') ?? '').split(':');
				setCover(id, entryId ?? '', Number(poster));
			},
			'Cover chosen.'
		),
	publish: ({ params, request }) =>
		run(params, request, (id) => publishCollection(id), 'Published: anyone can see it now.'),
	unpublish: ({ params, request }) =>
		run(
			params,
			request,
			(id) => unpublishCollection(id),
			'Unpublished: its page answers “not found”.'
		)
};
