import { describe, expect, it } from 'vitest';
import { answerFromSaved } from './range';

// Expectations follow RFC 9110 §14 (Range, Content-Range, 206/416), as the media endpoints do.
const BYTES = new Uint8Array(Array.from({ length: 100 }, (_, i) => i));
const ETAG = '"clip-v1"';

function saved() {
	return new Response(BYTES, {
		status: 200,
		headers: {
			'Content-Type': 'video/mp4',
			'Content-Length': '100',
			ETag: ETAG,
			'Last-Modified': 'Mon, 02 Mar 2026 10:00:00 GMT'
		}
	});
}

const ask = (headers: Record<string, string> = {}, method = 'GET') => ({
	method,
	headers: new Headers(headers)
});

async function bytesOf(response: Response) {
	return Array.from(new Uint8Array(await response.arrayBuffer()));
}

describe('answerFromSaved', () => {
	it('answers a player’s first request (bytes=0-) with 206 and the whole file', async () => {
		const response = await answerFromSaved(saved(), ask({ Range: 'bytes=0-' }));
		expect(response.status).toBe(206);
		expect(response.headers.get('Content-Range')).toBe('bytes 0-99/100');
		expect(response.headers.get('Content-Length')).toBe('100');
		expect(response.headers.get('Content-Type')).toBe('video/mp4');
		expect(response.headers.get('Accept-Ranges')).toBe('bytes');
		expect((await bytesOf(response)).length).toBe(100);
	});

	it('slices a range in the middle and a suffix range', async () => {
		const middle = await answerFromSaved(saved(), ask({ Range: 'bytes=10-19' }));
		expect(middle.status).toBe(206);
		expect(middle.headers.get('Content-Range')).toBe('bytes 10-19/100');
		expect(await bytesOf(middle)).toEqual([10, 11, 12, 13, 14, 15, 16, 17, 18, 19]);
		const tail = await answerFromSaved(saved(), ask({ Range: 'bytes=-3' }));
		expect(tail.headers.get('Content-Range')).toBe('bytes 97-99/100');
		expect(await bytesOf(tail)).toEqual([97, 98, 99]);
		const past = await answerFromSaved(saved(), ask({ Range: 'bytes=95-500' }));
		expect(past.headers.get('Content-Range')).toBe('bytes 95-99/100');
	});

	it('answers 416 with the length when nothing asked for exists', async () => {
		const response = await answerFromSaved(saved(), ask({ Range: 'bytes=100-' }));
		expect(response.status).toBe(416);
		expect(response.headers.get('Content-Range')).toBe('bytes */100');
		expect(await response.text()).toBe('');
	});

	it('sends the whole file with 200 without a range, for several ranges, or a stale If-Range', async () => {
		const cases: Record<string, string>[] = [
			{},
			{ Range: 'bytes=0-1,5-6' },
			{ Range: 'bytes=x' },
			{ Range: 'bytes=0-9', 'If-Range': '"clip-v0"' }
		];
		for (const headers of cases) {
			const response = await answerFromSaved(saved(), ask(headers));
			expect(response.status, JSON.stringify(headers)).toBe(200);
			expect(response.headers.get('Content-Length')).toBe('100');
			expect((await bytesOf(response)).length).toBe(100);
		}
		const current = await answerFromSaved(saved(), ask({ Range: 'bytes=0-9', 'If-Range': ETAG }));
		expect(current.status).toBe(206);
	});

	it('answers HEAD with the headers only', async () => {
		const response = await answerFromSaved(saved(), ask({ Range: 'bytes=0-9' }, 'HEAD'));
		expect(response.status).toBe(206);
		expect(response.headers.get('Content-Length')).toBe('10');
		expect(await response.text()).toBe('');
	});
});
