import { describe, expect, it } from 'vitest';
import { serveCaptionFile } from './serve';

const file = (etag: string, body: () => string) => ({
	body,
	etag,
	filename: 'captions.vtt',
	format: 'vtt' as const
});

function counting(text: string) {
	const body = () => {
		body.calls++;
		return text;
	};
	body.calls = 0;
	return body;
}

describe('serveCaptionFile', () => {
	it('answers 304 for a held tag without writing the file (RFC 9110 §13.1.2)', async () => {
		const body = counting('WEBVTT\n');
		const response = serveCaptionFile(
			new Request('http://x/', { headers: { 'If-None-Match': 'W/"tag-a"' } }),
			file('"tag-a"', body)
		);
		expect(response.status).toBe(304);
		expect(response.headers.get('ETag')).toBe('"tag-a"');
		expect(await response.text()).toBe('');
		expect(body.calls).toBe(0);
	});

	it('writes and encodes a file once per tag, sending the same UTF-8 bytes each time', async () => {
		const text = 'WEBVTT\n\n00:00.000 --> 00:01.000\nGenou plié, très lentement\n';
		const body = counting(text);
		const first = serveCaptionFile(new Request('http://x/'), file('"tag-b"', body));
		const second = serveCaptionFile(new Request('http://x/'), file('"tag-b"', body));
		expect(first.headers.get('Content-Type')).toBe('text/vtt; charset=utf-8');
		expect(first.headers.get('Cache-Control')).toBe('private, max-age=0, must-revalidate');
		const bytes = new Uint8Array(await first.arrayBuffer());
		expect(bytes).toEqual(new TextEncoder().encode(text));
		expect(await second.text()).toBe(text);
		expect(body.calls).toBe(1);
	});

	it('offers SRT as a download and WebVTT inline', () => {
		const srt = serveCaptionFile(new Request('http://x/'), {
			body: '1\n00:00:00,000 --> 00:00:01,000\nHi\n',
			etag: '"tag-c"',
			filename: 'captions.srt',
			format: 'srt'
		});
		expect(srt.headers.get('Content-Disposition')).toBe('attachment; filename="captions.srt"');
		const vtt = serveCaptionFile(
			new Request('http://x/'),
			file('"tag-d"', () => 'WEBVTT\n')
		);
		expect(vtt.headers.get('Content-Disposition')).toBe('inline; filename="captions.vtt"');
	});
});
