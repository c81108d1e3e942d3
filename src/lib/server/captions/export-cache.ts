/**
 * Exported caption files kept in memory, least recently used first out. A version is never
 * changed once written, so an entry can never be stale; the limit only bounds the memory the
 * copies take. Without it every `<track>` load and every 304 read the version's cues from the
 * database and wrote the file again.
 */
export class ExportCache<Body extends string | Uint8Array = string> {
	readonly #entries = new Map<string, Body>();
	#size = 0;

	/**
	 * `maxChars` bounds the total length of the kept files: UTF-16 units for strings, bytes for
	 * encoded files.
	 */
	constructor(readonly maxChars: number) {}

	/** The kept file, which becomes the most recently used; undefined when it is not kept. */
	get(key: string): Body | undefined {
		const body = this.#entries.get(key);
		if (body === undefined) return undefined;
		this.#entries.delete(key);
		this.#entries.set(key, body);
		return body;
	}

	/** Keeps a file, dropping the least recently used ones to stay within the limit. */
	set(key: string, body: Body): void {
		this.delete(key);
		// A file larger than the whole cache would only push everything else out.
		if (body.length > this.maxChars) return;
		this.#entries.set(key, body);
		this.#size += body.length;
		for (const [oldest, kept] of this.#entries) {
			if (this.#size <= this.maxChars) break;
			this.#entries.delete(oldest);
			this.#size -= kept.length;
		}
	}

	delete(key: string): void {
		const body = this.#entries.get(key);
		if (body === undefined) return;
		this.#entries.delete(key);
		this.#size -= body.length;
	}

	get size(): { files: number; chars: number } {
		return { files: this.#entries.size, chars: this.#size };
	}
}
