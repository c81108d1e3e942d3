import { describe, expect, it } from 'vitest';
import { presignMediaUrl, signingWindow, withStorageOrigin } from './media-urls';

describe('signingWindow', () => {
	it('gives every request of one half-lifetime the same signing instant', () => {
		const start = Date.UTC(2026, 11, 5, 9, 0, 0);
		const a = signingWindow(start + 1_000, 300);
		const b = signingWindow(start + 149_000, 300);
		expect(a).toEqual(b);
		expect(a).toEqual({ signedAt: start, expiresAt: start + 300_000 });
		expect(signingWindow(start + 150_000, 300).signedAt).toBe(start + 150_000);
	});

	it('leaves an address at least half its lifetime to run', () => {
		for (const lifetime of [2, 5, 300, 3600]) {
			for (const offset of [0, 999, 1_000, 1_234_567]) {
				const now = Date.UTC(2026, 11, 5) + offset;
				const { signedAt, expiresAt } = signingWindow(now, lifetime);
				expect(signedAt).toBeLessThanOrEqual(now);
				expect(signedAt % 1000).toBe(0);
				expect(expiresAt - now).toBeGreaterThanOrEqual((lifetime * 1000) / 2 - 500);
			}
		}
	});
});

describe('withStorageOrigin', () => {
	it('adds storage to connect-src, media-src and img-src only', () => {
		const csp =
			"default-src 'self'; connect-src 'self'; img-src 'self' data: blob:; media-src 'self' blob:; script-src 'self'; frame-ancestors 'none'";
		expect(withStorageOrigin(csp, 'https://media.example')).toBe(
			"default-src 'self'; connect-src 'self' https://media.example; img-src 'self' https://media.example data: blob:; media-src 'self' https://media.example blob:; script-src 'self'; frame-ancestors 'none'"
		);
	});
});

describe('presignMediaUrl', () => {
	const start = Date.UTC(2026, 11, 5, 9, 0, 0);
	const sign = (now: number, audience: 'private' | 'public' = 'private') =>
		presignMediaUrl('clinics/c/recordings/r/rendition.mp4', {
			contentType: 'video/mp4',
			audience,
			now,
			lifetimeSeconds: 300
		});

	it('gives one address per window, which storage keeps for the rest of the lifetime', async () => {
		const first = await sign(start + 1_000);
		expect(await sign(start + 140_000)).toEqual(first);
		const next = await sign(start + 150_000);
		expect(next.url).not.toBe(first.url);
		const url = new URL(first.url);
		expect(url.searchParams.get('X-Amz-Date')).toBe('20261205T090000Z');
		expect(url.searchParams.get('X-Amz-Expires')).toBe('300');
		expect(url.searchParams.get('response-content-type')).toBe('video/mp4');
		expect(url.searchParams.get('response-cache-control')).toBe('private, max-age=300');
		expect(first.expiresAt).toBe(start + 300_000);
	});

	it('asks storage to let any cache keep public copies for a year', async () => {
		const url = new URL((await sign(start, 'public')).url);
		expect(url.searchParams.get('response-cache-control')).toBe(
			'public, max-age=31536000, immutable'
		);
	});
});
