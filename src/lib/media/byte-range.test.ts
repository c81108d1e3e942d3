import { describe, expect, it } from 'vitest';
import { contentRange, ifRangeAllows, parseHttpDate, parseRange, rangeLength } from './byte-range';

const ranges = (...list: [number, number][]) => ({
	kind: 'ranges',
	ranges: list.map(([start, end]) => ({ start, end }))
});

describe('parseRange, RFC 9110 §14.1.2 examples for a 10000-byte representation', () => {
	it('reads the first and second 500 bytes', () => {
		// RFC 9110 §14.1.2: "The first 500 bytes: bytes=0-499"
		expect(parseRange('bytes=0-499', 10000)).toEqual(ranges([0, 499]));
		// RFC 9110 §14.1.2: "The second 500 bytes: bytes=500-999"
		expect(parseRange('bytes=500-999', 10000)).toEqual(ranges([500, 999]));
	});

	it('reads the final 500 bytes as a suffix and as an open range', () => {
		// RFC 9110 §14.1.2: "The final 500 bytes (byte offsets 9500-9999, inclusive): bytes=-500
		// Or: bytes=9500-"
		expect(parseRange('bytes=-500', 10000)).toEqual(ranges([9500, 9999]));
		expect(parseRange('bytes=9500-', 10000)).toEqual(ranges([9500, 9999]));
	});

	it('reads the first and last bytes only', () => {
		// RFC 9110 §14.1.2: "The first and last bytes only (bytes 0 and 9999): bytes=0-0,-1"
		expect(parseRange('bytes=0-0,-1', 10000)).toEqual(ranges([0, 0], [9999, 9999]));
	});

	it('treats a last position before the first as invalid, so the header is ignored', () => {
		// RFC 9110 §14.1.1: "A range-spec is invalid if the last-pos value is present and less
		// than the first-pos."
		expect(parseRange('bytes=500-499', 10000)).toEqual({ kind: 'invalid' });
		expect(parseRange('bytes=0-1,9-3', 10000)).toEqual({ kind: 'invalid' });
	});

	it('clamps a last position at or beyond the length', () => {
		// RFC 9110 §14.1.1: "If the last-pos value is absent, or if the value is greater than or
		// equal to the current length of the representation data, the byte range is interpreted
		// as the remainder of the representation."
		expect(parseRange('bytes=9500-10000', 10000)).toEqual(ranges([9500, 9999]));
		expect(parseRange('bytes=0-99999999999999999999', 10000)).toEqual(ranges([0, 9999]));
	});

	it('serves the whole representation for a suffix longer than it', () => {
		// RFC 9110 §14.1.1: "If the selected representation is shorter than the specified
		// suffix-length, the entire representation is used."
		expect(parseRange('bytes=-20000', 10000)).toEqual(ranges([0, 9999]));
	});

	it('is unsatisfiable when nothing starts inside the representation', () => {
		// RFC 9110 §14.1.1: satisfiable only with a first-pos below the length or a non-zero
		// suffix-length; §15.5.17: otherwise 416.
		expect(parseRange('bytes=10000-', 10000)).toEqual({ kind: 'unsatisfiable' });
		expect(parseRange('bytes=-0', 10000)).toEqual({ kind: 'unsatisfiable' });
		expect(parseRange('bytes=10000-10001,-0', 10000)).toEqual({ kind: 'unsatisfiable' });
	});

	it('drops the unsatisfiable members of a set that has satisfiable ones', () => {
		// RFC 9110 §14.2: a server may ignore or reject unsatisfiable ranges in a set; it sends
		// the satisfiable ones.
		expect(parseRange('bytes=20000-,0-9', 10000)).toEqual(ranges([0, 9]));
	});
});

describe('parseRange, ceph/s3-tests worked values for an 11-byte body', () => {
	it('reads a closed range', () => {
		// ceph/s3-tests test_ranged_request_response_code: bytes=4-7 → 206, bytes 4-7/11
		const result = parseRange('bytes=4-7', 11);
		expect(result).toEqual(ranges([4, 7]));
		expect(contentRange({ start: 4, end: 7 }, 11)).toBe('bytes 4-7/11');
	});

	it('reads an open range and a suffix as the same bytes', () => {
		// ceph/s3-tests test_ranged_request_skip_leading_bytes_response_code: bytes=4- → 4-10/11
		expect(parseRange('bytes=4-', 11)).toEqual(ranges([4, 10]));
		// ceph/s3-tests test_ranged_request_return_trailing_bytes_response_code: bytes=-7 → 4-10/11
		expect(parseRange('bytes=-7', 11)).toEqual(ranges([4, 10]));
		expect(contentRange({ start: 4, end: 10 }, 11)).toBe('bytes 4-10/11');
	});

	it('refuses a range past the end with 416', () => {
		// ceph/s3-tests test_ranged_request_invalid_range: bytes=40-50 → 416
		expect(parseRange('bytes=40-50', 11)).toEqual({ kind: 'unsatisfiable' });
		// RFC 9110 §14.4: a 416 carries the unsatisfied-range form.
		expect(contentRange(null, 11)).toBe('bytes */11');
	});
});

