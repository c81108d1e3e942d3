import { describe, expect, it } from 'vitest';
import { checkCues, profiles } from './checks';
import {
	draftCues,
	draftLimits,
	escapeCueText,
	speechRegions,
	timeCues,
	wordsForSpans,
	type TimeSpan
} from './speech-draft';

// The BBC profile's numbers (checks.ts names their sources): cues 1–7 s, gaps of at least 1 s,
// 37 characters a line. The DCMP profile's minimum is 2 s.
const bbc = draftLimits(profiles.bbc);
const dcmp = draftLimits(profiles.dcmp);
const times = (spans: readonly TimeSpan[]) => spans.map((s) => [s.start, s.end]);

describe('draftLimits', () => {
	it('takes the guideline profile’s minimum, maximum, gap and line length', () => {
		expect(bbc).toEqual({ minSeconds: 1, maxSeconds: 7, minGapSeconds: 1, maxCharsPerLine: 37 });
		expect(dcmp.minSeconds).toBe(2);
		expect(dcmp.maxCharsPerLine).toBe(32);
	});
});

describe('speechRegions', () => {
	it('is what lies between the silences and the ends of the recording', () => {
		const silences = [
			{ start: 0, end: 1 },
			{ start: 3, end: 4.5 },
			{ start: 9.2, end: 9.6 },
			{ start: 12, end: 20 }
		];
		expect(times(speechRegions(silences, 20))).toEqual([
			[1, 3],
			[4.5, 9.2],
			[9.6, 12]
		]);
	});

	it('runs to the end when the recording does not end in silence, and skips clicks', () => {
		const silences = [
			{ start: 2, end: 5 },
			{ start: 5.1, end: 8 }
		];
		// 5 s to 5.1 s is a 0.1 s click between two silences.
		expect(times(speechRegions(silences, 10))).toEqual([
			[0, 2],
			[8, 10]
		]);
	});

	it('reads silences given out of order or overlapping', () => {
		const silences = [
			{ start: 6, end: 10 },
			{ start: 0, end: 2 },
			{ start: 1.5, end: 3 }
		];
		expect(times(speechRegions(silences, 10))).toEqual([[3, 6]]);
	});

	it('finds no speech in a recording that is silent throughout', () => {
		expect(speechRegions([{ start: 0, end: 30 }], 30)).toEqual([]);
	});
});

