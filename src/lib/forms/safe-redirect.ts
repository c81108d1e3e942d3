/**
 * Where a person may be sent after signing in (`next`, `redirectTo`, Auth.js's `callbackUrl`):
 * only a path on this site. The target is parsed as a browser would parse it against the site's
 * origin, and refused — falling back to `fallback` — when it could land anywhere else:
 *
 * - anything not starting with a single `/` (schemes, `//host`, relative paths);
 * - backslashes, which browsers read as slashes (`/\host`);
 * - control characters, which browsers strip (`/<tab>/host` becomes `//host`) and which would
 *   make an invalid `Location` header (a 500);
 * - encoded slashes and backslashes (`/%2f%2fhost`), which a later decode could turn into the above;
 * - paths whose dot segments fold into `//host` once resolved;
 * - the sign-in and sign-out pages and Auth.js's routes, which would loop.
 *
 * What comes back is the parsed URL's own path, query and fragment, so it is ASCII
 * (non-ASCII is percent-encoded) and safe to put in a `Location` header.
 */
export function safeRedirect(
	target: string | null | undefined,
	origin: string,
	fallback = '/home'
): string {
	if (typeof target !== 'string' || target.length === 0 || target.length > 2048) return fallback;
	if (!target.startsWith('/') || target.startsWith('//')) return fallback;
	// eslint-disable-next-line no-control-regex -- control characters are exactly what is refused
	if (/[\u0000-\u001f\u007f\\]/.test(target)) return fallback;
	if (/%(2f|5c|0[0-9a-f]|1[0-9a-f]|7f)/i.test(target)) return fallback;
	let base: URL;
	let url: URL;
	try {
		base = new URL(origin);
		url = new URL(target, base);
	} catch {
		return fallback;
	}
	const path = url.pathname;
	// Dot segments can fold a path into `//host` ("/a/../..//host" becomes "//host"), which a
	// browser would read as another site: what is returned is checked, not only what came in.
	if (url.origin !== base.origin || path.startsWith('//')) return fallback;
	if (/^\/(signin|signout)(\/|$)/.test(path) || path.startsWith('/auth/') || path === '/auth')
		return fallback;
	return `${path}${url.search}${url.hash}`;
}
