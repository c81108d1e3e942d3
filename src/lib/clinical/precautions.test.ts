import { describe, expect, it } from 'vitest';
import {
	CONFLICTS,
	EXERCISE_TAGS,
	PRECAUTIONS,
	precautionConflicts,
	resolvePrecaution,
	resolveTag,
	describePrecaution,
	precautionDetailSchema,
	precautionsOn,
	rangeClashes
} from './precautions';

describe('precaution conflicts', () => {
	it('finds the biceps-repair clash DESIGN.md names ("needs active elbow flexion")', () => {
		const conflicts = precautionConflicts(
			['biceps-repair'],
			['active-elbow-flexion', 'lying-prone']
		);
		expect(conflicts).toHaveLength(1);
		expect(conflicts[0].precaution).toEqual({
			kind: 'known',
			id: 'biceps-repair',
			label: 'Biceps repair: no active elbow flexion'
		});
		expect(conflicts[0].tag).toMatchObject({ kind: 'known', id: 'active-elbow-flexion' });
		expect(conflicts[0].reason).toBe(
			'Biceps repair: no active elbow flexion. This exercise needs active elbow flexion: bending the elbow with its own muscles works the repaired biceps.'
		);
	});

	it('accepts the plain words as well as the id, ignoring case and spaces', () => {
		const conflicts = precautionConflicts(
			['  biceps repair:  NO active elbow flexion '],
			['Needs active elbow flexion']
		);
		expect(conflicts.map((c) => c.tag.kind)).toEqual(['known']);
	});

	it('lists every clash, in the order of the patient’s precautions, without repeats', () => {
		const conflicts = precautionConflicts(
			['no-kneeling', 'non-weight-bearing', 'no-kneeling', ''],
			['kneeling', 'single-leg-standing']
		);
		expect(conflicts.map((c) => c.reason)).toEqual([
			'No kneeling. This exercise needs kneeling.',
			'Non-weight-bearing on the operated leg. This exercise needs kneeling: kneeling takes weight through the leg.',
			'Non-weight-bearing on the operated leg. This exercise stands on one leg: that puts all the weight through one leg.'
		]);
	});

	it('finds nothing when the precautions do not touch the exercise', () => {
		expect(precautionConflicts(['biceps-repair'], ['shoulder-above-90'])).toEqual([]);
		expect(precautionConflicts([], ['kneeling'])).toEqual([]);
		expect(precautionConflicts(['no-kneeling'], [])).toEqual([]);
	});

	it('matches free text with free text only, word for word', () => {
		const conflicts = precautionConflicts(
			['No overhead reaching'],
			['no overhead  reaching', 'overhead']
		);
		expect(conflicts).toEqual([
			{
				precaution: { kind: 'free', text: 'No overhead reaching', label: 'No overhead reaching' },
				tag: { kind: 'free', text: 'no overhead  reaching', label: 'no overhead  reaching' },
				reason:
					"The patient's precaution “No overhead reaching” matches this exercise's tag “no overhead  reaching”."
			}
		]);
		// Free text never matches a vocabulary entry by accident of wording.
		expect(precautionConflicts(['needs kneeling'], ['kneeling'])).toEqual([]);
	});

	it('keeps a vocabulary whose every conflict names real entries', () => {
		for (const [precaution, tags] of Object.entries(CONFLICTS)) {
			expect(Object.keys(PRECAUTIONS)).toContain(precaution);
			for (const tag of Object.keys(tags)) expect(Object.keys(EXERCISE_TAGS)).toContain(tag);
		}
		expect(Object.keys(CONFLICTS).sort()).toEqual(Object.keys(PRECAUTIONS).sort());
		expect(resolveTag('hasOwnProperty').kind).toBe('free');
		expect(resolvePrecaution('No lying face down')).toMatchObject({
			kind: 'known',
			id: 'no-prone-lying'
		});
	});
});

