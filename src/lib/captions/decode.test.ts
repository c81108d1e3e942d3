import { describe, expect, it } from 'vitest';
import { decodeCaptionFile } from './decode';

const bytes = (...values: number[]) => Uint8Array.from(values);
const utf8 = (text: string) => new TextEncoder().encode(text);

describe('decodeCaptionFile', () => {
	it('decodes UTF-8 and strips a byte order mark', () => {
		expect(decodeCaptionFile(bytes(0xef, 0xbb, 0xbf, ...utf8('WEBVTT\n\nGenou plié')))).toEqual({
			ok: true,
			text: 'WEBVTT\n\nGenou plié'
		});
	});

	it('refuses text that is not UTF-8 (a Latin-1 é)', () => {
		const result = decodeCaptionFile(bytes(...utf8('WEBVTT\n\nGenou pli'), 0xe9));
		expect(result.ok).toBe(false);
		expect(!result.ok && result.message).toMatch(/not in UTF-8/);
	});

	it('refuses binary files: NUL bytes, UTF-16, control characters', () => {
		const png = bytes(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 0x0d);
		expect(decodeCaptionFile(png)).toMatchObject({
			ok: false,
			message: expect.stringMatching(/not a text file/)
		});
		expect(decodeCaptionFile(bytes(0xff, 0xfe, 0x57, 0))).toMatchObject({
			ok: false,
			message: expect.stringMatching(/UTF-16/)
		});
		const noisy = utf8('WEBVTT\n\x01\x02\x03\x04\x05\x06\x07\x08 and some words');
		expect(decodeCaptionFile(noisy)).toMatchObject({
			ok: false,
			message: expect.stringMatching(/control characters/)
		});
		expect(decodeCaptionFile(bytes())).toEqual({ ok: false, message: 'The file is empty.' });
	});
});
