import type { ParamMatcher } from '@sveltejs/kit';
import { isSlug } from '$lib/library/slug';

/** Library addresses are lowercase words joined by hyphens; anything else is not a match (404). */
export const match = ((param: string): param is string => isSlug(param)) satisfies ParamMatcher;
