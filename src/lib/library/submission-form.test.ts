import { describe, expect, it } from 'vitest';
import {
	MAX_COACHING_CUES,
	parseSubmission,
	submissionForm,
	type SubmissionDraft
} from './submission-form';
import type { Licence } from './types';

const draft = (changes: Partial<SubmissionDraft> = {}): SubmissionDraft => ({
	title: ' Heel slides ',
	description: 'Slide the heel in and out.',
	coachingCues: 'Keep the heel on the bed\n\n  Breathe out as you bend  ',
	safetyNotes: 'Stop if pain is sharp.',
	consent: true,
	consentDetails: 'Signed forms in the office',
	licence: 'cc-by-4.0',
	attribution: 'Alder Street team',
	noteToReviewer: '',
	...changes
});

describe('parseSubmission', () => {
	it('trims, and reads one coaching cue per non-empty line', () => {
		const result = parseSubmission(draft());
		expect(result).toMatchObject({
			ok: true,
			input: {
				wording: {
					title: 'Heel slides',
					coachingCues: ['Keep the heel on the bed', 'Breathe out as you bend']
				},
				licence: 'cc-by-4.0',
				consentConfirmed: true
			}
		});
	});

	it('names each problem by its field', () => {
		const result = parseSubmission(
			draft({ title: 'x', consent: false, licence: 'mine' as Licence, attribution: '' })
		);
		expect(result.ok).toBe(false);
		if (result.ok) return;
		expect(result.problems.map((p) => p.path)).toEqual([
			'title',
			'consent',
			'licence',
			'attribution'
		]);
		expect(result.problems.find((p) => p.path === 'consent')?.message).toMatch(
			/agreed to publication/
		);
	});

	it('limits the number of coaching cues', () => {
		const many = Array.from({ length: MAX_COACHING_CUES + 1 }, (_, i) => `Cue ${i}`).join('\n');
		expect(parseSubmission(draft({ coachingCues: many })).ok).toBe(false);
	});
});

describe('submissionForm', () => {
	it('keeps the key points as typed, and says a long one once however many there are', () => {
		const long = 'x'.repeat(301);
		const refused = submissionForm.safeParse(draft({ coachingCues: `${long}\nFine\n${long}` }));
		expect(refused.success).toBe(false);
		expect(refused.error?.issues.map((i) => [i.path, i.message])).toEqual([
			[['coachingCues'], 'Keep each key point under 300 characters.']
		]);
		const accepted = submissionForm.parse(draft());
		expect(accepted.coachingCues).toBe(draft().coachingCues);
	});
});
