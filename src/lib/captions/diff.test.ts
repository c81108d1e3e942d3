import { describe, expect, it } from 'vitest';
import { diffCues } from './diff';
import type { Cue } from './types';

const cue = (id: string, start: number, end: number, text: string): Cue => ({
	id,
	start,
	end,
	text
});

describe('diffCues', () => {
	const base = [
		cue('1', 0, 2, 'Sit tall.'),
		cue('2', 2.5, 4, 'Stand up.'),
		cue('3', 5, 7, 'Rest.')
	];

	it('finds nothing between a version and its copy', () => {
		const diff = diffCues(base, structuredClone(base));
		expect(diff).toEqual({ entries: [], added: 0, removed: 0, changed: 0, unchanged: 3 });
	});

	it('pairs by identifier and names the fields that changed', () => {
		const after = [base[0], cue('2', 2.6, 4, 'Stand up slowly.'), base[2]];
		const diff = diffCues(base, after);
		expect(diff.changed).toBe(1);
		expect(diff.entries).toEqual([
			{ type: 'changed', before: base[1], after: after[1], fields: ['start', 'text'] }
		]);
	});

	it('pairs cues without a shared identifier by time overlap', () => {
		const before = [cue('', 0, 2, 'Sit tall.'), cue('', 3, 5, 'Breathe out.')];
		const after = [cue('', 0, 2, 'Sit up tall.'), cue('', 3, 5, 'Breathe out.')];
		const diff = diffCues(before, after);
		expect(diff.unchanged).toBe(1);
		expect(diff.entries).toEqual([
			{ type: 'changed', before: before[0], after: after[0], fields: ['text'] }
		]);
	});

	it('reports added and removed cues in time order', () => {
		const after = [base[0], cue('9', 8, 9, 'Again.'), base[1]];
		const diff = diffCues(base, after);
		expect(diff.entries.map((e) => e.type)).toEqual(['removed', 'added']);
		expect(diff).toMatchObject({ added: 1, removed: 1, changed: 0, unchanged: 2 });
	});

	it('pairs a split cue with the half that covers most of it; the other half is added', () => {
		const before = [cue('a', 0, 6, 'Lift the leg and hold it there.')];
		const after = [cue('b', 0, 4, 'Lift the leg'), cue('c', 4, 6, 'and hold it there.')];
		const diff = diffCues(before, after);
		expect(diff.entries).toEqual([
			{ type: 'changed', before: before[0], after: after[0], fields: ['id', 'end', 'text'] },
			{ type: 'added', after: after[1] }
		]);
	});

	it('treats an identifier match as the pairing even when the times moved away', () => {
		const before = [cue('x', 0, 1, 'One.')];
		const after = [cue('x', 10, 11, 'One.')];
		expect(diffCues(before, after).entries).toEqual([
			{ type: 'changed', before: before[0], after: after[0], fields: ['start', 'end'] }
		]);
	});

	it('counts a change of cue settings', () => {
		const before = [cue('1', 0, 1, 'Up.')];
		const after = [{ ...before[0], settings: { line: 0 } }];
		expect(diffCues(before, after).entries[0]).toMatchObject({ fields: ['settings'] });
	});

	it('sees times within half a millisecond as the same', () => {
		expect(diffCues([cue('1', 1, 2, 'A')], [cue('1', 1.0004, 2, 'A')]).unchanged).toBe(1);
	});
});
