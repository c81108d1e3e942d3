import { describe, expect, it } from 'vitest';
import {
	MEASUREMENT_ERROR,
	NORM_SOURCES,
	ROM_CAUTION,
	ageOn,
	measurementError,
	normalValue,
	percentOfNormal,
	percentOfOtherSide,
	romChange
} from './rom';

describe('normal values', () => {
	it('defaults to the AAOS shoulder values (Norkin & White Table A.1, quoting AAOS)', () => {
		expect(normalValue('shoulder-flexion')?.degrees).toBe(180);
		expect(normalValue('shoulder-extension')?.degrees).toBe(60);
		expect(normalValue('shoulder-abduction')?.degrees).toBe(180);
		const raised = { armPosition: 'abducted-90' } as const;
		expect(normalValue('shoulder-internal-rotation', raised)?.degrees).toBe(70);
		expect(normalValue('shoulder-external-rotation', raised)).toMatchObject({
			degrees: 90,
			source: 'aaos',
			confidence: 'read',
			minimum: false
		});
	});

	it('marks the AAOS knee values as from memory (REFERENCES.md: flexion 135, extension 0, memory)', () => {
		expect(normalValue('knee-flexion')).toMatchObject({ degrees: 135, confidence: 'memory' });
		expect(normalValue('knee-extension')).toMatchObject({ degrees: 0, confidence: 'memory' });
		// Marked in the data, not in the citation a clinician reads.
		expect(NORM_SOURCES.aaos.citation).not.toMatch(/memory|check/i);
	});

	it('offers the AMA Guides lower limits (Norkin & White Table A.1, quoting the AMA Guides)', () => {
		const ama = (m: Parameters<typeof normalValue>[0]) =>
			normalValue(m, { source: 'ama', armPosition: 'abducted-90' })?.degrees ?? null;
		expect(ama('shoulder-flexion')).toBe(180);
		expect(ama('shoulder-extension')).toBe(50);
		expect(ama('shoulder-abduction')).toBe(170);
		expect(ama('shoulder-internal-rotation')).toBe(80);
		expect(ama('shoulder-external-rotation')).toBe(60);
		expect(normalValue('shoulder-flexion', { source: 'ama' })?.minimum).toBe(true);
		expect(ama('knee-flexion')).toBeNull(); // not in the table we read
	});

	it('gives no rotation normal unless the arm was raised to 90° (REFERENCES.md: AAOS ER is measured in 90° abduction)', () => {
		// After a cuff repair rotation is read with the arm at the side: no like-for-like normal.
		expect(normalValue('shoulder-external-rotation', { armPosition: 'side' })).toBeNull();
		expect(normalValue('shoulder-external-rotation', { armPosition: 'scapular-plane' })).toBeNull();
		expect(normalValue('shoulder-internal-rotation')).toBeNull();
		expect(normalValue('shoulder-flexion', { armPosition: 'side' })?.degrees).toBe(180);
	});

	it('marks the AAOS hip values as from memory (Norkin & White Table A.1 recalled: flexion 120, abduction 45)', () => {
		expect(normalValue('hip-flexion')).toMatchObject({ degrees: 120, confidence: 'memory' });
		expect(normalValue('hip-abduction')).toMatchObject({ degrees: 45, confidence: 'memory' });
		expect(normalValue('hip-extension')?.degrees).toBe(30);
		expect(normalValue('hip-external-rotation')?.degrees).toBe(45);
	});

	it('gives an age from a birth year as a range of two years, so a band edge is not guessed', () => {
		expect(ageOn(1980, '2026-05-01')).toEqual({ low: 45, high: 46 });
	});

	it('offers the CDC values by sex for ages 20–44 only (Soucie et al. 2011, secondary)', () => {
		expect(
			normalValue('shoulder-flexion', { source: 'cdc', sex: 'female', age: 30 })
		).toMatchObject({
			degrees: 172.0,
			confidence: 'secondary'
		});
		expect(normalValue('shoulder-flexion', { source: 'cdc', sex: 'male', age: 44 })?.degrees).toBe(
			168.8
		);
		expect(normalValue('shoulder-flexion', { source: 'cdc', sex: 'male', age: 67 })).toBeNull();
		expect(normalValue('shoulder-flexion', { source: 'cdc', sex: 'male' })).toBeNull();
		expect(normalValue('shoulder-flexion', { source: 'cdc', age: 30 })).toBeNull();
	});

	it('offers Gill et al. 2020 active values by sex (BMC Musculoskelet Disord 2020;21:676)', () => {
		expect(normalValue('shoulder-flexion', { source: 'gill-2020', sex: 'male' })?.degrees).toBe(
			161.5
		);
		expect(normalValue('shoulder-flexion', { source: 'gill-2020', sex: 'female' })?.degrees).toBe(
			158.5
		);
		expect(normalValue('shoulder-abduction', { source: 'gill-2020', sex: 'male' })?.degrees).toBe(
			151.5
		);
		expect(normalValue('shoulder-abduction', { source: 'gill-2020', sex: 'female' })?.degrees).toBe(
			149.7
		);
	});
});

