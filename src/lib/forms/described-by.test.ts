import { describe, expect, it } from 'vitest';
import { describedBy } from './described-by';

// WAI-ARIA 1.2, aria-describedby: an ID reference list; an empty attribute names nothing.
describe('describedBy', () => {
	it('names the hint and the problems a field has, in that order', () => {
		expect(describedBy('title', true, true)).toBe('title-hint title-problems');
		expect(describedBy('title', true, false)).toBe('title-hint');
		expect(describedBy('title', false, true)).toBe('title-problems');
	});

	it('is left out when there is neither, rather than an empty list', () => {
		expect(describedBy('title', false, false)).toBeUndefined();
	});
});
