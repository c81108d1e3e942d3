import { describe, expect, it } from 'vitest';
import { degreesHint, romEntryDefaults, romEntryForm, romEntrySchema } from './rom-form';

const base = {
	motion: 'knee-flexion',
	side: 'left',
	mode: 'active',
	degrees: '95',
	measuredOn: '2026-11-30',
	note: '  after warm-up ',
	instrument: 'goniometer'
};

describe('the range-of-motion entry form', () => {
	it('reads a typed entry, with a typed minus sign or decimal comma', () => {
		expect(romEntrySchema.parse(base)).toEqual({
			...base,
			degrees: 95,
			note: 'after warm-up',
			armPosition: null
		});
		expect(romEntrySchema.parse({ ...base, motion: 'knee-extension', degrees: '−5' }).degrees).toBe(
			-5
		);
		expect(romEntrySchema.parse({ ...base, degrees: '92,5' }).degrees).toBe(92.5);
	});

	it('refuses what cannot be a reading, saying why', () => {
		const message = (changes: Record<string, string>) =>
			romEntrySchema.safeParse({ ...base, ...changes }).error?.issues[0].message;
		expect(message({ degrees: '' })).toBe('Give the degrees measured, e.g. 95 or -5.');
		expect(message({ degrees: 'ninety' })).toBe('Give the degrees measured, e.g. 95 or -5.');
		expect(message({ degrees: '1350' })).toBe('Degrees cannot be above 200.');
		expect(message({ degrees: '95.3' })).toBe('Degrees are recorded to the half degree.');
		expect(message({ motion: 'wrist-flexion' })).toBe('Choose the motion measured.');
		expect(message({ measuredOn: '2026-02-30' })).toBe(
			'Give the date of the measurement as a calendar date.'
		);
		expect(message({ instrument: 'ruler' })).toBe('Choose what the reading was taken with.');
	});

	it('asks where the arm was for a rotation, and keeps no arm position for other motions', () => {
		const rotation = { ...base, motion: 'shoulder-external-rotation' };
		expect(romEntrySchema.safeParse(rotation).error?.issues[0]).toMatchObject({
			path: ['armPosition'],
			message: 'Say where the arm was: rotation is read differently at the side and raised.'
		});
		expect(romEntrySchema.parse({ ...rotation, armPosition: 'side' }).armPosition).toBe('side');
		expect(romEntrySchema.parse({ ...base, armPosition: 'side' }).armPosition).toBeNull();
	});
});

describe('the entry form as posted', () => {
	const posted = { ...base, armPosition: '' };
	const problems = (changes: Record<string, string>) =>
		romEntryForm
			.safeParse({ ...posted, ...changes })
			.error?.issues.map((issue) => [issue.path.join('.'), issue.message]);

	it('keeps what was typed when it can be read', () => {
		expect(romEntryForm.parse(posted)).toEqual(posted);
	});

	it('says every problem at once, each on its own field', () => {
		expect(problems({ side: '', degrees: '250.3', measuredOn: '' })).toEqual([
			['side', 'Choose the side measured.'],
			['degrees', 'Degrees cannot be above 200.'],
			['degrees', 'Degrees are recorded to the half degree.'],
			['measuredOn', 'Give the date of the measurement as a calendar date.']
		]);
	});

	it('asks where the arm was for a rotation even when the degrees cannot be read', () => {
		expect(problems({ motion: 'shoulder-external-rotation', degrees: 'ninety' })).toEqual([
			['degrees', 'Give the degrees measured, e.g. 95 or -5.'],
			['armPosition', 'Say where the arm was: rotation is read differently at the side and raised.']
		]);
	});
});

describe('the degrees hint follows the motion chosen', () => {
	it('speaks of the knee only for knee motions, and of the arm position for rotations', () => {
		expect(degreesHint('knee-extension')).toMatch(/^Knee extension: 0 is straight/);
		expect(degreesHint('shoulder-flexion')).not.toMatch(/knee/i);
		expect(degreesHint('shoulder-external-rotation')).toMatch(/choose where the arm was/);
		expect(degreesHint('hip-flexion')).toMatch(/^Hip flexion/);
		expect(degreesHint('')).toBe('Whole or half degrees, as read on the instrument.');
	});
});

describe('the entry form’s first values', () => {
	it('starts the form from the last reading, the affected side and today', () => {
		const knee = { condition: 'Total knee replacement', affectedSide: 'right' };
		expect(romEntryDefaults(undefined, knee, '2026-11-30')).toEqual({
			motion: 'knee-flexion',
			side: 'right',
			mode: 'active',
			degrees: '',
			measuredOn: '2026-11-30',
			note: '',
			instrument: 'goniometer',
			armPosition: ''
		});
		const shoulder = { condition: 'Rotator cuff repair', affectedSide: 'both' };
		expect(romEntryDefaults(undefined, shoulder, '2026-11-30')).toMatchObject({
			motion: '',
			side: 'left'
		});
		const last = {
			motion: 'shoulder-external-rotation',
			instrument: 'inclinometer',
			armPosition: 'abducted-90'
		};
		expect(romEntryDefaults(last, shoulder, '2026-11-30')).toMatchObject(last);
		expect(
			romEntryDefaults({ ...last, armPosition: null }, shoulder, '2026-11-30').armPosition
		).toBe('');
	});
});
