import { describe, expect, it } from 'vitest';
import { chaptersFromSegments, shiftAndClip, validateChapters } from './segment';
import type { Cue } from './types';

const cue = (id: string, start: number, end: number, text = id): Cue => ({ id, start, end, text });

describe('shiftAndClip', () => {
	const cues = [
		cue('before', 0, 9.5),
		cue('straddles-start', 9, 11, 'Now we’ll do heel slides.'),
		cue('inside', 12, 15),
		cue('straddles-end', 19.5, 21),
		cue('after', 20, 22),
		cue('touching', 8, 10)
	];

	it('keeps what overlaps [start, end), clipped, shifted to zero', () => {
		expect(shiftAndClip(cues, 10, 20)).toEqual([
			{ id: 'straddles-start', start: 0, end: 1, text: 'Now we’ll do heel slides.' },
			cue('inside', 2, 5),
			cue('straddles-end', 9.5, 10)
		]);
	});

	it('keeps settings and never returns times outside the segment (seeded random property)', () => {
		let seed = 7;
		const random = () => (seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31;
		for (let run = 0; run < 300; run++) {
			const list = Array.from({ length: 8 }, (_, i) => {
				const start = Math.round(random() * 60_000) / 1000;
				return {
					...cue(`${i}`, start, start + 0.001 + Math.round(random() * 8000) / 1000),
					settings: { line: 1 }
				};
			});
			const a = Math.round(random() * 50_000) / 1000;
			const b = a + 0.5 + Math.round(random() * 20_000) / 1000;
			const out = shiftAndClip(list, a, b);
			for (const c of out) {
				const original = list.find((o) => o.id === c.id)!;
				expect(c.start).toBeGreaterThanOrEqual(0);
				expect(c.end).toBeLessThanOrEqual(Math.round((b - a) * 1000) / 1000);
				expect(c.end).toBeGreaterThan(c.start);
				expect(c.end - c.start).toBeLessThanOrEqual(original.end - original.start + 0.001);
				expect(c.settings).toEqual({ line: 1 });
			}
			// Every cue that overlaps the segment is kept.
			expect(out.length).toBe(list.filter((o) => o.start < b && o.end > a).length);
		}
	});
});

describe('chapters, W3C WebVTT chapter cues', () => {
	it('makes chapter cues from segments, in order, with plain-text titles', () => {
		expect(
			chaptersFromSegments([
				{ start: 42, end: 80, title: 'Heel slides' },
				{ start: 0, end: 42, title: 'Ankle pumps <warm-up> & breathing' }
			])
		).toEqual([
			cue('chapter-1', 0, 42, 'Ankle pumps &lt;warm-up&gt; &amp; breathing'),
			cue('chapter-2', 42, 80, 'Heel slides')
		]);
	});

	it('accepts consecutive and nested chapters', () => {
		expect(validateChapters([cue('a', 0, 60), cue('b', 60, 120)])).toEqual([]);
		expect(
			validateChapters([cue('all', 0, 120), cue('part', 10, 50), cue('next', 60, 120)])
		).toEqual([]);
	});

	it('rejects the spec’s counter-example: 00:00–01:00 with 00:30–01:30', () => {
		// W3C WebVTT, chapter cues: chapter cues may not partly overlap (REFERENCES.md, read).
		const problems = validateChapters([cue('a', 0, 60), cue('b', 30, 90)]);
		expect(problems).toEqual([
			{
				cueId: 'b',
				index: 1,
				message:
					'Chapter "b" partly overlaps chapter "a"; chapters may only sit one inside another.'
			}
		]);
	});

	it('rejects disorder, empty titles and backwards times', () => {
		const problems = validateChapters([cue('a', 60, 120), cue('b', 0, 30, ' '), cue('c', 50, 40)]);
		expect(problems.map((p) => p.message)).toEqual([
			'Chapter "b" has no title.',
			'Chapter "b" is out of time order.',
			'Chapter "c" ends before it starts.'
		]);
	});
});