describe('timeCues (BBC: 1–7 s, 1 s gaps)', () => {
	it('ends a cue at every pause of 1 s or more and cuts long speech at its pause', () => {
		// Speech 1–3 s; pause 1.5 s; speech 4.5–9.2 s; pause 0.4 s; speech 9.6–12 s.
		// 4.5–12 s is 7.5 s, over the 7 s maximum: cut at the 0.4 s pause, where the next
		// speech begins, so the first cue stays up through the pause.
		const regions = [
			{ start: 1, end: 3 },
			{ start: 4.5, end: 9.2 },
			{ start: 9.6, end: 12 }
		];
		const { spans, evenCuts } = timeCues(regions, 20, bbc);
		expect(times(spans)).toEqual([
			[1, 3],
			[4.5, 9.6],
			[9.6, 12]
		]);
		expect(evenCuts).toBe(0);
	});

	it('keeps speech separated by short pauses in one cue while it fits', () => {
		const regions = [
			{ start: 0.5, end: 2 },
			{ start: 2.3, end: 4 },
			{ start: 4.6, end: 6.5 }
		];
		expect(times(timeCues(regions, 10, bbc).spans)).toEqual([[0.5, 6.5]]);
	});

	it('cuts at the longest pause', () => {
		// 0–9 s with pauses of 0.3 s (at 2 s), 0.8 s (at 4 s) and 0.2 s (at 6 s).
		const regions = [
			{ start: 0, end: 2 },
			{ start: 2.3, end: 4 },
			{ start: 4.8, end: 6 },
			{ start: 6.2, end: 9 }
		];
		expect(times(timeCues(regions, 9, bbc).spans)).toEqual([
			[0, 4.8],
			[4.8, 9]
		]);
	});

	it('passes over the longest pause when it would leave a cue under the minimum', () => {
		// The 0.8 s pause at 6.6 s would leave 7.4–7.9 s alone (0.5 s); the 0.3 s one is used.
		const regions = [
			{ start: 0, end: 3 },
			{ start: 3.3, end: 6.6 },
			{ start: 7.4, end: 7.9 }
		];
		expect(times(timeCues(regions, 20, bbc).spans)).toEqual([
			[0, 3.3],
			[3.3, 7.9]
		]);
	});

	it('cuts again until every part fits', () => {
		// 20 s of speech with a 0.5 s pause every 4 s (at 4, 8, 12, 16 s): four pauses alike.
		const regions = [0, 4.5, 8.5, 12.5, 16.5].map((start, i) => ({
			start,
			end: i === 4 ? 20 : start + (i === 0 ? 4 : 3.5)
		}));
		const { spans } = timeCues(regions, 20, bbc);
		expect(spans.every((s) => s.end - s.start <= 7)).toBe(true);
		expect(spans.every((s) => s.end - s.start >= 1)).toBe(true);
		expect(spans[0].start).toBe(0);
		expect(spans.at(-1)!.end).toBe(20);
		// Each cut sits where speech starts again after a pause.
		for (const span of spans.slice(1)) expect(regions.map((r) => r.start)).toContain(span.start);
	});

	it('cuts speech with no pause at even times, and counts those cuts', () => {
		const { spans, evenCuts } = timeCues([{ start: 0, end: 15 }], 15, bbc);
		expect(times(spans)).toEqual([
			[0, 5],
			[5, 10],
			[10, 15]
		]);
		expect(evenCuts).toBe(2);
	});

	it('holds a short cue on into the quiet after it, leaving a full gap', () => {
		// "Good." 2–2.4 s, then quiet until 5 s: shown until 3 s (1 s), 2 s before the next.
		const regions = [
			{ start: 2, end: 2.4 },
			{ start: 5, end: 8 }
		];
		expect(times(timeCues(regions, 10, bbc).spans)).toEqual([
			[2, 3],
			[5, 8]
		]);
	});

	it('joins a short cue to its neighbour when holding it on would leave too small a gap', () => {
		// 2–2.4 s, then speech at 3.5 s: 1 s on screen would leave 0.5 s before the next cue.
		const regions = [
			{ start: 2, end: 2.4 },
			{ start: 3.5, end: 6 }
		];
		expect(times(timeCues(regions, 10, bbc).spans)).toEqual([[2, 6]]);
	});

	it('uses the stricter minimum of the DCMP profile', () => {
		const regions = [
			{ start: 1, end: 2.5 },
			{ start: 6, end: 9 }
		];
		expect(times(timeCues(regions, 10, bbc).spans)).toEqual([
			[1, 2.5],
			[6, 9]
		]);
		expect(times(timeCues(regions, 10, dcmp).spans)).toEqual([
			[1, 3],
			[6, 9]
		]);
	});

	it('holds the last cue no later than the end of the recording', () => {
		expect(times(timeCues([{ start: 9.5, end: 9.8 }], 10, bbc).spans)).toEqual([[9.5, 10]]);
	});

	it('keeps times to the millisecond', () => {
		const { spans } = timeCues([{ start: 0, end: 10 }], 10, { ...bbc, maxSeconds: 3 });
		expect(times(spans)).toEqual([
			[0, 2.5],
			[2.5, 5],
			[5, 7.5],
			[7.5, 10]
		]);
		const thirds = timeCues([{ start: 0, end: 8 }], 8, bbc).spans;
		expect(thirds[0].end).toBe(4);
		const odd = timeCues([{ start: 0, end: 7.1 }], 7.1, { ...bbc, maxSeconds: 7 / 3 }).spans;
		expect(odd.map((s) => s.end)).toEqual([1.775, 3.55, 5.325, 7.1]);
	});
});

