import { describe, expect, it } from 'vitest';
import { safeNext } from './safe-next';

describe('safeNext', () => {
	it('keeps a path on this site', () => {
		expect(safeNext('/patients/abc?tab=1')).toBe('/patients/abc?tab=1');
	});

	it('refuses other origins and tricks that browsers read as another host', () => {
		expect(safeNext('https://elsewhere.example/')).toBe('/home');
		expect(safeNext('//elsewhere.example/')).toBe('/home');
		expect(safeNext('/\\elsewhere.example/')).toBe('/home');
		expect(safeNext('javascript:alert(1)')).toBe('/home');
	});

	it('does not loop back to the sign-in pages', () => {
		expect(safeNext('/signin?next=/x')).toBe('/home');
		expect(safeNext('/auth/callback/credentials')).toBe('/home');
		expect(safeNext(null, '/today')).toBe('/today');
	});
});
