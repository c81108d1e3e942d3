import { describe, expect, it } from 'vitest';
import { clipAspect, clipBox, DEFAULT_ASPECT, isPortrait } from './clip-shape';

describe('a player sized to its clip', () => {
	it('takes the clip’s own shape, 16:9 when it is not known', () => {
		expect(clipAspect(720, 1280)).toBe('720 / 1280');
		expect(clipAspect(1280, 720)).toBe('1280 / 720');
		expect(clipAspect(null, 720)).toBe(DEFAULT_ASPECT);
		expect(clipAspect(0, 0)).toBe(DEFAULT_ASPECT);
		expect(isPortrait(720, 1280)).toBe(true);
		expect(isPortrait(720, 720)).toBe(false);
	});
});

describe('a player box never taller than the screen allows', () => {
	it('narrows an upright clip’s box so that its height stays within the limit', () => {
		// 180 × 320: at 70svh high the box is 70svh × 0.5625 wide.
		expect(clipBox(180, 320)).toBe(
			'aspect-ratio: 180 / 320; max-width: min(100%, calc(70svh * 0.5625))'
		);
		expect(clipBox(1280, 720, '50svh')).toBe(
			'aspect-ratio: 1280 / 720; max-width: min(100%, calc(50svh * 1.7778))'
		);
		expect(clipBox(null, null)).toBe(
			'aspect-ratio: 16 / 9; max-width: min(100%, calc(70svh * 1.7778))'
		);
	});
});
