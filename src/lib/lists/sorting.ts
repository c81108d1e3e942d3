/**
 * Sorting and paging links for list pages (the caseload, the recordings): which way a column
 * sorts when its heading is chosen, what assistive technology is told, and the address that asks
 * for it. The server reads the same `sort`, `dir` and `page` parameters.
 */

import type { ResolvedPathname } from '$app/types';

export type SortDirection = 'asc' | 'desc';

export interface SortState<Key extends string> {
	sort: Key;
	dir: SortDirection;
}

/**
 * The direction choosing `key` asks for: the other way when it is the current column, otherwise
 * the column's own first direction (what most needs a look comes to the top).
 */
export function nextDirection<Key extends string>(
	current: SortState<Key>,
	key: Key,
	firstDirection: SortDirection
): SortDirection {
	if (current.sort !== key) return firstDirection;
	return current.dir === 'asc' ? 'desc' : 'asc';
}

/** `aria-sort` for a column heading: only the current column says which way it is sorted. */
export function ariaSortOf<Key extends string>(
	current: SortState<Key>,
	key: Key
): 'ascending' | 'descending' | undefined {
	if (current.sort !== key) return undefined;
	return current.dir === 'asc' ? 'ascending' : 'descending';
}

export const DIRECTION_WORDS: Record<SortDirection, 'ascending' | 'descending'> = {
	asc: 'ascending',
	desc: 'descending'
};

/**
 * The address of the same page with some parameters changed; null or '' removes one (a default
 * is left out of the address).
 */
export function withParams(
	url: URL,
	changes: Record<string, string | number | null | undefined>
): ResolvedPathname {
	const params = new URLSearchParams(url.searchParams);
	for (const [key, value] of Object.entries(changes)) {
		if (value === null || value === undefined || value === '') params.delete(key);
		else params.set(key, String(value));
	}
	const text = params.toString();
	// The page's own path already went through routing (and carries any base path), so it is
	// resolved as it stands: only the query changes.
	return (text ? `${url.pathname}?${text}` : url.pathname) as ResolvedPathname;
}

/** The address that sorts by `key`, back on the first page. */
export function sortHref<Key extends string>(
	url: URL,
	current: SortState<Key>,
	key: Key,
	firstDirection: SortDirection
): ResolvedPathname {
	return withParams(url, {
		sort: key,
		dir: nextDirection(current, key, firstDirection),
		page: null
	});
}
