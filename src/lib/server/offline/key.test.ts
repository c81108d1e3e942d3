import { describe, expect, it } from 'vitest';
import { patientCacheName } from '$lib/offline/scope';
import { offlineKey } from './key';

describe('offlineKey', () => {
	it('is 32 hex characters the worker accepts as a cache key', () => {
		const key = offlineKey('3f0c1b2a-0000-4000-8000-000000000001', 'user-1');
		expect(key).toMatch(/^[0-9a-f]{32}$/);
		expect(patientCacheName(key)).toBe(`kinelume-patient-${key}`);
	});

	it('differs for each sign-in, even of one person, and hides the session id', () => {
		const a = offlineKey('3f0c1b2a-0000-4000-8000-000000000001', 'user-1');
		const b = offlineKey('3f0c1b2a-0000-4000-8000-000000000002', 'user-1');
		expect(a).not.toBe(b);
		expect(a).not.toContain('3f0c1b2a');
		expect(offlineKey('3f0c1b2a-0000-4000-8000-000000000001', 'user-2')).toBe(a);
	});

	it('falls back to the person when the token names no session record', () => {
		expect(offlineKey(null, 'user-1')).toBe(offlineKey(null, 'user-1'));
		expect(offlineKey(null, 'user-1')).not.toBe(offlineKey(null, 'user-2'));
	});
});
