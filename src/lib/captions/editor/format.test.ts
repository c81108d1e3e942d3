import { describe, expect, it } from 'vitest';
import { cueTime, frameWords, plural } from './format';

describe('cueTime', () => {
	it('writes minutes, seconds and thousandths, with hours only when there are any', () => {
		expect(cueTime(62.5)).toBe('01:02.500');
		expect(cueTime(3723.25)).toBe('01:02:03.250');
	});
	it('writes a time before the start as the start', () => {
		expect(cueTime(-0.4)).toBe('00:00.000');
	});
});

describe('plural', () => {
	it('counts in the singular for one only', () => {
		expect(plural(1, 'cue')).toBe('1 cue');
		expect(plural(0, 'cue')).toBe('0 cues');
		expect(plural(3, 'draft cue')).toBe('3 draft cues');
		expect(plural(2, 'kind of finding', 'kinds of finding')).toBe('2 kinds of finding');
	});
});

describe('frameWords', () => {
	it('names the recording’s own frame, rounded to hundredths', () => {
		expect(frameWords(25)).toBe('1/25 s');
		expect(frameWords(29.97002997)).toBe('1/29.97 s');
	});
	it('says when the frame rate is not known, and what is used instead', () => {
		for (const unknown of [null, 0, -1]) {
			expect(frameWords(unknown)).toBe('1/25 s (the recording’s frame rate is not known)');
		}
	});
});
