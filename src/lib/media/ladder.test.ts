import { describe, expect, it } from 'vitest';
import {
	bufferedThroughput,
	chooseVersion,
	nextVersion,
	parseVersionParam,
	planVersions,
	playerVersions,
	servedVersion,
	topShortSide
} from './ladder';

const shorts = (w: number, h: number) => planVersions(w, h).map((v) => v.short);

describe('the versions made for a source', () => {
	it('makes 360, 540 and the 720 top for a 1080p or 720p picture, either way up', () => {
		expect(shorts(1920, 1080)).toEqual([360, 540, 720]);
		expect(shorts(1280, 720)).toEqual([360, 540, 720]);
		expect(shorts(1080, 1920)).toEqual([360, 540, 720]);
		expect(planVersions(1920, 1080).map((v) => v.top)).toEqual([false, false, true]);
	});

	it('never enlarges: a smaller picture keeps its own size on top and gets only smaller rungs', () => {
		expect(shorts(854, 480)).toEqual([360, 480]);
		expect(shorts(1024, 576)).toEqual([360, 576]);
		expect(shorts(640, 360)).toEqual([360]);
		expect(shorts(320, 180)).toEqual([180]);
	});

	it('caps the top at the rate of the smallest rung at least its size', () => {
		const [, top] = planVersions(854, 480);
		expect(top).toMatchObject({ short: 480, videoKbps: 900, top: true });
		expect(planVersions(3840, 2160).at(-1)).toMatchObject({ short: 720, videoKbps: 2200 });
		expect(planVersions(320, 180)[0]).toMatchObject({ videoKbps: 250 });
	});

	it('fits the long side too: a very wide picture is held by 1280', () => {
		// 2560 × 720 → 1280 × 360: only the top.
		expect(topShortSide(2560, 720)).toBe(360);
		expect(shorts(2560, 720)).toEqual([360]);
	});
});

describe('the version an address asks for', () => {
	it('accepts only the ladder’s sizes', () => {
		expect(parseVersionParam(null)).toBeNull();
		expect(parseVersionParam('360')).toBe(360);
		expect(parseVersionParam('540')).toBe(540);
		expect(parseVersionParam('361')).toBe('invalid');
		expect(parseVersionParam('../x')).toBe('invalid');
		expect(parseVersionParam('0360')).toBe('invalid');
	});

	it('falls back to the largest for a video made before the ladder or without that size', () => {
		expect(servedVersion(360, null)).toBeNull();
		expect(servedVersion(540, [{ short: 360, size: 1 }])).toBeNull();
		expect(servedVersion(360, [{ short: 360, size: 1 }])).toBe(360);
		expect(servedVersion(null, [{ short: 360, size: 1 }])).toBeNull();
	});

	it('lists the player’s versions ascending with bitrates from their sizes', () => {
		const list = playerVersions(
			'/clip.mp4',
			{ short: 720, size: 2_500_000 },
			[
				{ short: 540, size: 1_000_000 },
				{ short: 360, size: 300_000 }
			],
			8
		);
		expect(list).toEqual([
			{ src: '/clip.mp4?v=360', kbps: 300, short: 360 },
			{ src: '/clip.mp4?v=540', kbps: 1000, short: 540 },
			{ src: '/clip.mp4', kbps: 2500, short: 720 }
		]);
		expect(playerVersions('/c.mp4', { short: null, size: 10 }, null, 0)).toEqual([
			{ src: '/c.mp4', kbps: 0, short: 720 }
		]);
	});
});

const three = [{ kbps: 300 }, { kbps: 1000 }, { kbps: 2300 }];

describe('the player’s choice by throughput', () => {
	it('takes the largest version within 70 % of the link', () => {
		expect(chooseVersion(three, 400)).toBe(0); // slow 3G-like
		expect(chooseVersion(three, 1500)).toBe(1);
		expect(chooseVersion(three, 9000)).toBe(2); // 4G-like
		expect(chooseVersion(three, 3285)).toBe(1);
		expect(chooseVersion(three, 3286)).toBe(2);
	});

	it('starts small when the link is unknown, too slow for any, or Save-Data is on', () => {
		expect(chooseVersion(three, null)).toBe(0);
		expect(chooseVersion(three, 100)).toBe(0);
		expect(chooseVersion(three, 20000, true)).toBe(0);
		expect(chooseVersion([], 1000)).toBe(-1);
	});

	it('steps down one after a stall, up one at a time to what the link carries', () => {
		expect(nextVersion(three, 2, { throughputKbps: 9000, stalledSeconds: 1.5 })).toBe(1);
		expect(nextVersion(three, 0, { throughputKbps: 400, stalledSeconds: 3 })).toBe(0);
		expect(nextVersion(three, 0, { throughputKbps: 9000, stalledSeconds: 0 })).toBe(1);
		expect(nextVersion(three, 1, { throughputKbps: 9000, stalledSeconds: 0.2 })).toBe(2);
		expect(nextVersion(three, 1, { throughputKbps: 1000, stalledSeconds: 0 })).toBe(1);
		expect(nextVersion(three, 0, { throughputKbps: null, stalledSeconds: 0 })).toBe(0);
		expect(nextVersion(three, 0, { throughputKbps: 9000, stalledSeconds: 0, saveData: true })).toBe(
			0
		);
	});

	it('measures throughput from what was buffered, not from too short a wait', () => {
		// 10 s of a 300 kbit/s version in 1 s: the link carries about 3 Mbit/s.
		expect(bufferedThroughput(10, 1, 300)).toBe(3000);
		expect(bufferedThroughput(10, 0.2, 300)).toBeNull();
		expect(bufferedThroughput(0, 2, 300)).toBeNull();
	});
});