describe('percent of normal and of the other side', () => {
	it('divides by the AAOS value (Norkin & White Table A.1: flexion 180)', () => {
		const r = percentOfNormal(90, 'shoulder-flexion');
		expect(r?.percent).toBe(50);
		expect(r?.shortBy).toBe(90);
		expect(r?.caution).toBe(ROM_CAUTION);
		expect(
			percentOfNormal(63, 'shoulder-external-rotation', { armPosition: 'abducted-90' })?.percent
		).toBeCloseTo(70, 10); // of 90
		expect(percentOfNormal(108, 'knee-flexion')?.percent).toBeCloseTo(80, 10); // of 135 (from memory)
	});

	it('gives degrees short, not a percentage, where normal is 0 (knee extension, from memory)', () => {
		const r = percentOfNormal(-5, 'knee-extension');
		expect(r?.percent).toBeNull();
		expect(r?.shortBy).toBe(5);
	});

	it('changes with the chosen source (AMA abduction 170; CDC female flexion 172.0)', () => {
		expect(percentOfNormal(153, 'shoulder-abduction', { source: 'ama' })?.percent).toBeCloseTo(
			90,
			10
		);
		expect(
			percentOfNormal(172, 'shoulder-flexion', { source: 'cdc', sex: 'female', age: 40 })?.percent
		).toBe(100);
		expect(percentOfNormal(100, 'knee-flexion', { source: 'cdc' })).toBeNull();
	});

	it('compares with the other side as a percentage only for motions measured from zero up', () => {
		// Common practice: a ratio for flexion, abduction and rotations; degrees for extension.
		expect(percentOfOtherSide('shoulder-flexion', 90, 120)).toBe(75);
		expect(percentOfOtherSide('shoulder-external-rotation', 30, 60)).toBe(50);
		expect(percentOfOtherSide('knee-flexion', 100, 0)).toBeNull();
		expect(percentOfOtherSide('knee-flexion', -5, 120)).toBeNull();
		// −10° short of straight against 3° past it is no "−333%".
		expect(percentOfOtherSide('knee-extension', -10, 3)).toBeNull();
		expect(percentOfOtherSide('knee-extension', 5, 5)).toBeNull();
		expect(percentOfOtherSide('shoulder-extension', 40, 50)).toBeNull();
	});
});

describe('change beyond measurement error', () => {
	it('uses Kolber & Hanney 2011 MDC90 for inclinometer readings: flexion 8, abduction 4, IR 8, ER 9', () => {
		const incl = MEASUREMENT_ERROR.inclinometer;
		expect(incl['shoulder-flexion']?.degrees).toBe(8);
		expect(incl['shoulder-abduction']?.degrees).toBe(4);
		expect(incl['shoulder-internal-rotation']?.degrees).toBe(8);
		expect(incl['shoulder-external-rotation']?.degrees).toBe(9);
	});

	it('uses the larger goniometer error for goniometer readings (Mullaney et al. 2010: limits of agreement 6–25°)', () => {
		// The same 4° abduction figure would make goniometer noise look like progress.
		expect(measurementError('shoulder-abduction', 'goniometer')?.degrees).toBe(25);
		expect(measurementError('shoulder-abduction', 'goniometer')?.basis).toMatch(/Mullaney/);
		expect(romChange(40, 50, 'shoulder-abduction', 'goniometer').beyondError).toBe(false);
		expect(romChange(40, 50, 'shoulder-abduction', 'inclinometer').beyondError).toBe(true);
		// No published figure for a camera estimate or the hip on our list.
		expect(measurementError('shoulder-flexion', 'camera')).toBeNull();
		expect(measurementError('hip-flexion', 'goniometer')).toBeNull();
	});

	it('flags a change only when it exceeds the error (Kolber & Hanney 2011: flexion MDC90 8°)', () => {
		expect(romChange(90, 98, 'shoulder-flexion', 'inclinometer')).toMatchObject({
			change: 8,
			beyondError: false,
			direction: 'none',
			message: 'No change beyond the 8° measurement error (+8°).'
		});
		expect(romChange(90, 99, 'shoulder-flexion', 'inclinometer')).toMatchObject({
			change: 9,
			beyondError: true,
			direction: 'gain',
			message: '9° gained, more than the 8° measurement error.'
		});
		expect(romChange(40, 35, 'shoulder-abduction', 'inclinometer')).toMatchObject({
			beyondError: true,
			direction: 'loss',
			message: '5° lost, more than the 4° measurement error.'
		});
	});

	it('uses 10° for the knee (long-arm goniometer, J Exp Orthop 2018, doi 10.1186/s40634-018-0161-5)', () => {
		expect(romChange(85, 95, 'knee-flexion', 'goniometer').beyondError).toBe(false);
		expect(romChange(85, 96, 'knee-flexion', 'goniometer').beyondError).toBe(true);
		// Knee extension from 12° short of straight to 1° short: 11° gained.
		expect(romChange(-12, -1, 'knee-extension', 'goniometer')).toMatchObject({
			change: 11,
			direction: 'gain'
		});
		expect(measurementError('knee-flexion', 'goniometer')?.basis).toMatch(
			/doi 10\.1186\/s40634-018-0161-5/
		);
	});

	it('takes a clinic’s own error figure, and says when none is known', () => {
		expect(romChange(90, 95, 'shoulder-flexion', 'goniometer', 3).beyondError).toBe(true);
		const ext = romChange(30, 45, 'shoulder-extension', 'inclinometer');
		expect(ext.beyondError).toBeNull();
		expect(ext.direction).toBe('gain');
		expect(ext.message).toMatch(/no measurement error on our list/);
		expect(romChange(30, 30, 'shoulder-extension', 'inclinometer').message).toBe('No change.');
	});
});
