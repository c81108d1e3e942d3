/**
 * Byte ranges for the storage fake, read as S3 reads them: one range (`bytes=A-B`, `bytes=A-`,
 * `bytes=-N`, RFC 9110 §14.1.2) is served; a range starting past the end is refused with 416
 * InvalidRange; anything else (several ranges, another unit, a malformed or reversed range) is
 * ignored and the whole object is sent, as RFC 9110 allows and S3 does. s3rver alone reads a
 * suffix range as the first bytes and `bytes=0-0` as the whole object.
 */
export type RangeDecision =
	| { kind: 'whole' }
	| { kind: 'part'; start: number; end: number }
	| { kind: 'unsatisfiable' };

export function readRange(header: string, size: number): RangeDecision {
	const match = /^bytes=(\d*)-(\d*)$/.exec(header.trim());
	if (!match || (match[1] === '' && match[2] === '')) return { kind: 'whole' };
	if (match[1] === '') {
		const suffix = Number(match[2]);
		if (suffix === 0 || size === 0) return { kind: 'unsatisfiable' };
		return { kind: 'part', start: Math.max(0, size - suffix), end: size - 1 };
	}
	const start = Number(match[1]);
	const end = match[2] === '' ? size - 1 : Number(match[2]);
	if (match[2] !== '' && end < start) return { kind: 'whole' };
	if (start >= size) return { kind: 'unsatisfiable' };
	return { kind: 'part', start, end: Math.min(end, size - 1) };
}

// Query parameters a GetObject may carry; any other names a subresource (acl, tagging, parts…).
const OBJECT_READ_PARAMS = /^(X-Amz-[A-Za-z0-9-]+|response-[a-z-]+|versionId|x-id)$/;

/** Bucket and key of a path-style object read, or null for anything else. */
export function objectOf(url: string): { bucket: string; key: string } | null {
	const q = url.indexOf('?');
	const path = q === -1 ? url : url.slice(0, q);
	const query = q === -1 ? '' : url.slice(q + 1);
	for (const part of query.split('&')) {
		if (part === '') continue;
		const name = decodeURIComponent(part.split('=')[0]);
		if (!OBJECT_READ_PARAMS.test(name)) return null;
	}
	const match = /^\/([^/]+)\/(.+)$/.exec(path);
	if (!match) return null;
	return { bucket: decodeURIComponent(match[1]), key: decodeURIComponent(match[2]) };
}