describe('parseRange syntax', () => {
	it('has nothing to do without a header', () => {
		expect(parseRange(null, 100)).toEqual({ kind: 'none' });
		expect(parseRange('', 100)).toEqual({ kind: 'none' });
	});

	it('ignores range units it does not know', () => {
		// RFC 9110 §14.2: "An origin server MUST ignore a Range header field that contains a range
		// unit it does not understand."
		expect(parseRange('items=0-5', 100)).toEqual({ kind: 'none' });
	});

	it('accepts the unit in any case, optional whitespace and empty list elements', () => {
		// RFC 9110 §14.1: range units are compared case-insensitively; §5.6.1: lists accept OWS
		// around commas and empty elements.
		expect(parseRange('Bytes=0-1 , ,5-6', 100)).toEqual(ranges([0, 1], [5, 6]));
	});

	it('calls malformed headers invalid', () => {
		for (const header of [
			'bytes',
			'bytes=',
			'bytes=,',
			'=0-1',
			'bytes=a-b',
			'bytes=1-2-3',
			'bytes=--1',
			'bytes=-',
			'bytes=0x10-',
			'bytes=1.5-2',
			'bytes 0-1'
		]) {
			expect(parseRange(header, 100), header).toEqual({ kind: 'invalid' });
		}
	});

	it('ignores a header with an unreasonable number of ranges', () => {
		// RFC 9110 §14.2 allows a server to ignore a Range with many small ranges.
		const many = 'bytes=' + Array.from({ length: 40 }, (_, i) => `${i}-${i}`).join(',');
		expect(parseRange(many, 100)).toEqual({ kind: 'invalid' });
	});

	it('serves no range of an empty representation', () => {
		expect(parseRange('bytes=0-', 0)).toEqual({ kind: 'unsatisfiable' });
		expect(parseRange('bytes=-5', 0)).toEqual({ kind: 'unsatisfiable' });
	});

	it('counts the bytes of a range', () => {
		expect(rangeLength({ start: 0, end: 499 })).toBe(500);
		expect(rangeLength({ start: 0, end: 0 })).toBe(1);
	});
});

describe('ifRangeAllows, RFC 9110 §13.1.5', () => {
	const etag = '"rendition-3f2a"';
	const lastModified = new Date('1994-11-06T08:49:37.250Z');

	it('allows the range without If-Range', () => {
		expect(ifRangeAllows(null, etag, lastModified)).toBe(true);
	});

	it('compares entity tags strongly', () => {
		// RFC 9110 §8.8.3.2: strong comparison requires both tags to be strong and identical.
		expect(ifRangeAllows('"rendition-3f2a"', etag, lastModified)).toBe(true);
		expect(ifRangeAllows('"rendition-0000"', etag, lastModified)).toBe(false);
		expect(ifRangeAllows('W/"rendition-3f2a"', etag, lastModified)).toBe(false);
		expect(ifRangeAllows('W/"rendition-3f2a"', 'W/"rendition-3f2a"', lastModified)).toBe(false);
		expect(ifRangeAllows('"rendition-3f2a"', null, lastModified)).toBe(false);
	});

	it('matches an HTTP-date only when it equals Last-Modified', () => {
		// RFC 9110 §5.6.7 gives "Sun, 06 Nov 1994 08:49:37 GMT" in all three forms.
		expect(ifRangeAllows('Sun, 06 Nov 1994 08:49:37 GMT', etag, lastModified)).toBe(true);
		expect(ifRangeAllows('Sunday, 06-Nov-94 08:49:37 GMT', etag, lastModified)).toBe(true);
		expect(ifRangeAllows('Sun Nov  6 08:49:37 1994', etag, lastModified)).toBe(true);
		expect(ifRangeAllows('Sun, 06 Nov 1994 08:49:38 GMT', etag, lastModified)).toBe(false);
		expect(ifRangeAllows('Sun, 06 Nov 1994 08:49:37 GMT', etag, null)).toBe(false);
	});

	it('sends the whole representation when If-Range is neither a tag nor a date', () => {
		expect(ifRangeAllows('yesterday', etag, lastModified)).toBe(false);
	});
});

describe('parseHttpDate', () => {
	it('reads the three forms of RFC 9110 §5.6.7 as the same instant', () => {
		const expected = Date.UTC(1994, 10, 6, 8, 49, 37);
		expect(parseHttpDate('Sun, 06 Nov 1994 08:49:37 GMT')).toBe(expected);
		expect(parseHttpDate('Sunday, 06-Nov-94 08:49:37 GMT')).toBe(expected);
		expect(parseHttpDate('Sun Nov  6 08:49:37 1994')).toBe(expected);
	});

	it('refuses impossible dates and other text', () => {
		expect(parseHttpDate('Sun, 31 Feb 1994 08:49:37 GMT')).toBeNull();
		expect(parseHttpDate('Sun, 06 Foo 1994 08:49:37 GMT')).toBeNull();
		expect(parseHttpDate('1994-11-06T08:49:37Z')).toBeNull();
	});
});