describe('wordsForSpans', () => {
	it('puts each recognised word in the cue on screen at its time and lays out the lines', () => {
		const spans = [
			{ start: 1, end: 3 },
			{ start: 4.5, end: 9.6 },
			{ start: 9.6, end: 12 }
		];
		const segments = [
			{ start: 1, end: 3, text: ' Lie on your back.' },
			// 63 characters with their spaces over 7.5 s; the cut at 9.6 s falls at 42.8 of them:
			// "you," is centred at 42.5 (first cue), "then" at 47.5 (second).
			{
				start: 4.5,
				end: 12,
				text: 'Bend one knee and slide the heel toward you, then slowly back.'
			}
		];
		expect(wordsForSpans(spans, segments, 37)).toEqual([
			'Lie on your back.',
			'Bend one knee and slide\nthe heel toward you,',
			'then slowly back.'
		]);
	});

	it('gives a word outside every cue to the nearest one', () => {
		const spans = [
			{ start: 0, end: 2 },
			{ start: 5, end: 7 }
		];
		expect(wordsForSpans(spans, [{ start: 3.8, end: 4, text: 'Ready?' }], 37)).toEqual([
			'',
			'Ready?'
		]);
	});

	it('escapes what WebVTT would read as markup', () => {
		expect(escapeCueText('Hold <5 s & relax -->')).toBe('Hold &lt;5 s &amp; relax --&gt;');
		expect(
			wordsForSpans([{ start: 0, end: 2 }], [{ start: 0, end: 2, text: 'Knee <90° & hip' }], 37)
		).toEqual(['Knee &lt;90° &amp; hip']);
	});
});

describe('draftCues', () => {
	const silences = [
		{ start: 0, end: 1 },
		{ start: 3, end: 4.5 },
		{ start: 9.2, end: 9.6 },
		{ start: 12, end: 20 }
	];

	it('without words: blank cues timed to the speech, which the checks then ask to fill', () => {
		const draft = draftCues({ silences, durationSeconds: 20 }, bbc);
		expect(draft.cues).toEqual([
			{ id: '', start: 1, end: 3, text: '' },
			{ id: '', start: 4.5, end: 9.6, text: '' },
			{ id: '', start: 9.6, end: 12, text: '' }
		]);
		const findings = checkCues(draft.cues, profiles.bbc);
		expect(findings.map((f) => f.kind)).toEqual(['empty', 'empty', 'empty']);
	});

	it('with words: the same times carrying them, and nothing else for the checks to find', () => {
		const draft = draftCues(
			{
				silences,
				durationSeconds: 20,
				segments: [
					{ start: 1.1, end: 2.9, text: 'Lie on your back.' },
					{ start: 4.6, end: 9.1, text: 'Bend one knee and slide the heel up.' },
					{ start: 9.7, end: 11.9, text: 'Then slowly back.' }
				]
			},
			bbc
		);
		expect(draft.cues.map((c) => [c.start, c.end, c.text])).toEqual([
			[1, 3, 'Lie on your back.'],
			// 36 characters: one line of at most 37.
			[4.5, 9.6, 'Bend one knee and slide the heel up.'],
			[9.6, 12, 'Then slowly back.']
		]);
		expect(checkCues(draft.cues, profiles.bbc)).toEqual([]);
	});

	it('times speech the service heard where the detector found only quiet', () => {
		const draft = draftCues(
			{
				silences: [{ start: 0, end: 10 }],
				durationSeconds: 10,
				segments: [{ start: 4, end: 6, text: 'Softly now.' }]
			},
			bbc
		);
		expect(draft.cues).toEqual([{ id: '', start: 4, end: 6, text: 'Softly now.' }]);
	});

	it('ignores empty segments and segments after the end', () => {
		const draft = draftCues(
			{
				silences: [{ start: 0, end: 2 }],
				durationSeconds: 4,
				segments: [
					{ start: 2, end: 4, text: '   ' },
					{ start: 5, end: 6, text: 'Past the end.' }
				]
			},
			bbc
		);
		expect(draft.cues).toEqual([{ id: '', start: 2, end: 4, text: '' }]);
	});

	it('makes no cues for a silent recording', () => {
		expect(draftCues({ silences: [{ start: 0, end: 8 }], durationSeconds: 8 }, bbc)).toEqual({
			cues: [],
			evenCuts: 0
		});
	});
});
