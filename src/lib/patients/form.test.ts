import { describe, expect, it } from 'vitest';
import {
	checkDetails,
	detailsDraftFrom,
	detailsDraftFromForm,
	detailsFormOf,
	draftOfDetailsForm,
	emptyDetailsDraft,
	parseDetails
} from './form';

describe('patient details', () => {
	it('accepts a knee replacement patient with a date, protocol and precautions', () => {
		const parsed = parseDetails({
			...emptyDetailsDraft(),
			fullName: ' Hattie Groves ',
			affectedSide: 'left',
			condition: 'Left total knee replacement',
			operationDate: '2026-11-10',
			protocol: 'knee-replacement',
			precautions: ['no-kneeling'],
			otherPrecautions: 'No driving yet\nno driving yet, Avoid stairs'
		});
		expect(parsed).toEqual({
			ok: true,
			details: {
				fullName: 'Hattie Groves',
				affectedSide: 'left',
				condition: 'Left total knee replacement',
				operationDate: '2026-11-10',
				protocol: 'knee-replacement',
				precautions: ['no-kneeling', 'No driving yet', 'Avoid stairs'],
				precautionDetails: {},
				protocolShiftWeeks: 0,
				slingUntil: null,
				birthYear: null,
				sex: null,
				timeZone: 'Europe/London'
			}
		});
	});

	it('keeps a precaution’s end and degrees, a sling period, the surgeon’s timing, birth year and sex', () => {
		const parsed = parseDetails({
			...emptyDetailsDraft(),
			fullName: 'Ola Brink',
			precautions: ['biceps-repair', 'shoulder-external-rotation-limit'],
			precautionUntil: {
				'biceps-repair': 'week 6',
				'shoulder-external-rotation-limit': '2026-12-20'
			},
			precautionDegrees: { 'shoulder-external-rotation-limit': '20' },
			protocolShiftWeeks: '−1',
			slingUntil: '2026-12-14',
			birthYear: '1961',
			sex: 'female'
		});
		expect(parsed).toMatchObject({
			ok: true,
			details: {
				precautionDetails: {
					'biceps-repair': { untilWeek: 6, untilDate: null, degrees: null },
					'shoulder-external-rotation-limit': {
						untilWeek: null,
						untilDate: '2026-12-20',
						degrees: 20
					}
				},
				protocolShiftWeeks: -1,
				slingUntil: '2026-12-14',
				birthYear: 1961,
				sex: 'female'
			}
		});
		// And back into the form as typed.
		if (parsed.ok) {
			const draft = detailsDraftFrom(parsed.details);
			expect(draft.precautionUntil).toEqual({
				'biceps-repair': '6',
				'shoulder-external-rotation-limit': '2026-12-20'
			});
			expect(draft.precautionDegrees).toEqual({ 'shoulder-external-rotation-limit': '20' });
			expect(draft.birthYear).toBe('1961');
		}
	});

	it('refuses each new field in words, naming the precaution', () => {
		const base = { ...emptyDetailsDraft(), fullName: 'A', precautions: ['biceps-repair'] };
		expect(parseDetails({ ...base, precautionUntil: { 'biceps-repair': 'soon' } })).toMatchObject({
			ok: false,
			path: 'precaution-until-biceps-repair',
			message: expect.stringMatching(/^Biceps repair: no active elbow flexion: "soon" is neither/)
		});
		expect(parseDetails({ ...base, birthYear: '61' })).toMatchObject({
			ok: false,
			path: 'birthYear'
		});
		expect(parseDetails({ ...base, birthYear: '1800' })).toMatchObject({
			ok: false,
			path: 'birthYear'
		});
		expect(parseDetails({ ...base, sex: 'x' })).toMatchObject({ ok: false, path: 'sex' });
		expect(parseDetails({ ...base, slingUntil: '14/12/2026' })).toMatchObject({
			ok: false,
			path: 'slingUntil'
		});
		expect(parseDetails({ ...base, protocolShiftWeeks: '2.5' })).toMatchObject({
			ok: false,
			path: 'protocolShiftWeeks'
		});
		expect(parseDetails({ ...base, protocolShiftWeeks: '40' })).toMatchObject({
			ok: false,
			path: 'protocolShiftWeeks'
		});
		// The end of an unticked precaution is not kept.
		expect(
			parseDetails({ ...base, precautions: [], precautionUntil: { 'biceps-repair': '6' } })
		).toMatchObject({ ok: true, details: { precautionDetails: {} } });
	});

	it('says every problem at once, each on its own field', () => {
		const checked = checkDetails({
			...emptyDetailsDraft(),
			fullName: '  ',
			precautions: ['biceps-repair'],
			precautionUntil: { 'biceps-repair': 'soon' },
			birthYear: '61',
			otherPrecautions: 'x'.repeat(161)
		});
		expect(checked.ok).toBe(false);
		expect(checked.ok ? [] : checked.problems.map((p) => p.path)).toEqual([
			'precaution-until-biceps-repair',
			'fullName',
			'precautions.1',
			'birthYear'
		]);
	});

	it('carries a draft through the posted form unchanged', () => {
		const draft = {
			...emptyDetailsDraft('Europe/Dublin'),
			fullName: 'D',
			precautions: ['biceps-repair', 'falls-risk'],
			precautionUntil: { 'biceps-repair': '6' },
			otherPrecautions: 'Mind the stairs'
		};
		const form = detailsFormOf(draft);
		expect(form['precaution-until-biceps-repair']).toBe('6');
		expect(form.precaution).toEqual(['biceps-repair', 'falls-risk']);
		expect(draftOfDetailsForm(form)).toEqual(draft);
	});

	it('stores no operation date when none is given', () => {
		const parsed = parseDetails({ ...emptyDetailsDraft(), fullName: 'A' });
		expect(parsed.ok && parsed.details.operationDate).toBeNull();
	});

	it('refuses a date that is not on the calendar, an unknown protocol and an unknown zone', () => {
		const base = { ...emptyDetailsDraft(), fullName: 'A' };
		expect(parseDetails({ ...base, operationDate: '2026-02-30' })).toMatchObject({
			ok: false,
			path: 'operationDate'
		});
		expect(parseDetails({ ...base, protocol: 'made-up' })).toMatchObject({
			ok: false,
			path: 'protocol'
		});
		expect(parseDetails({ ...base, timeZone: 'Mars/Olympus' })).toMatchObject({
			ok: false,
			path: 'timeZone'
		});
	});

	it('reads a form, keeping only known precaution ids as ticks', () => {
		const form = new FormData();
		form.set('fullName', 'B');
		form.append('precaution', 'no-kneeling');
		form.append('precaution', 'invented-id');
		form.set('otherPrecautions', 'Mind the stairs');
		const draft = detailsDraftFromForm(form);
		expect(draft.precautions).toEqual(['no-kneeling']);
		expect(draft.timeZone).toBe('Europe/London');
	});

	it('splits stored precautions back into ticks and free text', () => {
		const draft = detailsDraftFrom({
			fullName: 'C',
			affectedSide: 'right',
			condition: '',
			operationDate: null,
			protocol: '',
			precautions: ['falls-risk', 'Mind the stairs'],
			precautionDetails: {},
			protocolShiftWeeks: 0,
			slingUntil: null,
			birthYear: null,
			sex: null,
			timeZone: 'Europe/Dublin'
		});
		expect(draft.precautions).toEqual(['falls-risk']);
		expect(draft.otherPrecautions).toBe('Mind the stairs');
		expect(draft.operationDate).toBe('');
	});
});

describe('patient details against crafted input (review cases)', () => {
	const base = { ...emptyDetailsDraft(), fullName: 'A' };

	it('stores a precaution once, however it was ticked or typed', () => {
		const parsed = parseDetails({
			...base,
			precautions: ['biceps-repair', 'biceps-repair'],
			otherPrecautions: 'biceps-repair\nBiceps repair: no active elbow flexion\nMind the stairs'
		});
		expect(parsed.ok && parsed.details.precautions).toEqual(['biceps-repair', 'Mind the stairs']);
	});

	it('reads weeks and degrees only as digits', () => {
		expect(parseDetails({ ...base, protocolShiftWeeks: '0x0c' })).toMatchObject({
			ok: false,
			path: 'protocolShiftWeeks'
		});
		expect(
			parseDetails({
				...base,
				precautions: ['shoulder-external-rotation-limit'],
				precautionDegrees: { 'shoulder-external-rotation-limit': '0x5A' }
			})
		).toMatchObject({ ok: false, path: 'precaution-degrees-shoulder-external-rotation-limit' });
	});
});
