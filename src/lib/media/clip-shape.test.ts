import { describe, expect, it } from 'vitest';
import { clipAspect, DEFAULT_ASPECT, isPortrait } from './clip-shape';

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
