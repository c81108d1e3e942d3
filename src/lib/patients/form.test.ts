import { describe, expect, it } from 'vitest';
import { detailsDraftFrom, detailsDraftFromForm, emptyDetailsDraft, parseDetails } from './form';

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
				timeZone: 'Europe/London'
			}
		});
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
			timeZone: 'Europe/Dublin'
		});
		expect(draft.precautions).toEqual(['falls-risk']);
		expect(draft.otherPrecautions).toBe('Mind the stairs');
		expect(draft.operationDate).toBe('');
	});
});
