import { describe, expect, it } from 'vitest';
import {
	emptyManifest,
	FRESH_NAVIGATION_MS,
	listProgramme,
	notePage,
	OFFLINE_LIMITS,
	openExercise,
	pageNeedsFetch,
	readManifest,
	savedBytes,
	savedUrls,
	type OfflineManifest
} from './manifest';

const MB = 1024 * 1024;
const item = (n: number) => `00000000-0000-4000-8000-${String(n).padStart(12, '0')}`;
const files = (segment: string, clipMb: number) => [
	{ url: `/api/segments/${segment}/clip.mp4`, bytes: clipMb * MB },
	{ url: `/api/segments/${segment}/captions.vtt`, bytes: 2_000 }
];

/** Opens items 1..n in order, each with its own segment and a clip of `clipMb`. */
function opened(n: number, clipMb: number, start = emptyManifest()): OfflineManifest {
	let manifest = start;
	for (let i = 1; i <= n; i++) {
		manifest = notePage(manifest, `/replay/${item(i)}`, 's', i);
		manifest = openExercise(manifest, {
			item: item(i),
			files: files(`s${i}`, clipMb),
			openedAt: i
		}).manifest;
	}
	return manifest;
}

describe('openExercise', () => {
	it('keeps every exercise opened while the programme fits', () => {
		const manifest = opened(3, 5);
		expect(manifest.exercises.map((e) => e.item)).toEqual([item(3), item(2), item(1)]);
		expect(savedUrls(manifest)).toContain('/api/segments/s1/clip.mp4');
		expect(savedUrls(manifest)).toContain(`/replay/${item(1)}`);
	});

	it('drops the least recently opened, with its page and files, once the total is over the bound', () => {
		const before = opened(4, 30);
		// 4 × 30 MB (plus captions) is over 100 MB: the first one opened went.
		expect(before.exercises.map((e) => e.item)).toEqual([item(4), item(3), item(2)]);
		expect(savedBytes(before)).toBeLessThanOrEqual(OFFLINE_LIMITS.totalBytes);
		const again = openExercise(before, { item: item(2), files: files('s2', 30), openedAt: 10 });
		expect(again.drop).toEqual([]);
		const fifth = openExercise(again.manifest, {
			item: item(5),
			files: files('s5', 30),
			openedAt: 11
		});
		expect(fifth.manifest.exercises.map((e) => e.item)).toEqual([item(5), item(2), item(4)]);
		expect(fifth.drop.sort()).toEqual(
			[`/replay/${item(3)}`, '/api/segments/s3/clip.mp4', '/api/segments/s3/captions.vtt'].sort()
		);
	});

	it('keeps the page but no files of an exercise too large to fit alone', () => {
		const { manifest, drop } = openExercise(
			notePage(emptyManifest(), `/replay/${item(1)}`, null, 1),
			{ item: item(1), files: [{ url: '/api/segments/s1/clip.mp4', bytes: 101 * MB }], openedAt: 1 }
		);
		expect(manifest.exercises).toEqual([{ item: item(1), files: [], openedAt: 1 }]);
		expect(manifest.pages[`/replay/${item(1)}`]).toBeDefined();
		expect(drop).toEqual([]);
	});

	it('keeps at most the bounded number of exercises', () => {
		const manifest = opened(OFFLINE_LIMITS.exercises + 2, 0.01);
		expect(manifest.exercises).toHaveLength(OFFLINE_LIMITS.exercises);
		expect(manifest.exercises.map((e) => e.item)).not.toContain(item(1));
	});

	it('keeps the files it had when only the page was saved again', () => {
		const manifest = opened(1, 5);
		const { manifest: next, drop } = openExercise(manifest, {
			item: item(1),
			files: null,
			openedAt: 9
		});
		expect(next.exercises[0].files).toEqual(files('s1', 5));
		expect(drop).toEqual([]);
	});

	it('keeps a file two exercises share until neither is kept', () => {
		let manifest = emptyManifest();
		manifest = openExercise(manifest, {
			item: item(1),
			files: files('s', 1),
			openedAt: 1
		}).manifest;
		manifest = openExercise(manifest, {
			item: item(2),
			files: files('s', 1),
			openedAt: 2
		}).manifest;
		const { drop } = listProgramme(manifest, [item(2)], []);
		expect(drop).toEqual([]);
		expect(listProgramme(manifest, [], []).drop.sort()).toEqual(
			['/api/segments/s/clip.mp4', '/api/segments/s/captions.vtt'].sort()
		);
	});
});

