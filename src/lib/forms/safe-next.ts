/**
 * Where to go after signing in: only a path on this site. Anything else (another origin, a
 * protocol-relative `//host`, a backslash trick) falls back, so a link cannot bounce a user away.
 */
export function safeNext(next: string | null | undefined, fallback = '/home'): string {
	if (!next || !next.startsWith('/') || next.startsWith('//') || next.includes('\\'))
		return fallback;
	if (next.startsWith('/signin') || next.startsWith('/signout') || next.startsWith('/auth/'))
		return fallback;
	return next;
}
