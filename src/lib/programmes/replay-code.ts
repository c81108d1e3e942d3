/**
 * The short code a printed sheet gives each exercise, so that a person can type the address
 * (`/r/K7M2QX9D`) as well as scan it. The code is derived from the programme item's id, so
 * nothing is stored; it names nothing by itself — `/r/<code>` looks it up only among the
 * signed-in patient's own items, and the replay page checks again.
 */

/** Crockford's base 32: no I, L, O or U, so no printed character reads as another. */
const ALPHABET = '0123456789ABCDEFGHJKMNPQRSTVWXYZ';

/** Characters in a code: 8 × 5 = 40 bits. */
export const REPLAY_CODE_LENGTH = 8;

/** The printed code of one programme item: the first 40 bits of SHA-256 of its id, in base 32. */
export async function replayCode(itemId: string): Promise<string> {
	const digest = new Uint8Array(
		await crypto.subtle.digest('SHA-256', new TextEncoder().encode(`kinelume/r/${itemId}`))
	);
	let code = '';
	let buffer = 0;
	let bits = 0;
	for (const byte of digest) {
		buffer = (buffer << 8) | byte;
		bits += 8;
		while (bits >= 5 && code.length < REPLAY_CODE_LENGTH) {
			bits -= 5;
			code += ALPHABET[(buffer >> bits) & 31];
		}
		buffer &= (1 << bits) - 1;
		if (code.length === REPLAY_CODE_LENGTH) break;
	}
	return code;
}

/**
 * A typed code in its printed form — case, spaces and dashes ignored, O read as zero and I or L
 * as one, as Crockford's base 32 allows — or null when it cannot be a code.
 */
export function readReplayCode(typed: string): string | null {
	const code = typed.toUpperCase().replace(/[\s-]/g, '').replace(/O/g, '0').replace(/[IL]/g, '1');
	if (code.length !== REPLAY_CODE_LENGTH) return null;
	for (const c of code) if (!ALPHABET.includes(c)) return null;
	return code;
}