describe('the movement type drives conflicts too', () => {
	it('an active shoulder exercise clashes with "passive motion only" with no tag on it', () => {
		// Common practice after a rotator cuff repair: protected passive motion first.
		const conflicts = precautionConflicts(['rotator-cuff-repair-passive-only'], [], {
			movementType: 'active',
			bodyRegion: 'Shoulder'
		});
		expect(conflicts).toHaveLength(1);
		expect(conflicts[0].fromMovementType).toBe('active');
		expect(conflicts[0].reason).toBe(
			'Rotator cuff repair: passive motion only on the operated side. This exercise is marked active, so it needs active shoulder motion: moving the shoulder with its own muscles works the repaired tendon.'
		);
		for (const movementType of ['active-assisted', 'resisted'] as const) {
			expect(
				precautionConflicts(['rotator-cuff-repair-passive-only'], [], {
					movementType,
					bodyRegion: 'shoulder'
				}).length
			).toBeGreaterThan(0);
		}
	});

	it('a passive shoulder exercise, or an active one elsewhere, does not', () => {
		const precautions = ['rotator-cuff-repair-passive-only'];
		expect(
			precautionConflicts(precautions, [], { movementType: 'passive', bodyRegion: 'Shoulder' })
		).toEqual([]);
		expect(
			precautionConflicts(precautions, [], { movementType: 'active', bodyRegion: 'Knee' })
		).toEqual([]);
	});

	it('a resisted exercise works against a load, whatever its tags say', () => {
		const conflicts = precautionConflicts(['no-added-load'], [], {
			movementType: 'resisted',
			bodyRegion: 'Knee'
		});
		expect(conflicts.map((c) => c.tag)).toEqual([
			{ kind: 'known', id: 'added-load', label: 'uses a weight or resistance band' }
		]);
	});

	it('does not list a clash twice when the tag was also set by hand', () => {
		const conflicts = precautionConflicts(
			['rotator-cuff-repair-passive-only'],
			['active-shoulder-motion'],
			{ movementType: 'active', bodyRegion: 'Shoulder' }
		);
		expect(conflicts).toHaveLength(1);
		expect(conflicts[0].fromMovementType).toBeUndefined();
	});

	it('knows what the shoulder needs: supination and lifting after a biceps repair, reaching behind after a cuff repair', () => {
		expect(
			precautionConflicts(['biceps-repair'], ['active-forearm-supination', 'lifting']).length
		).toBe(2);
		expect(
			precautionConflicts(
				['rotator-cuff-repair-passive-only'],
				['hand-behind-back', 'shoulder-extension-behind-body']
			).length
		).toBe(2);
	});
});

describe('precautions with an end and degrees', () => {
	const op = '2026-11-02';
	const details = {
		'biceps-repair': { degrees: null, untilWeek: 6, untilDate: null },
		'shoulder-external-rotation-limit': { degrees: 20, untilWeek: null, untilDate: '2026-12-20' }
	};
	const precautions = ['biceps-repair', 'shoulder-external-rotation-limit', 'falls-risk'];

	it('keeps a precaution until its week after the operation has begun (completed weeks, as phase tables count)', () => {
		expect(precautionsOn(precautions, details, op, '2026-12-13')).toEqual(precautions);
		expect(precautionsOn(precautions, details, op, '2026-12-14')).toEqual([
			'shoulder-external-rotation-limit',
			'falls-risk'
		]);
		expect(precautionsOn(precautions, details, op, '2026-12-21')).toEqual(['falls-risk']);
		// With no operation date the week cannot be placed: the precaution holds.
		expect(precautionsOn(precautions, details, null, '2027-06-01')).toContain('biceps-repair');
	});

	it('says the degrees and the end in words, by label', () => {
		const day = (d: string) => `[${d}]`;
		expect(describePrecaution('shoulder-external-rotation-limit', details, op, day)).toBe(
			'Shoulder: limit outward rotation (20°), until [2026-12-20]'
		);
		expect(describePrecaution('biceps-repair', details, op, day)).toBe(
			'Biceps repair: no active elbow flexion, until [2026-12-13]'
		);
		expect(describePrecaution('biceps-repair', details, null, day)).toBe(
			'Biceps repair: no active elbow flexion, until week 6 after the operation'
		);
		expect(describePrecaution('Watch the wound', {}, op, day)).toBe('Watch the wound');
	});

	it('refuses details that cannot be stored, in words', () => {
		expect(precautionDetailSchema.safeParse({ degrees: 20.5 }).error?.issues[0].message).toBe(
			'Give whole degrees, e.g. 20.'
		);
		expect(precautionDetailSchema.parse({})).toEqual({
			degrees: null,
			untilWeek: null,
			untilDate: null
		});
	});
});

describe('range targets and limits against a precaution’s degrees', () => {
	it('flags a target past the precaution’s degrees, the clinician’s own degrees first', () => {
		const details = {
			'shoulder-external-rotation-limit': { degrees: 20, untilWeek: null, untilDate: null }
		};
		expect(
			rangeClashes(['shoulder-external-rotation-limit'], details, [
				{ motion: 'shoulder-external-rotation', kind: 'target', degrees: 45 }
			])
		).toEqual([
			'The target of 45° goes past the precaution “Shoulder: limit outward rotation” (20°).'
		]);
		// The 90° in a precaution's own words applies when no degrees were given.
		expect(
			rangeClashes(['shoulder-elevation-limit-90'], {}, [
				{ motion: 'shoulder-flexion', kind: 'limit', degrees: 120 },
				{ motion: 'shoulder-flexion', kind: 'target', degrees: 90 }
			])
		).toHaveLength(1);
		// No degrees anywhere: nothing to compare.
		expect(
			rangeClashes(['shoulder-external-rotation-limit'], {}, [
				{ motion: 'shoulder-external-rotation', kind: 'target', degrees: 45 }
			])
		).toEqual([]);
	});
});
