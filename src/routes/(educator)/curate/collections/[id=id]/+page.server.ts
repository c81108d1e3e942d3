import { error, fail } from '@sveltejs/kit';
import { z } from 'zod';
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

export const load: PageServerLoad = ({ params }) => {
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
		addable: addableExercises(collection.id)
	};
};

const details = z.object({
	title: z.string().trim().min(3, 'Give the collection a title of at least 3 characters.').max(120),
	introduction: z.string().max(6000, 'Keep the introduction under 6,000 characters.')
});

type Step = (collectionId: string, form: FormData) => unknown;

/** Runs one change, answering a refusal as a form message that keeps what was typed. */
async function run(params: { id: string }, request: Request, step: Step, done: string) {
	requireRole('educator');
	const form = await request.formData();
	if (!findCollection(params.id)) error(404, 'Not found.');
	try {
		await step(params.id, form);
		return { message: done };
	} catch (e) {
		if (e instanceof LibraryError) {
			return fail(e.status, {
				message: e.message,
				problem: true,
				title: String(form.get('title') ?? ''),
				introduction: String(form.get('introduction') ?? '')
			});
		}
		throw e;
	}
}

const entry = (form: FormData) => String(form.get('entryId') ?? '');

export const actions: Actions = {
	save: ({ params, request }) =>
		run(
			params,
			request,
			(id, form) => {
				const parsed = details.safeParse({
					title: String(form.get('title') ?? ''),
					introduction: String(form.get('introduction') ?? '')
				});
				if (!parsed.success) throw new LibraryError(400, parsed.error.issues[0].message);
				updateCollection(id, parsed.data);
			},
			'Saved.'
		),
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
