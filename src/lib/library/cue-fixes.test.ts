import { describe, expect, it } from 'vitest';
import { checkCues } from '../captions/checks';
import { shiftAndClip } from '../captions/segment';
import type { Cue } from '../captions/types';
import { LIBRARY_CAPTION_PROFILE } from './checklist';
import { failingCues, fixedTrack } from './cue-fixes';

const profile = LIBRARY_CAPTION_PROFILE;
// Ten words in 2.95 s is 203 words per minute: 1.5% over the BBC's 200 (checks.ts cites it).
const FAST = 'Bend the knee and slide the heel back in slowly';
const window = { start: 10, end: 30 };

const track = (...cues: Omit<Cue, 'id'>[]): Cue[] => cues.map((c, i) => ({ id: `${i + 1}`, ...c }));
const errorsIn = (cues: Cue[]) =>
	checkCues(shiftAndClip(cues, window.start, window.end), profile).filter(
		(f) => f.severity === 'error'
	);

describe('failingCues', () => {
	it('offers to show a cue read 1.5% too fast longer, in the free time after it', () => {
		const cues = track(
			{ start: 2, end: 4, text: 'Before the segment.' },
			{ start: 10.5, end: 12, text: 'Lie on your back.' },
			{ start: 13, end: 15.95, text: FAST },
			{ start: 18, end: 20, text: 'Then rest.' }
		);
		const [failing, ...others] = failingCues(cues, window, profile);
		expect(others).toEqual([]);
		// Numbered as the checklist numbers the segment's captions: the second, at 3 s.
		expect(failing).toMatchObject({
			index: 1,
			trackIndex: 2,
			start: 3,
			text: FAST,
			note: null,
			fixes: [{ fix: 'extend-into-gap', label: 'Show cue 2 until 00:06.334 (0.38 s longer)' }]
		});
		expect(failing.problems[0]).toMatch(/^Reading rate 203 words per minute/);

		const fixed = fixedTrack(cues, window, 2, 'extend-into-gap', profile)!;
		expect(errorsIn(fixed)).toEqual([]);
		// Only that cue changed: it ends later, at the target rate of 180 words per minute.
		expect(fixed.map((c) => c.end)).toEqual([4, 12, 16.334, 20]);
	});

	it('never shows a cue past the end of the segment (that time is the next exercise’s)', () => {
		const cues = track(
			{ start: 27, end: 29.95, text: FAST },
			{ start: 31, end: 33, text: 'Next, ankle pumps.' }
		);
		const fixed = fixedTrack(cues, window, 0, 'extend-into-gap', profile)!;
		// 180 words per minute would need until 30.334 s; the segment ends at 30 s (200 words a minute).
		expect(fixed[0].end).toBe(30);
		expect(errorsIn(fixed)).toEqual([]);
		expect(failingCues(cues, window, profile)[0].fixes[0].label).toBe(
			'Show cue 1 until 00:20.000 (0.05 s longer)'
		);
	});

	it('offers nothing when no fix clears the error, and says where to change it', () => {
		// The next cue starts as it ends, and splitting keeps each part's rate.
		const cues = track(
			{ start: 13, end: 15.95, text: FAST },
			{ start: 15.95, end: 18, text: 'Then rest.' }
		);
		expect(fixedTrack(cues, window, 0, 'extend-into-gap', profile)).toBeNull();
		expect(fixedTrack(cues, window, 0, 'split-cue', profile)).toBeNull();
		expect(failingCues(cues, window, profile)).toMatchObject([
			{
				index: 0,
				trackIndex: 0,
				fixes: [],
				note: 'No one-step fix clears this; change it in the caption editor.'
			}
		]);
	});

	it('leaves a cue across the edge of the segment to the studio', () => {
		const cues = track({ start: 9, end: 12.2, text: FAST });
		expect(failingCues(cues, window, profile)).toMatchObject([
			{
				index: 0,
				trackIndex: null,
				fixes: [],
				note: 'It runs across the edge of the segment; change it in the caption editor.'
			}
		]);
		expect(fixedTrack(cues, window, 0, 'extend-into-gap', profile)).toBeNull();
	});

	it('lists nothing when the captions pass, warnings included', () => {
		// 0.5 s gap: a warning under the BBC profile, which the library lets through.
		const cues = track(
			{ start: 10, end: 12, text: 'Slide the heel in.' },
			{ start: 12.5, end: 14.5, text: 'And slide it out.' }
		);
		expect(failingCues(cues, window, profile)).toEqual([]);
	});
});
