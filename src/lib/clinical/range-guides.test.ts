import { describe, expect, it } from 'vitest';
import {
	describeGuideForClinician,
	describeGuideForPatient,
	guidesOn,
	judgeReading,
	rangeGuideSchema,
	type RangeGuide
} from './range-guides';

// The shoulder programme's guides as a clinician might set them after a cuff repair (REFERENCES.md:
// a widely circulated protocol, secondary: flexion to about 90 and external rotation to about 20
// early on). The figures are the clinician's, set here by the test.
const op = '2026-11-02';
const flexion: RangeGuide = {
	motion: 'shoulder-flexion',
	kind: 'target',
	degrees: 90,
	untilWeek: null,
	untilDate: null
};
const rotationLimit: RangeGuide = {
	motion: 'shoulder-external-rotation',
	kind: 'limit',
	degrees: 20,
	untilWeek: 6,
	untilDate: null
};
const day = (d: string) => `[${d}]`;

describe('range targets and limits', () => {
	it('tells the patient in plain words, with the end as a date', () => {
		expect(describeGuideForPatient(flexion, op, day)).toBe(
			'Raising the arm forward and up: to about 90°.'
		);
		expect(describeGuideForPatient(rotationLimit, op, day)).toBe(
			'Turning the forearm out away from the body: no further than 20° up to and including [2026-12-13].'
		);
		expect(describeGuideForPatient(flexion, op, day, 'passive')).toBe(
			'Raising the arm forward and up: to about 90°, moved for you, not by its own muscles.'
		);
		expect(describeGuideForPatient(rotationLimit, null, day)).toBe(
			'Turning the forearm out away from the body: no further than 20° until week 6 after the operation.'
		);
		expect(describeGuideForClinician(rotationLimit, op, day)).toBe(
			'Shoulder external (lateral) rotation: limit 20° up to and including [2026-12-13]'
		);
	});

	it('stops holding a limit once its week has begun', () => {
		expect(guidesOn([flexion, rotationLimit], op, '2026-12-13')).toHaveLength(2);
		expect(guidesOn([flexion, rotationLimit], op, '2026-12-14')).toEqual([flexion]);
	});

	it('judges a reading against the limit of its date and motion', () => {
		const reading = {
			motion: 'shoulder-external-rotation',
			degrees: 28,
			measuredOn: '2026-11-30',
			instrument: 'goniometer' as const
		};
		expect(judgeReading(reading, [flexion, rotationLimit], op)).toEqual([
			{
				guide: rotationLimit,
				verdict: 'beyond-limit',
				text: '8° beyond the limit of 20° set for now.'
			}
		]);
		expect(judgeReading({ ...reading, degrees: 20 }, [rotationLimit], op)[0].verdict).toBe(
			'within-limit'
		);
		// After week 6 the limit no longer holds: nothing to judge.
		expect(judgeReading({ ...reading, measuredOn: '2026-12-20' }, [rotationLimit], op)).toEqual([]);
	});

	it('gives the gap to a target, with the instrument’s error beside it (Kolber & Hanney 2011: flexion MDC90 8° with an inclinometer)', () => {
		const reading = {
			motion: 'shoulder-flexion',
			degrees: 83,
			measuredOn: '2026-11-30',
			instrument: 'inclinometer' as const
		};
		expect(judgeReading(reading, [flexion], op)[0]).toEqual({
			guide: flexion,
			verdict: 'short-of-target',
			text: '7° short of the target of about 90° (within the ±8° measurement error of this instrument).'
		});
		expect(judgeReading({ ...reading, degrees: 81 }, [flexion], op)[0].text).toBe(
			'9° short of the target of about 90°.'
		);
		expect(judgeReading({ ...reading, degrees: 90 }, [flexion], op)[0].verdict).toBe(
			'reached-target'
		);
		// No error on our list for a camera estimate: the gap alone.
		expect(judgeReading({ ...reading, instrument: 'camera' }, [flexion], op)[0].text).toBe(
			'7° short of the target of about 90°.'
		);
	});

	it('refuses a guide that is not whole degrees, or has two ends, in words', () => {
		expect(rangeGuideSchema.safeParse({ ...flexion, degrees: 90.5 }).error?.issues[0].message).toBe(
			'Give whole degrees, e.g. 90.'
		);
		expect(
			rangeGuideSchema.safeParse({ ...rotationLimit, untilDate: '2026-12-01' }).error?.issues[0]
				.message
		).toBe('Give a week or a date for the end, not both.');
		expect(rangeGuideSchema.safeParse({ ...flexion, motion: 'elbow' }).success).toBe(false);
	});
});
