import { describe, expect, it } from 'vitest';
import { offlinePageHtml, offlinePageResponse } from './offline-page';
import { offlineWords } from './words';

describe('offlineWords', () => {
	it('says plainly what works offline on each patient page', () => {
		expect(offlineWords({ page: 'replay', video: 'saved' })).toBe(
			'You are offline. This exercise and its captions are saved on this phone; sessions you log are sent when you are back online.'
		);
		expect(offlineWords({ page: 'replay', video: 'not-saved' })).toContain(
			'not saved on this phone'
		);
		expect(offlineWords({ page: 'replay', video: 'none' })).toContain('count your reps');
		expect(offlineWords({ page: 'today' })).toContain('as it was last saved on this phone');
		for (const words of [
			offlineWords({ page: 'today' }),
			offlineWords({ page: 'replay', video: 'none' })
		]) {
			expect(words).toMatch(/^You are offline\..*sent when you are back online\.$/);
		}
	});
});

describe('the offline page', () => {
	it('offers Today only when a copy of it is saved', () => {
		expect(offlinePageHtml({ todaySaved: true })).toContain('<a href="/today">');
		expect(offlinePageHtml({ todaySaved: false })).not.toContain('/today');
		expect(offlinePageHtml({ todaySaved: false })).toContain('<h1>You are offline</h1>');
		expect(offlinePageHtml({ todaySaved: false })).not.toContain('<script');
	});

	it('is a 503 that is never stored and allows nothing but its own style', async () => {
		const response = offlinePageResponse({ todaySaved: false });
		expect(response.status).toBe(503);
		expect(response.headers.get('Cache-Control')).toBe('no-store');
		expect(response.headers.get('Content-Type')).toBe('text/html; charset=utf-8');
		expect(response.headers.get('Content-Security-Policy')).toContain("default-src 'none'");
		expect(await response.text()).toContain('You are offline');
	});
});
