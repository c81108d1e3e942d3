import { describe, expect, it, vi } from 'vitest';
import {
	isAppMedia,
	keepMediaAddressesFresh,
	MEDIA_ERR_NETWORK,
	MediaRenewal,
	type RenewableMedia
} from './renew-expired';

const ORIGIN = 'https://app.example';
const LIFETIME = 300;
const HALF = (LIFETIME * 1000) / 2;

/** A stand-in for a video element: records loads and plays, fires loadedmetadata on demand. */
class FakeVideo extends EventTarget implements RenewableMedia {
	error: { code: number } | null = null;
	currentSrc = `${ORIGIN}/api/segments/abc/clip.mp4`;
	paused = false;
	readyState = 4;
	currentTime = 0;
	playbackRate = 1;
	ranges: [number, number][] = [[0, 10]];
	loads = 0;
	plays = 0;
	get buffered() {
		const ranges = this.ranges;
		return {
			length: ranges.length,
			start: (i: number) => ranges[i][0],
			end: (i: number) => ranges[i][1]
		};
	}
	load() {
		// As the HTML load algorithm does: nothing loaded, back to the start, paused, default speed.
		this.loads++;
		this.paused = true;
		this.currentTime = 0;
		this.playbackRate = 1;
		this.error = null;
		this.readyState = 0;
		this.ranges = [];
	}
	play() {
		this.plays++;
		this.paused = false;
		return Promise.resolve();
	}
	loadedMetadata() {
		this.readyState = 1;
		this.dispatchEvent(new Event('loadedmetadata'));
	}
}

function video(changes: Partial<FakeVideo> = {}): FakeVideo {
	return Object.assign(new FakeVideo(), changes);
}

/** A renewal whose element `v` fetched its address at time 0. */
function started(v: FakeVideo): MediaRenewal {
	const renewal = new MediaRenewal(ORIGIN, LIFETIME);
	renewal.loadStarted(v, 0);
	return renewal;
}

describe('MediaRenewal', () => {
	it('renews a seek outside the buffered part once the address may have run out, resuming there', () => {
		const v = video({ currentTime: 41.5, playbackRate: 0.75 });
		const renewal = started(v);
		expect(renewal.handle(v, 'seeking', HALF - 1)).toBe(false);
		expect(renewal.handle(v, 'seeking', HALF)).toBe(true);
		expect(v.loads).toBe(1);
		v.loadedMetadata();
		expect(v.currentTime).toBe(41.5);
		expect(v.playbackRate).toBe(0.75);
		expect(v.plays).toBe(1);
		// Renewed: fresh again for half the lifetime.
		expect(renewal.mayHaveRunOut(v, HALF + 1000)).toBe(false);
	});

	it('leaves a seek inside the buffered part alone, and a paused player paused', () => {
		const v = video({ currentTime: 5, paused: true });
		const renewal = started(v);
		expect(renewal.handle(v, 'seeking', HALF * 3)).toBe(false);
		v.currentTime = 20;
		expect(renewal.handle(v, 'waiting', HALF * 3)).toBe(true);
		v.loadedMetadata();
		expect(v.currentTime).toBe(20);
		expect(v.plays).toBe(0);
	});

	it('renews on a network error at any age, not on other errors', () => {
		const v = video({ error: { code: MEDIA_ERR_NETWORK } });
		const renewal = started(v);
		expect(renewal.handle(v, 'error', 1)).toBe(true);
		v.loadedMetadata();
		v.error = { code: 3 };
		expect(renewal.handle(v, 'error', 2)).toBe(false);
	});

	it('counts an element never seen loading as old', () => {
		const renewal = new MediaRenewal(ORIGIN, LIFETIME);
		expect(renewal.handle(video(), 'stalled', 0)).toBe(true);
	});

	it('leaves other addresses, a file never loaded and a seventh renewal within a minute to the page', () => {
		const renewal = new MediaRenewal(ORIGIN, LIFETIME);
		const elsewhere = video({ currentSrc: 'https://elsewhere.example/api/clip.mp4' });
		expect(renewal.handle(elsewhere, 'waiting', 0)).toBe(false);
		expect(renewal.handle(video({ currentSrc: `${ORIGIN}/intro.mp4` }), 'waiting', 0)).toBe(false);
		expect(renewal.handle(video({ readyState: 0 }), 'waiting', 0)).toBe(false);

		const v = video({ error: { code: MEDIA_ERR_NETWORK } });
		for (const at of [0, 10_000, 20_000, 30_000, 40_000, 50_000]) {
			v.loadedMetadata();
			v.error = { code: MEDIA_ERR_NETWORK };
			expect(renewal.handle(v, 'error', at)).toBe(true);
		}
		v.loadedMetadata();
		v.error = { code: MEDIA_ERR_NETWORK };
		expect(renewal.handle(v, 'error', 55_000)).toBe(false);
		expect(renewal.handle(v, 'error', 60_001)).toBe(true);
		expect(v.loads).toBe(7);
	});
});

describe('isAppMedia', () => {
	it('is true for the app’s own endpoints only', () => {
		expect(isAppMedia('/api/library/versions/v1/clip.mp4', ORIGIN)).toBe(true);
		expect(isAppMedia(`${ORIGIN}/api/recordings/r/media/rendition.mp4`, ORIGIN)).toBe(true);
		expect(isAppMedia('https://storage.example/api/x', ORIGIN)).toBe(false);
		expect(isAppMedia('', ORIGIN)).toBe(false);
	});
});

describe('keepMediaAddressesFresh', () => {
	it('counts an element the page’s markup started as loaded with the page, not as old', () => {
		vi.stubGlobal('HTMLMediaElement', FakeVideo);
		vi.stubGlobal('performance', { timeOrigin: Date.now() - 1000 });
		try {
			const v = video();
			const listeners = new Map<string, (event: Event) => void>();
			const doc = {
				location: { origin: ORIGIN },
				querySelectorAll: () => [v],
				addEventListener: (type: string, listener: (event: Event) => void) =>
					listeners.set(type, listener),
				removeEventListener: () => {}
			} as unknown as Document;
			const stop = keepMediaAddressesFresh(doc, LIFETIME);
			// Its address came with the page a second ago: a wait for data is no reason to reload.
			listeners.get('waiting')!({ type: 'waiting', target: v } as unknown as Event);
			expect(v.loads).toBe(0);
			stop();
		} finally {
			vi.unstubAllGlobals();
		}
	});
});
