import { describe, expect, it } from 'vitest';
import { profiles } from '../captions/checks';
import {
	CAPTION_JUDGEMENT_ITEMS,
	computeCaptionChecklist,
	computeChecklist,
	judgementTicked,
	JUDGEMENT_ITEMS,
	LIBRARY_CAPTION_PROFILE,
	publicTexts,
	type ChecklistInput
} from './checklist';
import type { ExerciseSnapshot } from './types';

function snapshot(changes: Partial<ExerciseSnapshot> = {}): ExerciseSnapshot {
	return {
		title: 'Heel slides',
		description: 'Lying on your back, slide the heel towards you and back.',
		bodyRegion: 'knee',
		side: 'either',
		position: 'supine',
		movementType: 'active-assisted',
		equipment: ['towel'],
		phase: 1,
		dosage: {
			sets: 1,
			reps: 8,
			holdSeconds: 0,
			restSeconds: 30,
			sessionsPerDay: 3,
			daysPerWeek: 7
		},
		coachingCues: [{ text: 'Keep the heel on the bed' }],
		safetyNotes: 'Tightness at the end of the bend is normal. Stop if pain is sharp.',
		precautionTags: [],
		segment: { id: 'seg-1', durationSeconds: 12, posterCount: 1, captionsLanguage: 'en-GB' },
		// Four words in 2 s is 120 words per minute; a 1 s gap meets the BBC's gap figure.
		cues: [
			{ id: '1', start: 0, end: 2, text: 'Slide the heel in.' },
			{ id: '2', start: 3, end: 5, text: 'And slide it out.' }
		],
		...changes
	};
}

function input(changes: Partial<ChecklistInput> = {}): ChecklistInput {
	return {
		snapshot: snapshot(),
		consentConfirmed: true,
		licence: 'cc-by-nc-4.0',
		attribution: 'Alder Street physiotherapy team',
		...changes
	};
}

const item = (list: ReturnType<typeof computeChecklist>, id: string) =>
	list.items.find((i) => i.id === id)!;

describe('computeChecklist', () => {
	it('passes a complete submission, item by item, under the library profile', () => {
		const list = computeChecklist(input());
		expect(list.profile).toBe(LIBRARY_CAPTION_PROFILE.id);
		expect(list.items.map((i) => [i.id, i.passed])).toEqual([
			['captions', true],
			['safety-notes', true],
			['dosage', true],
			['consent', true],
			['patient-data', true]
		]);
		expect(list.passed).toBe(true);
	});

	it('fails captions when there are none, or when a cue is an error under the profile', () => {
		expect(
			item(computeChecklist(input({ snapshot: snapshot({ cues: [] }) })), 'captions')
		).toMatchObject({
			passed: false,
			summary: 'The segment has no captions.'
		});
		// 12 words in 1 s is 720 words per minute, above the BBC's 200 (checks.ts cites it).
		const fast = snapshot({
			cues: [
				{
					id: '1',
					start: 0,
					end: 1,
					text: 'one two three four five six seven eight nine ten eleven twelve'
				}
			]
		});
		const captions = item(computeChecklist(input({ snapshot: fast })), 'captions');
		expect(captions.passed).toBe(false);
		expect(captions.problems[0]).toMatch(/^Cue 1 at 00:00\.000: Reading rate/);
	});

	it('lets warnings through but counts them', () => {
		// A 0.5 s gap is a warning under the BBC profile (gaps of at least 1 s), not an error.
		const gappy = snapshot({
			cues: [
				{ id: '1', start: 0, end: 2, text: 'Slide the heel in.' },
				{ id: '2', start: 2.5, end: 4.5, text: 'And slide it out.' }
			]
		});
		const captions = item(computeChecklist(input({ snapshot: gappy })), 'captions');
		expect(captions.passed).toBe(true);
		expect(captions.summary).toBe('2 cues, no errors (1 warning to consider).');
	});

	it('checks against the profile it is given', () => {
		// 2 s cues meet DCMP's 2 s minimum; a 1.5 s cue does not (DCMP: never under 2 s).
		const short = snapshot({ cues: [{ id: '1', start: 0, end: 1.5, text: 'Slide in.' }] });
		expect(
			item(computeChecklist(input({ snapshot: short }), profiles.bbc), 'captions').passed
		).toBe(true);
		expect(
			item(computeChecklist(input({ snapshot: short }), profiles.dcmp), 'captions').passed
		).toBe(false);
	});

	it('needs safety notes with some substance', () => {
		expect(
			item(computeChecklist(input({ snapshot: snapshot({ safetyNotes: '' }) })), 'safety-notes')
		).toMatchObject({
			passed: false,
			summary: 'The exercise has no safety notes.'
		});
		expect(
			item(
				computeChecklist(input({ snapshot: snapshot({ safetyNotes: '**Stop.**' }) })),
				'safety-notes'
			).passed
		).toBe(false);
	});

	it('needs every dosage field within the limits', () => {
		const dosage = { ...snapshot().dosage, reps: 0, daysPerWeek: 8 };
		const result = item(computeChecklist(input({ snapshot: snapshot({ dosage }) })), 'dosage');
		expect(result.passed).toBe(false);
		expect(result.problems).toEqual([
			'Reps must be a whole number from 1 to 100.',
			'Days a week must be a whole number from 1 to 7.'
		]);
	});

	it('needs consent, a licence and a credit line', () => {
		const result = item(
			computeChecklist(
				input({ consentConfirmed: false, licence: 'public domain', attribution: ' ' })
			),
			'consent'
		);
		expect(result.passed).toBe(false);
		expect(result.problems).toHaveLength(3);
	});

	it('finds patient data in any public text and says where', () => {
		const leaky = snapshot({
			description: 'For Walter, DOB 02/03/1950.',
			cues: [{ id: '1', start: 0, end: 3, text: 'Ring 0161 496 0000 if it swells.' }]
		});
		const result = item(computeChecklist(input({ snapshot: leaky })), 'patient-data');
		expect(result.passed).toBe(false);
		expect(result.problems).toHaveLength(2);
		expect(result.problems[0]).toMatch(/^Description has what looks like a date of birth/);
		expect(result.problems[1]).toMatch(/^Caption 1 has what looks like a telephone number/);
	});

	it('fails as a whole when any one item fails', () => {
		expect(computeChecklist(input({ consentConfirmed: false })).passed).toBe(false);
	});
});

