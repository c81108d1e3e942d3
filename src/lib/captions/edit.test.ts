import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { checkCues, profiles } from './checks';
import {
	applyFix,
	cueAt,
	frameSeconds,
	markEnd,
	markStart,
	mergeWithNext,
	MIN_CUE_SECONDS,
	moveCue,
	newCueAt,
	nudgeEdge,
	parseTypedTime,
	removeCue,
	resizeCue,
	secondsNeeded,
	setText,
	setTimes,
	snapTargets,
	snapTime,
	splitAt,
	type Edit
} from './edit';
import type { Cue } from './types';

const cue = (id: string, start: number, end: number, text = 'Relax.'): Cue => ({
	id,
	start,
	end,
	text
});
const times = (edit: Edit) => edit.cues.map((c) => [c.start, c.end]);
const whole = { duration: 20 };

describe('cueAt and snapping', () => {
	const cues = [cue('a', 0, 2), cue('b', 2, 4), cue('c', 5, 6)];
	it('finds the cue on screen, an end belonging to the next cue', () => {
		expect(cueAt(cues, 1)).toBe(0);
		expect(cueAt(cues, 2)).toBe(1);
		expect(cueAt(cues, 4.5)).toBe(-1);
	});
	it('jumps to the nearest target within the tolerance, and nowhere else', () => {
		const snap = { targets: [1, 2, 2.1], tolerance: 0.2 };
		expect(snapTime(2.05, snap)).toBe(2);
		expect(snapTime(2.08, snap)).toBe(2.1);
		expect(snapTime(1.5, snap)).toBe(1.5);
		expect(snapTargets(cues, 1, [3.3])).toEqual([3.3, 0, 2, 5, 6]);
	});
});

describe('moveCue', () => {
	const cues = [cue('a', 0, 2), cue('b', 3, 4), cue('c', 6, 7)];
	it('keeps the length and stops at the neighbours', () => {
		expect(times(moveCue(cues, 1, 3.5, whole))[1]).toEqual([3.5, 4.5]);
		const left = moveCue(cues, 1, 0.5, whole);
		expect(left.cues[1]).toMatchObject({ start: 2, end: 3 });
		expect(left.note).toMatch(/another cue/);
		expect(moveCue(cues, 1, 9, whole).cues[1]).toMatchObject({ start: 5, end: 6 });
		expect(moveCue(cues, 2, 30, whole).cues[2]).toMatchObject({ start: 19, end: 20 });
	});
	it('snaps either edge to a target nearby', () => {
		const snap = { targets: snapTargets(cues, 1), tolerance: 0.15 };
		expect(moveCue(cues, 1, 2.1, { ...whole, snap }).cues[1]).toMatchObject({ start: 2, end: 3 });
		expect(moveCue(cues, 1, 4.9, { ...whole, snap }).cues[1]).toMatchObject({ start: 5, end: 6 });
		expect(moveCue(cues, 1, 4.5, { ...whole, snap }).cues[1]).toMatchObject({ start: 4.5 });
		// A start near a target snaps even when the end, far from any, does not (found by dragging).
		const far = { targets: [1, 2], tolerance: 0.175 };
		expect(
			moveCue([cue('a', 1, 2), cue('b', 6, 8)], 1, 2.066, { ...whole, snap: far }).cues[1]
		).toMatchObject({
			start: 2,
			end: 4
		});
	});
	it('leaves an overlap that was already there, without making it worse', () => {
		const overlapping = [cue('a', 0, 3.5), cue('b', 3, 4)];
		expect(moveCue(overlapping, 1, 2, whole).cues[1].start).toBe(3);
		expect(moveCue(overlapping, 1, 3.5, whole).cues[1].start).toBe(3.5);
	});
	it('reports no change when nothing moved', () => {
		expect(moveCue(cues, 1, 3, whole).changed).toBe(false);
	});
});

