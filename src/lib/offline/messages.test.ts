import { describe, expect, it } from 'vitest';
import {
	fingerprint,
	keepMessageFor,
	readMessage,
	REPLAY_ROUTE,
	savedAddress,
	TODAY_ROUTE
} from './messages';

const KEY = '0123456789abcdef0123456789abcdef';
const ITEM = '0b5e7a52-3c1d-4f7e-9a8b-1c2d3e4f5a6b';
const SEGMENT = '9d0b1c2e-0000-4000-8000-00000000abcd';
const base = `/api/segments/${SEGMENT}`;

describe('keepMessageFor', () => {
	it('names a replay’s item and segment files', () => {
		const data = {
			itemId: ITEM,
			media: {
				clip: `${base}/clip.mp4`,
				captions: `${base}/captions.vtt`,
				transcript: `${base}/transcript.json`,
				poster: null
			}
		};
		expect(keepMessageFor(REPLAY_ROUTE, data, KEY)).toEqual({
			type: 'keep-exercise',
			key: KEY,
			state: fingerprint(data),
			item: ITEM,
			files: [`${base}/clip.mp4`, `${base}/captions.vtt`, `${base}/transcript.json`]
		});
	});

	it('names the smallest version of the clip, to be kept under the clip’s own address', () => {
		const data = {
			itemId: ITEM,
			media: {
				clip: `${base}/clip.mp4`,
				offlineClip: `${base}/clip.mp4?v=360`,
				captions: `${base}/captions.vtt`,
				transcript: null,
				poster: `${base}/poster-0.jpg`
			}
		};
		expect(keepMessageFor(REPLAY_ROUTE, data, KEY)?.type === 'keep-exercise').toBe(true);
		expect(keepMessageFor(REPLAY_ROUTE, data, KEY)).toMatchObject({
			files: [`${base}/clip.mp4?v=360`, `${base}/captions.vtt`, `${base}/poster-0.jpg`]
		});
		expect(savedAddress(`${base}/clip.mp4?v=360`)).toBe(`${base}/clip.mp4`);
		expect(savedAddress(`${base}/captions.vtt`)).toBe(`${base}/captions.vtt`);
		// Only the clip takes a version, and only a number.
		expect(
			readMessage({
				type: 'keep-exercise',
				key: KEY,
				state: 'a',
				item: ITEM,
				files: [`${base}/clip.mp4?v=360`, `${base}/captions.vtt?v=360`, `${base}/clip.mp4?v=x`]
			})
		).toMatchObject({ files: [`${base}/clip.mp4?v=360`] });
	});

	it('keeps a replay without video to its page', () => {
		const message = keepMessageFor(REPLAY_ROUTE, { itemId: ITEM, media: null }, KEY);
		expect(message).toMatchObject({ type: 'keep-exercise', item: ITEM, files: [] });
	});

	it('names Today’s items and their posters', () => {
		const data = {
			view: {
				items: [
					{ id: ITEM, poster: `${base}/poster-0.jpg` },
					{ id: SEGMENT, poster: null }
				]
			}
		};
		expect(keepMessageFor(TODAY_ROUTE, data, KEY)).toMatchObject({
			type: 'keep-today',
			items: [ITEM, SEGMENT],
			posters: [`${base}/poster-0.jpg`]
		});
		expect(
			keepMessageFor(TODAY_ROUTE, { view: { programme: null, items: [] } }, KEY)
		).toMatchObject({ items: [], posters: [] });
	});

	it('says nothing for other pages', () => {
		expect(keepMessageFor('/(member)/account', { itemId: ITEM }, KEY)).toBeNull();
		expect(keepMessageFor(null, {}, KEY)).toBeNull();
	});
});

describe('readMessage', () => {
	it('accepts our messages and keeps only addresses of the right kinds', () => {
		expect(readMessage({ type: 'forget' })).toEqual({ type: 'forget' });
		expect(
			readMessage({
				type: 'keep-exercise',
				key: KEY,
				state: 'abc',
				item: ITEM,
				files: [`${base}/clip.mp4`, '/patients', 'https://elsewhere.example/clip.mp4', 7]
			})
		).toEqual({
			type: 'keep-exercise',
			key: KEY,
			state: 'abc',
			item: ITEM,
			files: [`${base}/clip.mp4`]
		});
		expect(
			readMessage({ type: 'keep-today', key: KEY, state: 'abc', items: [ITEM, 'x'], posters: [] })
		).toEqual({ type: 'keep-today', key: KEY, state: 'abc', items: [ITEM], posters: [] });
	});

	it('refuses anything else', () => {
		for (const value of [
			null,
			'forget',
			{ type: 'keep-today', key: 'short', state: 'a', items: [], posters: [] },
			{ type: 'keep-exercise', key: KEY, state: 'a', item: '../today', files: [] },
			{ type: 'keep-exercise', key: KEY, item: ITEM, files: [] },
			{ type: 'delete-everything', key: KEY, state: 'a' }
		]) {
			expect(readMessage(value), JSON.stringify(value)).toBeNull();
		}
	});
});

describe('fingerprint', () => {
	it('changes with the data and stays with the same data', () => {
		expect(fingerprint({ a: 1 })).toBe(fingerprint({ a: 1 }));
		expect(fingerprint({ a: 1 })).not.toBe(fingerprint({ a: 2 }));
		expect(fingerprint({ a: 1 })).toMatch(/^[0-9a-f]{8}$/);
	});
});
