import { LRUCache } from 'lru-cache';

/**
 * Exported caption files kept in memory, least recently used first out. A version is never
 * changed once written, so an entry can never be stale; the limit only bounds the memory the
 * copies take. Without it every `<track>` load and every 304 read the version's cues from the
 * database and wrote the file again.
 *
 * `maxChars` bounds the total length of the kept files: UTF-16 units for strings, bytes for
 * encoded files. A file larger than the whole cache is not kept (it would only push everything
 * else out).
 */
export function exportCache<Body extends string | Uint8Array = string>(maxChars: number) {
	return new LRUCache<string, Body>({
		maxSize: maxChars,
		// lru-cache counts sizes from 1: an empty file costs one unit.
		sizeCalculation: (body) => Math.max(1, body.length)
	});
}
