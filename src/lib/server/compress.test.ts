import { gunzipSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { acceptsGzip, compressed, shouldCompress, withStrongPageValidator } from './compress';

const page = (headers: Record<string, string> = {}) =>
	new Response('<!doctype html><p>' + 'Hello '.repeat(200) + '</p>', {
		headers: { 'Content-Type': 'text/html; charset=utf-8', ...headers }
	});
const get = (acceptEncoding?: string) =>
	new Request('http://localhost/today', {
		headers: acceptEncoding ? { 'Accept-Encoding': acceptEncoding } : {}
	});

describe('compressed pages', () => {
	it('reads Accept-Encoding as RFC 9110 says (q=0 refuses)', () => {
		expect(acceptsGzip('gzip, deflate, br')).toBe(true);
		expect(acceptsGzip('br;q=1, gzip;q=0.5')).toBe(true);
		expect(acceptsGzip('gzip;q=0')).toBe(false);
		expect(acceptsGzip('*')).toBe(true);
		expect(acceptsGzip('identity')).toBe(false);
		expect(acceptsGzip(null)).toBe(false);
	});

	it('gzips a page for a browser that accepts it, and the bytes come back the same', async () => {
		const answer = compressed(get('gzip, br'), page());
		expect(answer.headers.get('Content-Encoding')).toBe('gzip');
		expect(answer.headers.get('Vary')).toBe('Accept-Encoding');
		const zipped = new Uint8Array(await answer.arrayBuffer());
		expect(gunzipSync(zipped).toString()).toBe(await page().text());
		expect(zipped.length).toBeLessThan((await page().text()).length / 4);
	});

	it('weakens a page’s validator when it gzips it, and reads a weak one sent back as the page’s', () => {
		const answer = compressed(get('gzip'), page({ ETag: '"abc"', 'x-sveltekit-page': 'true' }));
		expect(answer.headers.get('ETag')).toBe('W/"abc"');
		const again = new Request('http://localhost/today', {
			headers: { 'If-None-Match': 'W/"abc"' }
		});
		withStrongPageValidator(again);
		expect(again.headers.get('If-None-Match')).toBe('"abc"');
	});

	it('leaves alone what must stay as it is', () => {
		expect(shouldCompress(get(), page())).toBe(false);
		expect(
			shouldCompress(
				get('gzip'),
				new Response('{}', { headers: { 'Content-Type': 'application/json', ETag: '"v4"' } })
			)
		).toBe(false);
		expect(shouldCompress(get('gzip'), page({ 'Content-Encoding': 'br' }))).toBe(false);
		const media = new Response('x', { headers: { 'Content-Type': 'video/mp4' } });
		expect(shouldCompress(get('gzip'), media)).toBe(false);
		const range = new Response('x', { status: 206, headers: { 'Content-Type': 'text/plain' } });
		expect(shouldCompress(get('gzip'), range)).toBe(false);
		const head = new Request('http://localhost/today', {
			method: 'HEAD',
			headers: { 'Accept-Encoding': 'gzip' }
		});
		expect(shouldCompress(head, page())).toBe(false);
	});
});
