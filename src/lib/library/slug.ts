/** Public addresses of library exercises and collections: lowercase words joined by hyphens. */

export const SLUG_PATTERN = /^[a-z0-9]+(?:-[a-z0-9]+)*$/;
export const SLUG_MAX = 80;

/** Whether `value` could be a slug (the route matcher's test). */
export function isSlug(value: string): boolean {
	return value.length <= SLUG_MAX && SLUG_PATTERN.test(value);
}

/**
 * A slug from a title: accents dropped ("café" → "cafe"), anything but letters and digits
 * becomes one hyphen, cut at a word boundary within SLUG_MAX. A title with no letters or
 * digits gives `fallback`.
 */
export function slugify(title: string, fallback = 'exercise'): string {
	const words = title
		.normalize('NFKD')
		.replace(/[\u0300-\u036f]/g, '')
		.toLowerCase()
		.split(/[^a-z0-9]+/)
		.filter(Boolean);
	let slug = '';
	for (const word of words) {
		const next = slug ? `${slug}-${word}` : word;
		if (next.length > SLUG_MAX) break;
		slug = next;
	}
	if (!slug && words.length > 0) slug = words[0].slice(0, SLUG_MAX);
	return slug || fallback;
}

/** `base`, or `base-2`, `base-3`… : the first that `taken` says is free. */
export function uniqueSlug(base: string, taken: (slug: string) => boolean): string {
	if (!taken(base)) return base;
	for (let n = 2; ; n++) {
		const suffix = `-${n}`;
		const candidate = `${base.slice(0, SLUG_MAX - suffix.length).replace(/-+$/, '')}${suffix}`;
		if (!taken(candidate)) return candidate;
	}
}
