import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { safeRedirect } from './safe-redirect';

const ORIGIN = 'https://clinic.kinelume.example';
const safe = (target: string | null | undefined, fallback?: string) =>
	safeRedirect(target, ORIGIN, fallback);

describe('safeRedirect', () => {
	it('keeps a path on this site, with its query and fragment', () => {
		expect(safe('/patients/abc?tab=1#notes')).toBe('/patients/abc?tab=1#notes');
		expect(safe('/library/search?q=heel%20slides')).toBe('/library/search?q=heel%20slides');
	});

	it('encodes non-ASCII so the Location header stays valid instead of failing', () => {
		expect(safe('/library/search?q=épaule')).toBe('/library/search?q=%C3%A9paule');
		expect(safe('/café')).toBe('/caf%C3%A9');
	});

	// The vectors come from the WHATWG URL standard's parsing rules (tabs and newlines are removed,
	// backslashes are slashes in special schemes) and from the usual open-redirect lists.
	const vectors = [
		'https://evil.example/',
		'http:evil.example',
		'//evil.example/',
		'///evil.example/',
		'/\\evil.example/',
		'\\\\evil.example',
		'/\t/evil.example/phish',
		'/%09/evil.example/phish',
		'/\n/evil.example',
		'/\r\n/evil.example',
		'/%0a/evil.example',
		'/%2f%2fevil.example',
		'/%2F/evil.example',
		'/%5cevil.example',
		'/%5C%5Cevil.example',
		'/\u0000/evil.example',
		'/é/../..//evil.example',
		'/a/..//evil.example',
		'/./..//evil.example/x',
		'javascript:alert(1)',
		'data:text/html,hi',
		' /evil',
		'evil.example',
		''
	];
	for (const vector of vectors) {
		it(`refuses ${JSON.stringify(vector)}`, () => {
			expect(safe(vector)).toBe('/home');
		});
	}

	it('does not loop back to sign-in, sign-out or Auth.js routes', () => {
		expect(safe('/signin?next=/x')).toBe('/home');
		expect(safe('/signin/link-sent')).toBe('/home');
		expect(safe('/signout')).toBe('/home');
		expect(safe('/auth/callback/credentials')).toBe('/home');
		expect(safe(null, '/today')).toBe('/today');
		expect(safe(undefined)).toBe('/home');
	});

	it('for any input, answers a path on this site that a browser resolves to this origin', () => {
		fc.assert(
			fc.property(
				fc.oneof(
					fc.string({ unit: 'binary', maxLength: 40 }),
					// Built from the pieces that fool parsers: slashes, dots, backslashes, escapes.
					fc
						.array(
							fc.constantFrom('/', '.', '..', '\\', '%2f', '%09', '\t', 'é', 'evil.example', ':'),
							{
								maxLength: 8
							}
						)
						.map((parts) => parts.join(''))
				),
				(input) => {
					const out = safe(input);
					expect(out.startsWith('/')).toBe(true);
					expect(out.startsWith('//')).toBe(false);
					expect(new URL(out, ORIGIN).origin).toBe(ORIGIN);
					expect(out).toMatch(/^[\u0021-\u007e]+$/);
				}
			),
			{ numRuns: 2000 }
		);
	});
});
