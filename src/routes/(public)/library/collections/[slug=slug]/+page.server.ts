import { error } from '@sveltejs/kit';
import { absolute, cachePublicPage, cardData } from '$lib/server/library/pages';
import { findPublicCollection } from '$lib/server/library/public';
import { renderSafetyNotes } from '$lib/server/markdown';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = ({ params, locals, setHeaders }) => {
	const found = findPublicCollection(params.slug);
	if (!found) error(404, 'Not found.');
	cachePublicPage(locals.user !== null, setHeaders);
	const { collection, items, cover } = found;
	const coverPath = cover
		? `/api/library/versions/${cover.versionId}/poster-${cover.poster}.jpg`
		: null;
	const summary = collection.introduction
		.replace(/[#*_>`[\]()]/g, '')
		.replace(/\s+/g, ' ')
		.trim()
		.slice(0, 200);
	return {
		collection: {
			slug: collection.slug,
			title: collection.title,
			introductionHtml: renderSafetyNotes(collection.introduction)
		},
		items: items.map(cardData),
		cover: coverPath,
		canonical: absolute(`/library/collections/${collection.slug}`),
		ogImage: coverPath ? absolute(coverPath) : null,
		summary:
			summary || `${collection.title}: a collection of exercise demonstrations with captions.`
	};
};
