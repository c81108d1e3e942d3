import { hasFilters, libraryQueryString, parseLibraryQuery, PAGE_SIZE } from '$lib/library/search';
import { absolute, cachePublicPage, cardData } from '$lib/server/library/pages';
import { filterOptions, searchLibrary } from '$lib/server/library/public';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = ({ url, locals, setHeaders }) => {
	cachePublicPage(locals.user !== null, setHeaders);
	const query = parseLibraryQuery(url.searchParams);
	const found = searchLibrary(query);
	const pageCount = Math.max(1, Math.ceil(found.total / PAGE_SIZE));
	const at = (page: number) => `/library/search${libraryQueryString({ ...query, page })}`;
	return {
		query,
		filtered: hasFilters(query.filters),
		options: filterOptions(),
		total: found.total,
		anyWord: found.anyWord,
		results: found.results.map(cardData),
		pageCount,
		previous: query.page > 1 ? at(query.page - 1) : null,
		next: query.page < pageCount ? at(query.page + 1) : null,
		canonical: absolute(`/library/search${libraryQueryString(query)}`)
	};
};
