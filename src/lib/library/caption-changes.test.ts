import { describe, expect, it } from 'vitest';
import { diffCues } from '../captions/diff';
import { captionChangeRows, captionChangeSummary } from './caption-changes';

const LIBRARY = [
	{ id: '1', start: 0, end: 2, text: 'Lie on your back.' },
	{ id: '2', start: 3, end: 5.95, text: 'Slide the <i>heel</i> in.' },
	{ id: '3', start: 7, end: 8, text: 'Rest.' }
];

describe('captionChangeRows', () => {
	it('lists each cue that differs, in time order, with its words and moved times', () => {
		const now = [
			{ id: '1', start: 0, end: 2, text: 'Lie on your back.' },
			{ id: '2', start: 3, end: 6.334, text: 'Slide the <i>heel</i> in, slowly.' },
			{ id: '4', start: 8.5, end: 9, text: 'Again.' }
		];
		const diff = diffCues(LIBRARY, now);
		expect(captionChangeRows(diff)).toEqual([
			{
				change: 'changed',
				at: '00:03.000',
				before: 'Slide the heel in.',
				after: 'Slide the heel in, slowly.',
				times: { before: '00:03.000–00:05.950', after: '00:03.000–00:06.334' }
			},
			{ change: 'removed', at: '00:07.000', before: 'Rest.', after: null, times: null },
			{ change: 'added', at: '00:08.500', before: null, after: 'Again.', times: null }
		]);
		expect(captionChangeSummary(diff)).toBe('1 cue changed, 1 cue added, 1 cue removed');
	});

	it('has no rows and no words when nothing differs', () => {
		const diff = diffCues(LIBRARY, LIBRARY);
		expect(captionChangeRows(diff)).toEqual([]);
		expect(captionChangeSummary(diff)).toBe('');
	});
});