describe('resizeCue and nudgeEdge', () => {
	const cues = [cue('a', 0, 2), cue('b', 3, 4), cue('c', 6, 7)];
	it('moves one edge within the room left by the neighbours', () => {
		expect(resizeCue(cues, 1, 'end', 5, whole).cues[1]).toMatchObject({ start: 3, end: 5 });
		const far = resizeCue(cues, 1, 'end', 6.5, whole);
		expect(far.cues[1].end).toBe(6);
		expect(far.note).toBe('Ends where the next cue starts (00:06.000).');
		expect(resizeCue(cues, 1, 'start', 1, whole).cues[1].start).toBe(2);
		expect(resizeCue(cues, 0, 'start', -1, whole).note).toBe('Starts where the recording starts.');
	});
	it('never makes a cue shorter than the minimum', () => {
		expect(resizeCue(cues, 1, 'end', 2, whole).cues[1].end).toBe(3 + MIN_CUE_SECONDS);
		expect(resizeCue(cues, 1, 'start', 4, whole).cues[1].start).toBe(4 - MIN_CUE_SECONDS);
	});
	it('nudges by a tenth of a second and by one frame', () => {
		expect(nudgeEdge(cues, 1, 'start', 0.1, whole).cues[1].start).toBe(3.1);
		expect(nudgeEdge(cues, 1, 'end', -frameSeconds(25), whole).cues[1].end).toBe(3.96);
		// 1/30 s is 33.3 ms; times are kept to the millisecond (WebVTT's precision).
		expect(nudgeEdge(cues, 1, 'end', frameSeconds(30), whole).cues[1].end).toBe(4.033);
		expect(frameSeconds(null)).toBe(1 / 25);
	});
	it('snaps to the playhead', () => {
		const snap = { targets: [4.52], tolerance: 0.05 };
		expect(resizeCue(cues, 1, 'end', 4.5, { ...whole, snap }).cues[1].end).toBe(4.52);
	});
});

describe('new cues and marking', () => {
	const cues = [cue('a', 1, 2), cue('b', 5, 6)];
	it('makes a new cue at the playhead, up to the next cue', () => {
		const edit = newCueAt(cues, 2.5, whole);
		expect(edit.index).toBe(1);
		expect(edit.cues[1]).toEqual({ id: '', start: 2.5, end: 4.5, text: '' });
		expect(newCueAt(cues, 4, whole).cues[1].end).toBe(5);
		expect(newCueAt(cues, 19.5, whole).cues[2].end).toBe(20);
	});
	it('refuses a new cue where one is on screen or there is no room', () => {
		const covered = newCueAt(cues, 1.5, whole);
		expect(covered.changed).toBe(false);
		expect(covered.index).toBe(0);
		expect(newCueAt(cues, 4.95, whole).note).toMatch(/no room/);
	});
	it('marks a start: a new cue in a gap, the cue on screen otherwise', () => {
		expect(markStart(cues, 3, whole).cues[1]).toMatchObject({ start: 3, end: 5 });
		expect(markStart(cues, 1.4, whole).cues[0]).toMatchObject({ start: 1.4, end: 2 });
	});
	it('marks an end on the selected cue, or the last one started', () => {
		expect(markEnd(cues, 3, whole).cues[0].end).toBe(3);
		expect(markEnd(cues, 5.5, { ...whole, selected: 0 }).cues[0].end).toBe(5);
		expect(markEnd(cues, 0.5, whole).changed).toBe(false);
	});
});

