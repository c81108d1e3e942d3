import './env';
import { randomBytes } from 'node:crypto';
import { beforeAll, describe, expect, it } from 'vitest';

const { presignRead, putObject } = await import('$lib/server/storage');

/*
 * The storage fake answers byte ranges as S3 does (RFC 9110 §14 for one range; S3 answers a
 * range it cannot read, or several ranges, with the whole object), because browsers now read
 * media from it directly through presigned URLs.
 */

const key = `fake-ranges/object-${process.pid}.bin`;
const bytes = new Uint8Array(randomBytes(1000));
let url: string;

async function get(range: string, method = 'GET'): Promise<Response> {
	return fetch(url, { method, headers: { Range: range } });
}

beforeAll(async () => {
	await putObject(key, bytes, 'application/octet-stream');
	url = await presignRead(key, 600);
});

describe('ranges from the storage fake', () => {
	it('answers one closed range with 206 and its bytes', async () => {
		const response = await get('bytes=10-19');
		expect(response.status).toBe(206);
		expect(response.headers.get('content-range')).toBe('bytes 10-19/1000');
		expect(new Uint8Array(await response.arrayBuffer())).toEqual(bytes.subarray(10, 20));
	});

	it('answers the first byte alone (bytes=0-0), as a player probing a file asks', async () => {
		const response = await get('bytes=0-0');
		expect(response.status).toBe(206);
		expect(response.headers.get('content-range')).toBe('bytes 0-0/1000');
		expect(new Uint8Array(await response.arrayBuffer())).toEqual(bytes.subarray(0, 1));
	});

	it('answers a suffix range with the last bytes', async () => {
		const response = await get('bytes=-100');
		expect(response.status).toBe(206);
		expect(response.headers.get('content-range')).toBe('bytes 900-999/1000');
		expect(new Uint8Array(await response.arrayBuffer())).toEqual(bytes.subarray(900));
	});

	it('clamps an open or overlong range to the end', async () => {
		const open = await get('bytes=990-');
		expect(open.headers.get('content-range')).toBe('bytes 990-999/1000');
		expect((await open.arrayBuffer()).byteLength).toBe(10);
		const long = await get('bytes=995-5000');
		expect(long.headers.get('content-range')).toBe('bytes 995-999/1000');
		expect((await long.arrayBuffer()).byteLength).toBe(5);
	});

	it('refuses a range starting past the end with 416', async () => {
		const response = await get('bytes=1000-');
		expect(response.status).toBe(416);
		expect(await response.text()).toContain('InvalidRange');
	});

	it('answers several ranges or an unreadable one with the whole object', async () => {
		for (const range of ['bytes=0-9,20-29', 'bytes=abc', 'items=0-9', 'bytes=20-10']) {
			const response = await get(range);
			expect(response.status, range).toBe(200);
			expect(new Uint8Array(await response.arrayBuffer()), range).toEqual(bytes);
		}
	});
});
