/**
 * HTTP byte ranges (RFC 9110 §14) for serving renditions and segments, so players can seek
 * without downloading the whole file. Pure: the media endpoints decide the status codes from
 * what these functions return.
 */

/** An inclusive byte range, already clamped to the representation. */
export interface ByteRange {
	start: number;
	end: number;
}

export type RangeResult =
	| { kind: 'none' }
	| { kind: 'ranges'; ranges: ByteRange[] }
	| { kind: 'unsatisfiable' }
	| { kind: 'invalid' };

// A request with hundreds of tiny ranges costs far more to answer than it is worth (RFC 9110
// §14.2 lets a server ignore such a header); no player sends more than a couple.
const MAX_RANGES = 32;

const INT_RANGE = /^(\d+)-(\d*)$/;
const SUFFIX_RANGE = /^-(\d+)$/;

/**
 * Reads a Range header against a representation of `length` bytes.
 * - `none`: no header, or a range unit other than bytes (which RFC 9110 says to ignore): send 200.
 * - `invalid`: bad syntax or a last position before the first: ignore the header and send 200.
 * - `unsatisfiable`: nothing in the set lies inside the representation: send 416 with
 *   `Content-Range: bytes *\/LENGTH` (see `contentRange(null, length)`).
 * - `ranges`: the satisfiable ranges in request order, clamped to the representation; one means a
 *   plain 206, several mean multipart/byteranges (or, if the caller prefers, a 200).
 */
export function parseRange(header: string | null, length: number): RangeResult {
	if (header === null || header.trim() === '') return { kind: 'none' };
	const equals = header.indexOf('=');
	if (equals <= 0) return { kind: 'invalid' };
	const unit = header.slice(0, equals).trim();
	if (!/^[!#$%&'*+.^_`|~0-9A-Za-z-]+$/.test(unit)) return { kind: 'invalid' };
	if (unit.toLowerCase() !== 'bytes') return { kind: 'none' };

	// Empty list elements ("0-1,,2-3") are allowed by the list rule of RFC 9110 §5.6.1.
	const specs = header
		.slice(equals + 1)
		.split(',')
		.map((part) => part.trim())
		.filter((part) => part !== '');
	if (specs.length === 0 || specs.length > MAX_RANGES) return { kind: 'invalid' };

	const ranges: ByteRange[] = [];
	for (const spec of specs) {
		const int = INT_RANGE.exec(spec);
		if (int) {
			const first = Number(int[1]);
			const last = int[2] === '' ? Infinity : Number(int[2]);
			if (last < first) return { kind: 'invalid' };
			if (first < length) ranges.push({ start: first, end: Math.min(last, length - 1) });
			continue;
		}
		const suffix = SUFFIX_RANGE.exec(spec);
		if (suffix) {
			const suffixLength = Number(suffix[1]);
			// A zero-length representation has no bytes to send even for a non-zero suffix, and
			// Content-Range cannot express an empty range, so it falls to 416 like everything else.
			if (suffixLength > 0 && length > 0) {
				ranges.push({ start: Math.max(0, length - suffixLength), end: length - 1 });
			}
			continue;
		}
		return { kind: 'invalid' };
	}
	return ranges.length === 0 ? { kind: 'unsatisfiable' } : { kind: 'ranges', ranges };
}

/**
 * The Content-Range value for one range of a 206 (`bytes 0-499/10000`), or with `null` the
 * unsatisfied form a 416 carries (`bytes *\/10000`).
 */
export function contentRange(range: ByteRange | null, length: number): string {
	return range === null ? `bytes */${length}` : `bytes ${range.start}-${range.end}/${length}`;
}

/** The number of bytes a range covers, for Content-Length. */
export function rangeLength(range: ByteRange): number {
	return range.end - range.start + 1;
}

/**
 * Whether a Range header may be honoured given If-Range (RFC 9110 §13.1.5): true when there is
 * no If-Range, when it is an entity tag that matches `etag` by strong comparison, or when it is
 * an HTTP-date equal to `lastModified`. Otherwise the whole representation is sent with 200.
 * A weak tag on either side never matches.
 */
export function ifRangeAllows(
	ifRange: string | null,
	etag: string | null,
	lastModified: Date | null
): boolean {
	if (ifRange === null) return true;
	const value = ifRange.trim();
	if (value === '') return true;
	if (value.startsWith('"') || value.startsWith('W/')) {
		return etag !== null && isStrongTag(value) && value === etag.trim();
	}
	if (lastModified === null) return false;
	const date = parseHttpDate(value);
	// HTTP-dates have one-second resolution, so the stored time is compared at that resolution.
	return date !== null && date === Math.floor(lastModified.getTime() / 1000) * 1000;
}

function isStrongTag(tag: string): boolean {
	return /^"[\x21\x23-\x7e\x80-\xff]*"$/.test(tag);
}

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
const IMF_FIXDATE =
	/^(?:Mon|Tue|Wed|Thu|Fri|Sat|Sun), (\d{2}) ([A-Za-z]{3}) (\d{4}) (\d{2}):(\d{2}):(\d{2}) GMT$/;
const RFC850_DATE =
	/^(?:Monday|Tuesday|Wednesday|Thursday|Friday|Saturday|Sunday), (\d{2})-([A-Za-z]{3})-(\d{2}) (\d{2}):(\d{2}):(\d{2}) GMT$/;
const ASCTIME_DATE =
	/^(?:Mon|Tue|Wed|Thu|Fri|Sat|Sun) ([A-Za-z]{3}) ([ \d]\d) (\d{2}):(\d{2}):(\d{2}) (\d{4})$/;

/**
 * Milliseconds since the epoch for the three HTTP-date forms of RFC 9110 §5.6.7, or null.
 * Written out because Date.parse reads the asctime form in local time.
 */
export function parseHttpDate(value: string): number | null {
	let parts: [string, string, string, string, string, string] | null = null;
	let match = IMF_FIXDATE.exec(value);
	if (match) parts = [match[3], match[2], match[1], match[4], match[5], match[6]];
	else if ((match = RFC850_DATE.exec(value))) {
		// RFC 9110 §5.6.7: a two-digit year more than 50 years ahead belongs to the last century.
		const yy = Number(match[3]);
		const thisYear = new Date().getUTCFullYear();
		let year = Math.floor(thisYear / 100) * 100 + yy;
		if (year > thisYear + 50) year -= 100;
		parts = [String(year), match[2], match[1], match[4], match[5], match[6]];
	} else if ((match = ASCTIME_DATE.exec(value))) {
		parts = [match[6], match[1], match[2].trim(), match[3], match[4], match[5]];
	}
	if (parts === null) return null;
	const month = MONTHS.findIndex((m) => m.toLowerCase() === parts[1].toLowerCase());
	if (month < 0) return null;
	const [year, day, hour, minute, second] = [parts[0], parts[2], parts[3], parts[4], parts[5]].map(
		Number
	);
	if (day < 1 || day > 31 || hour > 23 || minute > 59 || second > 60) return null;
	const time = Date.UTC(year, month, day, hour, minute, Math.min(second, 59));
	// Date.UTC rolls 31 Feb over into March; such a date is not a date.
	return new Date(time).getUTCDate() === day ? time : null;
}
