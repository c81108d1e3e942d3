import type { ParamMatcher } from '@sveltejs/kit';

/** Record ids are UUIDs; anything else is not a route match (404) rather than a database query. */
export const match = ((param: string): param is string =>
	/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/.test(
		param
	)) satisfies ParamMatcher;
