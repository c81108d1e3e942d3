import { describe, expect, it } from 'vitest';
import {
	draftFromForm,
	MAX_COACHING_CUES,
	parseSubmission,
	type SubmissionDraft
} from './submission-form';

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
			draft({ title: 'x', consent: false, licence: 'mine', attribution: '' })
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

describe('draftFromForm', () => {
	it('reads the consent box as ticked only when it says yes', () => {
		const form = new FormData();
		form.set('title', 'Heel slides');
		form.set('consent', 'yes');
		expect(draftFromForm(form)).toMatchObject({ title: 'Heel slides', consent: true, licence: '' });
		form.set('consent', 'on');
		expect(draftFromForm(form).consent).toBe(false);
	});
});