describe('listProgramme', () => {
	it('drops exercises of other programmes and keeps Today', () => {
		let manifest = notePage(opened(3, 1), '/today', 't', 1);
		const { manifest: next, drop } = listProgramme(
			manifest,
			[item(2), item(9)],
			[{ url: '/api/segments/s2/poster-0.jpg', bytes: 30_000 }]
		);
		manifest = next;
		expect(manifest.programme).toEqual([item(2), item(9)]);
		expect(manifest.exercises.map((e) => e.item)).toEqual([item(2)]);
		expect(Object.keys(manifest.pages).sort()).toEqual(['/today', `/replay/${item(2)}`].sort());
		expect(drop).toContain(`/replay/${item(1)}`);
		expect(drop).toContain('/api/segments/s3/clip.mp4');
		expect(drop).not.toContain('/today');
		expect(savedUrls(manifest)).toContain('/api/segments/s2/poster-0.jpg');
	});

	it('drops posters no longer listed and keeps only as many as fit', () => {
		const first = listProgramme(
			emptyManifest(),
			[item(1)],
			[
				{ url: '/api/segments/a/poster-0.jpg', bytes: 10 },
				{ url: '/api/segments/a/poster-0.jpg', bytes: 10 },
				{ url: '/api/segments/b/poster-0.jpg', bytes: 10 }
			]
		).manifest;
		expect(first.posters).toHaveLength(2);
		const second = listProgramme(
			first,
			[item(1)],
			[
				{ url: '/api/segments/b/poster-0.jpg', bytes: 10 },
				{ url: '/api/segments/c/poster-0.jpg', bytes: 200 * MB }
			]
		);
		expect(second.manifest.posters.map((p) => p.url)).toEqual(['/api/segments/b/poster-0.jpg']);
		expect(second.drop).toEqual(['/api/segments/a/poster-0.jpg']);
	});
});

describe('pageNeedsFetch', () => {
	it('fetches a page not saved, or saved from other data', () => {
		const manifest = notePage(emptyManifest(), '/today', 'aaa', 1_000);
		expect(pageNeedsFetch(emptyManifest(), '/today', 'aaa', 1_000)).toBe(true);
		expect(pageNeedsFetch(manifest, '/today', 'aaa', 999_999)).toBe(false);
		expect(pageNeedsFetch(manifest, '/today', 'bbb', 1_001)).toBe(true);
	});

	it('trusts a copy a navigation saved moments ago, not an old one', () => {
		const manifest = notePage(emptyManifest(), '/today', null, 1_000);
		expect(pageNeedsFetch(manifest, '/today', 'aaa', 1_000 + FRESH_NAVIGATION_MS - 1)).toBe(false);
		expect(pageNeedsFetch(manifest, '/today', 'aaa', 1_000 + FRESH_NAVIGATION_MS)).toBe(true);
	});
});

describe('readManifest', () => {
	it('reads back what was written and treats anything else as nothing saved', () => {
		const manifest = notePage(opened(2, 1), '/today', null, 5);
		expect(readManifest(JSON.parse(JSON.stringify(manifest)))).toEqual(manifest);
		expect(readManifest(null)).toEqual(emptyManifest());
		expect(readManifest('x')).toEqual(emptyManifest());
		expect(
			readManifest({ programme: [1], exercises: [{ item: 3 }], posters: [{ url: 'a' }], pages: 7 })
		).toEqual(emptyManifest());
	});
});
