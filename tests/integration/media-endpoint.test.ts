import { fakesDirectory } from './env';
import { randomBytes } from 'node:crypto';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';

process.env.DATABASE_PATH = join(fakesDirectory, `media-endpoint-${process.pid}.db`);

const { putObject, headObject } = await import('$lib/server/storage');
const { serveObject } = await import('$lib/server/recordings/media');

const key = `clinics/media-endpoint/recordings/r-${process.pid}/rendition.mp4`;
const bytes = new Uint8Array(randomBytes(10_000));
let etag: string;
let lastModified: Date;

function get(headers: Record<string, string> = {}, method = 'GET') {
	return serveObject(new Request('http://app/x', { method, headers }), key, 'video/mp4');
}

async function body(response: Response): Promise<Uint8Array> {
	return new Uint8Array(await response.arrayBuffer());
}

beforeAll(async () => {
	await putObject(key, bytes, 'video/mp4');
	const info = await headObject(key);
	etag = info!.etag!;
	lastModified = info!.lastModified!;
});

describe('byte-range playback from storage', () => {
	it('answers the whole file with 200, Accept-Ranges and a strong ETag', async () => {
		const response = await get();
		expect(response.status).toBe(200);
		expect(response.headers.get('accept-ranges')).toBe('bytes');
		expect(response.headers.get('etag')).toBe(etag);
		expect(response.headers.get('content-length')).toBe('10000');
		expect(await body(response)).toEqual(bytes);
	});

	it('answers one range with 206 and its Content-Range', async () => {
		const response = await get({ Range: 'bytes=100-199' });
		expect(response.status).toBe(206);
		expect(response.headers.get('content-range')).toBe('bytes 100-199/10000');
		expect(response.headers.get('content-length')).toBe('100');
		expect(await body(response)).toEqual(bytes.subarray(100, 200));
	});

	it('answers a suffix range with the last bytes', async () => {
		const response = await get({ Range: 'bytes=-500' });
		expect(response.status).toBe(206);
		expect(response.headers.get('content-range')).toBe('bytes 9500-9999/10000');
		expect(await body(response)).toEqual(bytes.subarray(9500));
	});

	it('answers an open range clamped to the end', async () => {
		const response = await get({ Range: 'bytes=9990-' });
		expect(response.headers.get('content-range')).toBe('bytes 9990-9999/10000');
		expect((await body(response)).length).toBe(10);
	});

	it('answers a range past the end with 416 and bytes */LENGTH', async () => {
		const response = await get({ Range: 'bytes=10000-' });
		expect(response.status).toBe(416);
		expect(response.headers.get('content-range')).toBe('bytes */10000');
	});

	it('sends the whole file when If-Range does not match, the range when it does', async () => {
		const stale = await get({ Range: 'bytes=0-9', 'If-Range': '"not-the-tag"' });
		expect(stale.status).toBe(200);
		expect((await body(stale)).length).toBe(10000);
		const fresh = await get({ Range: 'bytes=0-9', 'If-Range': etag });
		expect(fresh.status).toBe(206);
		const byDate = await get({ Range: 'bytes=0-9', 'If-Range': lastModified.toUTCString() });
		expect(byDate.status).toBe(206);
	});

	it('ignores an invalid Range and answers 304 to a matching If-None-Match', async () => {
		expect((await get({ Range: 'bytes=abc' })).status).toBe(200);
		expect((await get({ 'If-None-Match': etag })).status).toBe(304);
	});

	it('answers HEAD with the lengths and no body', async () => {
		const response = await get({ Range: 'bytes=0-99' }, 'HEAD');
		expect(response.status).toBe(206);
		expect(response.headers.get('content-length')).toBe('100');
		expect(response.body).toBeNull();
	});
});
