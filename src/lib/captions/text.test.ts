import { describe, expect, it } from 'vitest';
import { countWords, plainText, visibleLines } from './text';

describe('plainText and countWords', () => {
	it('drops tags and decodes references', () => {
		expect(plainText('<v Coach><i>Hold</i> &amp; breathe<00:00:02.000> out</v>')).toBe(
			'Hold & breathe out'
		);
		expect(plainText('knee&nbsp;bend &#233;')).toBe('knee\u00a0bend é');
	});

	it('counts words as a reader does, without tags', () => {
		expect(countWords('<i>Don’t</i> lock the knee — keep it soft.')).toBe(7);
		expect(countWords('Repeat 10 times, side-to-side.')).toBe(4);
		expect(countWords('<b></b>')).toBe(0);
		expect(visibleLines('<i>one</i>\ntwo')).toEqual(['one', 'two']);
	});
});
