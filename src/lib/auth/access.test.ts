import { describe, expect, it } from 'vitest';
import { accessForRoute, decide } from './access';

describe('accessForRoute', () => {
	it('reads the route group from the route id', () => {
		expect(accessForRoute('/(clinician)/patients/[id]')).toEqual({
			kind: 'roles',
			roles: ['clinician']
		});
		expect(accessForRoute('/(public)/signin')).toEqual({ kind: 'public' });
		expect(accessForRoute('/(member)/account')).toEqual({ kind: 'signed-in' });
	});

	it('leaves endpoints under /api to check their own callers', () => {
		expect(accessForRoute('/api/health')).toEqual({ kind: 'endpoint' });
		expect(accessForRoute('/api')).toEqual({ kind: 'endpoint' });
		// A page that merely starts with "api" is not an endpoint.
		expect(accessForRoute('/apiary')).toEqual({ kind: 'deny' });
	});

	it('refuses a route outside every group', () => {
		expect(accessForRoute('/secret')).toEqual({ kind: 'deny' });
		expect(accessForRoute('/(unknown)/x')).toEqual({ kind: 'deny' });
	});
});

describe('decide', () => {
	const clinicianOnly = accessForRoute('/(clinician)/patients');

	it('sends the signed-out to sign in and refuses other roles', () => {
		expect(decide(clinicianOnly, null)).toBe('sign-in');
		expect(decide(clinicianOnly, 'patient')).toBe('forbidden');
		expect(decide(clinicianOnly, 'admin')).toBe('forbidden');
		expect(decide(clinicianOnly, 'clinician')).toBe('allow');
	});

	it('lets anyone signed in reach member pages', () => {
		const member = accessForRoute('/(member)/account');
		expect(decide(member, null)).toBe('sign-in');
		expect(decide(member, 'patient')).toBe('allow');
		expect(decide(member, 'educator')).toBe('allow');
	});

	it('never opens a denied route, even to an admin', () => {
		expect(decide({ kind: 'deny' }, 'admin')).toBe('forbidden');
	});
});
