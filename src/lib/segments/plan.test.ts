import { describe, expect, it } from 'vitest';
import {
	addBoundary,
	confidenceLabel,
	draftFromSegments,
	draftFromSuggestions,
	draftSegments,
	emptyDraft,
	formatTime,
	linkSuggestions,
	moveBoundary,
	orderedSignals,
	planFromDraft,
	planProblems,
	removeBoundary,
	signalLabel,
	updatePart,
	type Draft
} from './plan';

// Expected values below are worked out by hand from the rules in plan.ts (our own rules).
const DURATION = 60;

function added(draft: Draft, time: number, title = ''): Draft {
	const change = addBoundary(draft, time, DURATION, title);
	if (!change.ok) throw new Error(change.message);
	return change.draft;
}

describe('editing a draft of segments', () => {
	it('starts as one part covering the whole recording', () => {
		expect(draftSegments(emptyDraft(), DURATION)).toEqual([
			{ index: 0, title: '', include: true, start: 0, end: 60 }
		]);
	});

	it('splits the part under a new boundary, keeping boundaries in order', () => {
		const draft = added(added(emptyDraft(), 40, 'Heel slides'), 20, 'Ankle pumps');
		expect(draft.boundaries).toEqual([20, 40]);
		expect(draftSegments(draft, DURATION).map((s) => [s.start, s.end, s.title, s.include])).toEqual(
			[
				[0, 20, '', false],
				[20, 40, 'Ankle pumps', true],
				[40, 60, 'Heel slides', true]
			]
		);
	});

	it('leaves out an untitled opening part only when a named boundary follows it', () => {
		const plain = added(emptyDraft(), 10);
		expect(plain.parts.map((p) => p.include)).toEqual([true, true]);
		const named = added(emptyDraft(), 10, 'Quadriceps sets');
		expect(named.parts).toEqual([
			{ title: '', include: false },
			{ title: 'Quadriceps sets', include: true }
		]);
		const titled = added(updatePart(emptyDraft(), 0, { title: 'Warm-up' }), 10, 'Bridge');
		expect(titled.parts[0]).toEqual({ title: 'Warm-up', include: true });
	});

	it('refuses a boundary within a second of another or of either end', () => {
		const draft = added(emptyDraft(), 30);
		for (const t of [0.5, 59.5, 29.5, 30.9]) {
			expect(addBoundary(draft, t, DURATION).ok, `${t}`).toBe(false);
		}
		expect(addBoundary(draft, 31, DURATION).ok).toBe(true);
	});

	it('moves a boundary, held a second away from its neighbours', () => {
		const draft = added(added(emptyDraft(), 20), 40);
		expect(moveBoundary(draft, 0, 25.25, DURATION).boundaries).toEqual([25.25, 40]);
		expect(moveBoundary(draft, 0, 45, DURATION).boundaries).toEqual([39, 40]);
		expect(moveBoundary(draft, 0, -3, DURATION).boundaries).toEqual([1, 40]);
		expect(moveBoundary(draft, 1, 100, DURATION).boundaries).toEqual([20, 59]);
		expect(moveBoundary(draft, 5, 10, DURATION)).toBe(draft);
	});

	it('merges two neighbours by removing the boundary between them', () => {
		const draft = added(added(emptyDraft(), 20, 'Ankle pumps'), 40, 'Heel slides');
		const merged = removeBoundary(draft, 1);
		expect(merged.boundaries).toEqual([20]);
		expect(merged.sources).toEqual([null]);
		expect(merged.parts).toEqual([
			{ title: '', include: false },
			{ title: 'Ankle pumps', include: true }
		]);
		// An untitled, left-out left part takes the right one's title and is kept.
		const first = removeBoundary(draft, 0);
		expect(first.parts).toEqual([
			{ title: 'Ankle pumps', include: true },
			{ title: 'Heel slides', include: true }
		]);
	});

	it('takes every suggestion, in time order, as a named boundary', () => {
		const draft = draftFromSuggestions(
			[{ time: 41.5, name: 'Heel slides' }, { time: 12, name: 'Ankle pumps' }, { time: 12.4 }],
			DURATION
		);
		// 12.4 s is within a second of 12 s and is dropped.
		expect(draft.boundaries).toEqual([12, 41.5]);
		expect(draft.sources).toEqual([1, 0]);
		expect(planFromDraft(draft, DURATION)).toEqual([
			{ title: 'Ankle pumps', start: 12, end: 41.5 },
			{ title: 'Heel slides', start: 41.5, end: 60 }
		]);
	});
});