describe('split, merge, remove, text and typed times', () => {
	it('splits at the playhead, sharing the words near the same proportion', () => {
		const edit = splitAt([cue('knee', 0, 4, 'Bend your knee. Then straighten it.')], 0, 2);
		expect(edit.cues).toEqual([
			cue('knee', 0, 2, 'Bend your knee.'),
			cue('knee.2', 2, 4, 'Then straighten it.')
		]);
		expect(splitAt([cue('', 0, 4, 'Hold.')], 0, 0.05).changed).toBe(false);
	});
	it('closes and reopens a tag cut by the split', () => {
		const edit = splitAt([cue('', 0, 2, '<i>Slowly down and up</i>')], 0, 1);
		expect(edit.cues.map((c) => c.text)).toEqual(['<i>Slowly down</i>', '<i>and up</i>']);
	});
	it('merges with the next cue, the words on two lines', () => {
		const edit = mergeWithNext([cue('a', 0, 1, 'Lift.'), cue('b', 1.5, 3, 'Lower.')], 0);
		expect(edit.cues).toEqual([cue('a', 0, 3, 'Lift.\nLower.')]);
		expect(mergeWithNext([cue('a', 0, 1)], 0).changed).toBe(false);
	});
	it('removes a cue and selects the one that took its place', () => {
		const edit = removeCue([cue('a', 0, 1), cue('b', 1, 2)], 1);
		expect(edit.cues).toHaveLength(1);
		expect(edit.index).toBe(0);
	});
	it('changes text, and reports typing the same text as no change', () => {
		const cues = [cue('a', 0, 1, 'Rest.')];
		expect(setText(cues, 0, 'Rest now.').cues[0].text).toBe('Rest now.');
		expect(setText(cues, 0, 'Rest.').changed).toBe(false);
	});
	it('takes typed times as given, moving the cue to its place in the order', () => {
		const cues = [cue('a', 0, 1), cue('b', 2, 3), cue('c', 4, 5)];
		const edit = setTimes(cues, 0, 4.5, 6, whole);
		expect(edit.cues.map((c) => c.id)).toEqual(['b', 'c', 'a']);
		expect(edit.index).toBe(2);
		expect(setTimes(cues, 0, 2, 1, whole).note).toMatch(/after the start/);
		expect(setTimes(cues, 0, 25, 26, whole).note).toMatch(/ends at 00:20.000/);
	});
	it('keeps extra fields such as row keys through edits', () => {
		const keyed = [{ ...cue('a', 0, 2), key: 'k1' }];
		expect(moveCue(keyed, 0, 1, whole).cues[0]).toMatchObject({ key: 'k1' });
	});
});

describe('applyFix', () => {
	const bbc = profiles.bbc;
	it('extends a cue read too fast into the gap after it, and the finding goes', () => {
		// 12 words in 2 s is 360 words per minute; the BBC's 180 needs 4 s.
		const text = 'Keep your heel on the bed\nand slide it up towards you.';
		const cues = [cue('', 1, 3, text), cue('', 9, 10, 'Now rest.')];
		expect(secondsNeeded(cues[0], bbc)).toBe(4);
		const before = checkCues(cues, bbc).find((f) => f.kind === 'reading-rate');
		expect(before?.fix).toBe('extend-into-gap');
		const edit = applyFix(cues, 0, before!.fix!, bbc, whole);
		expect(edit.cues[0]).toMatchObject({ start: 1, end: 5, id: '' });
		expect(checkCues(edit.cues, bbc).filter((f) => f.index === 0)).toEqual([]);
	});
	it('works on the right cue when identifiers repeat', () => {
		const cues = [cue('x', 0, 1.5, 'Rest.'), cue('x', 3, 3.2, 'Lift.'), cue('y', 8, 9)];
		const edit = applyFix(cues, 1, 'extend-into-gap', bbc, whole);
		expect(edit.cues.map((c) => [c.id, c.end])).toEqual([
			['x', 1.5],
			['x', 4],
			['y', 9]
		]);
	});
	it('does not run a cue past the end of the recording', () => {
		const edit = applyFix(
			[cue('', 0, 1, 'One two three four five six.')],
			0,
			'extend-into-gap',
			bbc,
			{
				duration: 1.5
			}
		);
		expect(edit.cues[0].end).toBe(1.5);
	});
	it('re-flows long lines, splits a long cue and closes a short gap', () => {
		const long = 'Lie on your back, with both legs straight and your arms by your sides.';
		const reflowed = applyFix([cue('', 0, 6, long)], 0, 'reflow-lines', bbc, whole);
		expect(reflowed.cues[0].text.split('\n')).toHaveLength(2);
		const split = applyFix([cue('s', 0, 9, 'Bend. Then straighten.')], 0, 'split-cue', bbc, whole);
		expect(split.cues.map((c) => c.id)).toEqual(['s', 's.2']);
		const gap = applyFix([cue('', 0, 1.5), cue('', 1.8, 3)], 0, 'close-gap', bbc, whole);
		expect(gap.cues[0].end).toBe(1.8);
	});
	it('says so when the fix cannot change anything', () => {
		const stuck = applyFix(
			[cue('', 0, 0.5, 'Lift.'), cue('', 0.5, 1)],
			0,
			'extend-into-gap',
			bbc,
			whole
		);
		expect(stuck.changed).toBe(false);
		expect(stuck.note).toMatch(/by hand/);
	});
});