describe('computeCaptionChecklist', () => {
	it('runs only the caption items: the caption checks and patient data in the captions', () => {
		// Everything else of a caption revision is the published version's, checked back then.
		const bare = snapshot({ safetyNotes: '', description: 'Ring 0161 496 0000.' });
		const list = computeCaptionChecklist(bare);
		expect(list.items.map((i) => [i.id, i.passed])).toEqual([
			['captions', true],
			['patient-data', true]
		]);
		expect(list.passed).toBe(true);
		expect(item(list, 'patient-data').label).toBe(
			'No patient data in the captions (e-mail addresses, phone numbers, dates of birth)'
		);
	});

	it('fails on a caption error or a caption that looks like a person’s details', () => {
		const list = computeCaptionChecklist(
			snapshot({
				cues: [
					{ id: '1', start: 0, end: 1, text: 'one two three four five six seven eight nine ten' },
					{ id: '2', start: 2, end: 5, text: 'Write to ana@clinic.example if it swells.' }
				]
			})
		);
		expect(list.passed).toBe(false);
		expect(item(list, 'captions').problems[0]).toMatch(/^Cue 1 at 00:00\.000: Reading rate/);
		expect(item(list, 'patient-data').problems).toEqual([
			expect.stringMatching(/^Caption 2 has what looks like an e-mail address/)
		]);
	});
});

describe('publicTexts', () => {
	it('lists the title, description, each coaching cue, safety notes, each caption and the credit', () => {
		expect(publicTexts(input()).map((t) => t.field)).toEqual([
			'Title',
			'Description',
			'Key point 1',
			'Safety notes',
			'Caption 1',
			'Caption 2',
			'Credit line'
		]);
	});

	it('reads captions as plain text, without their tags', () => {
		const tagged = snapshot({
			cues: [{ id: '1', start: 0, end: 2, text: '<v Coach>Slide <i>in</i>' }]
		});
		expect(
			publicTexts(input({ snapshot: tagged })).find((t) => t.field === 'Caption 1')?.text
		).toBe('Slide in');
	});
});

describe('judgementTicked', () => {
	it('keeps only real items, in order', () => {
		const ids = JUDGEMENT_ITEMS.map((j) => j.id);
		expect(judgementTicked([ids[2], 'made-up', ids[0]])).toEqual([ids[0], ids[2]]);
	});

	it('keeps the caption items for a caption revision, and only those', () => {
		expect(
			judgementTicked(['safe-demonstration', 'plain-words', 'captions-match'], 'captions')
		).toEqual(CAPTION_JUDGEMENT_ITEMS.map((j) => j.id));
		expect(judgementTicked(['captions-match'], 'exercise')).toEqual([]);
	});
});