describe('showing confirmed segments again', () => {
	it('puts a boundary at every inner edge and leaves the gaps out', () => {
		const draft = draftFromSegments(
			[
				{ title: 'Heel slides', start: 30, end: 60 },
				{ title: 'Ankle pumps', start: 10, end: 30 }
			],
			DURATION
		);
		expect(draft.boundaries).toEqual([10, 30]);
		expect(draft.parts).toEqual([
			{ title: '', include: false },
			{ title: 'Ankle pumps', include: true },
			{ title: 'Heel slides', include: true }
		]);
		expect(planFromDraft(draft, DURATION)).toEqual([
			{ title: 'Ankle pumps', start: 10, end: 30 },
			{ title: 'Heel slides', start: 30, end: 60 }
		]);
	});

	it('links each boundary to the nearest suggestion under a second away, once', () => {
		const draft = draftFromSegments(
			[
				{ title: 'Ankle pumps', start: 10, end: 30 },
				{ title: 'Heel slides', start: 30, end: 60 }
			],
			DURATION
		);
		const linked = linkSuggestions(draft, [
			{ time: 30.4 },
			{ time: 10 },
			{ time: 10.2 },
			{ time: 45 }
		]);
		expect(linked.sources).toEqual([1, 0]);
	});
});

describe('checking a plan before it is confirmed', () => {
	it('accepts ordered, named segments of a second or more, gaps allowed', () => {
		expect(
			planProblems(
				[
					{ title: 'Ankle pumps', start: 5, end: 20 },
					{ title: 'Heel slides', start: 25, end: 60.0005 }
				],
				DURATION
			)
		).toEqual([]);
	});

	it('names every problem, numbered as the page shows the segments', () => {
		expect(
			planProblems(
				[
					{ title: ' ', start: -1, end: 10 },
					{ title: 'Bridge', start: 9, end: 9.5 },
					{ title: 'x'.repeat(121), start: 20, end: 61 }
				],
				DURATION
			)
		).toEqual([
			'Segment 1 needs a name.',
			'Segment 1 starts before the recording does.',
			'Segment 2 is shorter than 1 s.',
			'Segment 2 starts before segment 1 ends; segments may not overlap.',
			"Segment 3's name is longer than 120 characters.",
			'Segment 3 ends after the recording does (1:00.0).'
		]);
		expect(planProblems([], DURATION)).toEqual(['Keep at least one segment to confirm.']);
		expect(
			planProblems(
				[
					{ title: 'A', start: 0, end: 10 },
					{ title: '', start: 5, end: 20 }
				],
				DURATION,
				(i) => `Part ${i * 2 + 1}`
			)
		).toEqual([
			'Part 3 needs a name.',
			'Part 3 starts before part 1 ends; segments may not overlap.'
		]);
		expect(planProblems([{ title: 'A', start: Number.NaN, end: 3 }], DURATION)).toEqual([
			'Segment 1 needs a start and an end time.'
		]);
	});
});

describe('words for the page', () => {
	it('labels each kind of signal briefly', () => {
		expect(
			[
				{ kind: 'announcing-phrase', detail: '', phrase: 'next exercise' },
				{ kind: 'ordinal', detail: '', phrase: 'exercise two' },
				{ kind: 'exercise-name-change', detail: '', phrase: 'heel slides' },
				{ kind: 'long-gap', detail: '', seconds: 3.1 },
				{ kind: 'silence', detail: '', seconds: 2.4 },
				{ kind: 'scene-change', detail: '' }
			].map((s) => signalLabel(s as Parameters<typeof signalLabel>[0]))
		).toEqual([
			'phrase “next exercise”',
			'counting word “exercise two”',
			'new exercise name “heel slides”',
			'gap 3.1 s between cues',
			'2.4 s silence',
			'scene change'
		]);
	});

	it('orders signals: words first, then the picture, then the quiet', () => {
		const kinds = orderedSignals([
			{ kind: 'silence', detail: '' },
			{ kind: 'scene-change', detail: '' },
			{ kind: 'exercise-name-change', detail: '' },
			{ kind: 'long-gap', detail: '' },
			{ kind: 'ordinal', detail: '' }
		]).map((s) => s.kind);
		expect(kinds).toEqual([
			'ordinal',
			'exercise-name-change',
			'scene-change',
			'silence',
			'long-gap'
		]);
	});

	it('formats times as minutes, seconds and tenths', () => {
		expect([0, 12.34, 75.06, 3725.5].map(formatTime)).toEqual([
			'0:00.0',
			'0:12.3',
			'1:15.1',
			'1:02:05.5'
		]);
	});

	it('puts confidence in a word and a percentage', () => {
		expect([0.95, 0.7, 0.5].map(confidenceLabel)).toEqual([
			'high confidence (95 %)',
			'medium confidence (70 %)',
			'low confidence (50 %)'
		]);
	});
});
