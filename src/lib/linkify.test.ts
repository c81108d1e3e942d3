import { describe, expect, it } from 'vitest';
import { linkify } from './linkify';

describe('linkify', () => {
	it('finds links and leaves sentence punctuation outside them', () => {
		expect(linkify('Sign in: http://localhost:3000/invite/abc_D-1. Thanks')).toEqual([
			{ kind: 'text', text: 'Sign in: ' },
			{ kind: 'link', href: 'http://localhost:3000/invite/abc_D-1' },
			{ kind: 'text', text: '. Thanks' }
		]);
	});

	it('keeps query strings and ignores other schemes', () => {
		expect(linkify('https://a.test/x?token=1&email=b%40c javascript:alert(1)')).toEqual([
			{ kind: 'link', href: 'https://a.test/x?token=1&email=b%40c' },
			{ kind: 'text', text: ' javascript:alert(1)' }
		]);
	});
});
