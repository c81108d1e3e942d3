import { absolute, cachePublicPage, cardData } from '$lib/server/library/pages';
import {
	filterOptions,
	publishedCollections,
	publishedCount,
	recentExercises
} from '$lib/server/library/public';
import { NO_FILTERS } from '$lib/library/search';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals, setHeaders }) => {
	cachePublicPage(locals.user !== null, setHeaders);
	return {
		count: publishedCount(),
		options: filterOptions(),
		query: { q: '', filters: NO_FILTERS, page: 1 },
		collections: publishedCollections(6).map((c) => ({
			slug: c.slug,
			title: c.title,
			count: c.count,
			cover: c.cover
				? `/api/library/versions/${c.cover.versionId}/poster-${c.cover.poster}.jpg`
				: null
		})),
		recent: recentExercises(6).map(cardData),
		canonical: absolute('/library')
	};
};