// Properties: cues in whole milliseconds, sorted and not overlapping, inside a 60 s recording.
const DURATION = 60;
const track = fc
	.uniqueArray(fc.integer({ min: 0, max: DURATION * 1000 }), { minLength: 2, maxLength: 24 })
	.map((points) => {
		const sorted = [...points].sort((a, b) => a - b);
		const cues: Cue[] = [];
		for (let k = 0; k + 1 < sorted.length; k += 2) {
			if (sorted[k + 1] - sorted[k] >= 100) {
				cues.push(cue(String(k), sorted[k] / 1000, sorted[k + 1] / 1000, 'Slowly lift and lower.'));
			}
		}
		return cues;
	})
	.filter((cues) => cues.length > 0);

const time = fc.double({ min: -5, max: DURATION + 5, noNaN: true });

function wellFormed(cues: readonly Cue[]) {
	cues.forEach((c, k) => {
		expect(c.end - c.start).toBeGreaterThan(0);
		expect(c.start).toBeGreaterThanOrEqual(0);
		expect(c.end).toBeLessThanOrEqual(DURATION);
		if (k > 0) {
			expect(c.start).toBeGreaterThanOrEqual(cues[k - 1].start);
			expect(c.start).toBeGreaterThanOrEqual(cues[k - 1].end);
		}
	});
}

describe('every edit keeps the order, makes no overlap and no negative duration', () => {
	const options = { duration: DURATION };
	const edits: [string, (cues: Cue[], i: number, t: number) => Edit][] = [
		['move', (c, i, t) => moveCue(c, i, t, options)],
		[
			'move with snapping',
			(c, i, t) =>
				moveCue(c, i, t, {
					...options,
					snap: { targets: snapTargets(c, i, [t / 2]), tolerance: 0.3 }
				})
		],
		['resize start', (c, i, t) => resizeCue(c, i, 'start', t, options)],
		['resize end', (c, i, t) => resizeCue(c, i, 'end', t, options)],
		[
			'nudge',
			(c, i, t) => nudgeEdge(c, i, t > 30 ? 'end' : 'start', t > 20 ? 0.1 : -0.04, options)
		],
		['new cue', (c, _i, t) => newCueAt(c, t, options)],
		['mark start', (c, i, t) => markStart(c, t, { ...options, selected: i })],
		['mark end', (c, i, t) => markEnd(c, t, { ...options, selected: i })],
		['split', (c, i, t) => splitAt(c, i, t)],
		['merge', (c, i) => mergeWithNext(c, i)],
		['remove', (c, i) => removeCue(c, i)],
		['extend fix', (c, i) => applyFix(c, i, 'extend-into-gap', profiles.dcmp, options)],
		['close-gap fix', (c, i) => applyFix(c, i, 'close-gap', profiles.bbc, options)]
	];
	for (const [name, edit] of edits) {
		it(name, () => {
			fc.assert(
				fc.property(track, fc.nat(), time, (cues, pick, t) => {
					const result = edit(cues, pick % cues.length, t);
					wellFormed(result.cues);
					if (!result.changed) expect(result.cues).toBe(cues);
				})
			);
		});
	}
});

describe('parseTypedTime', () => {
	it('reads the ways people write times', () => {
		expect(parseTypedTime('1:02.5')).toBe(62.5);
		expect(parseTypedTime('00:01:02.500')).toBe(62.5);
		expect(parseTypedTime(' 62,5 ')).toBe(62.5);
		expect(parseTypedTime('90')).toBe(90);
		expect(parseTypedTime('1:00:00')).toBe(3600);
	});
	it('refuses what is not a time', () => {
		for (const text of ['', 'soon', '1:75', '1:60:00', '1.2.3', '-1', '1::2', '0.1234']) {
			expect(parseTypedTime(text), text).toBeNull();
		}
	});
});
