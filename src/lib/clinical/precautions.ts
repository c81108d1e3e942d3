/**
 * Precaution conflicts: a patient's precautions against an exercise's precaution tags. A small
 * vocabulary in our own plain words covers the common post-operative cases; anything else is free
 * text, and a free-text precaution conflicts with a tag of the same words. An exercise's movement
 * type adds tags of its own (`impliedTags`), so "active" at the shoulder clashes with "passive
 * motion only" even when nobody tagged it. Conflicts are warnings
 * for the clinician, who also judges which side an exercise works and whether it applies.
 */
import { z } from 'zod';
import { MOVEMENT_LABELS, type MovementType } from '../exercises/vocabulary';
import type { LocalDate } from './calendar';
import type { MotionId } from './rom';
import { holdsOn, lastDay, untilSchema } from './until';

/** What an exercise asks of the body, as tags on the exercise. */
export const EXERCISE_TAGS = {
	'active-elbow-flexion': 'needs active elbow flexion',
	'active-shoulder-motion': 'needs active shoulder motion',
	'shoulder-above-90': 'raises the arm above shoulder height (90°)',
	'shoulder-external-rotation': 'turns the arm outward (external rotation)',
	'weight-through-arm': 'puts weight through the arm',
	'added-load': 'uses a weight or resistance band',
	'full-weight-bearing': 'needs full weight through the leg',
	'single-leg-standing': 'stands on one leg',
	'standing-balance': 'needs standing balance without holding on',
	'knee-flexion-beyond-90': 'bends the knee beyond 90°',
	kneeling: 'needs kneeling',
	'hip-flexion-beyond-90': 'bends the hip beyond 90°',
	'hip-adduction-past-midline': 'brings the leg across the middle of the body',
	'hip-internal-rotation': 'turns the hip inward',
	'lying-prone': 'is done lying face down (prone)',
	'active-forearm-supination': 'turns the palm up with its own muscles (active supination)',
	'hand-behind-back': 'reaches the hand up behind the back',
	'shoulder-extension-behind-body': 'takes the arm back behind the body',
	lifting: 'lifts or carries something'
} as const;

export type ExerciseTag = keyof typeof EXERCISE_TAGS;

/** Precautions a clinician records for a patient. */
export const PRECAUTIONS = {
	'biceps-repair': 'Biceps repair: no active elbow flexion',
	'rotator-cuff-repair-passive-only':
		'Rotator cuff repair: passive motion only on the operated side',
	'shoulder-elevation-limit-90': 'Shoulder: keep the arm at or below shoulder height (90°)',
	'shoulder-external-rotation-limit': 'Shoulder: limit outward rotation',
	'no-weight-through-arm': 'No weight through the operated arm',
	'no-added-load': 'No weights or resistance yet',
	'non-weight-bearing': 'Non-weight-bearing on the operated leg',
	'partial-weight-bearing': 'Partial weight-bearing on the operated leg',
	'falls-risk': 'Falls risk: hold on to support when standing',
	'knee-flexion-limit-90': 'Knee: bend no further than 90°',
	'no-kneeling': 'No kneeling',
	'posterior-hip-precautions':
		'Hip replacement (posterior approach): no bending past 90°, no crossing the legs, no turning the hip inward',
	'no-prone-lying': 'No lying face down'
} as const;

export type PrecautionId = keyof typeof PRECAUTIONS;

/** Which tags each precaution conflicts with, and why ('' where the clash speaks for itself). */
export const CONFLICTS: Record<PrecautionId, Partial<Record<ExerciseTag, string>>> = {
	'biceps-repair': {
		'active-elbow-flexion': 'bending the elbow with its own muscles works the repaired biceps',
		'active-forearm-supination': 'turning the palm up works the repaired biceps',
		'added-load': 'a load in the hand makes the biceps work',
		lifting: 'lifting makes the biceps work'
	},
	'rotator-cuff-repair-passive-only': {
		'active-shoulder-motion': 'moving the shoulder with its own muscles works the repaired tendon',
		'weight-through-arm': 'taking weight through the arm loads the repair',
		'added-load': 'a weight or band loads the repair',
		lifting: 'lifting loads the repair',
		'hand-behind-back': 'reaching behind the back stretches the repaired tendon',
		'shoulder-extension-behind-body': 'taking the arm back stretches the front of the shoulder'
	},
	'shoulder-elevation-limit-90': {
		'shoulder-above-90': ''
	},
	'shoulder-external-rotation-limit': {
		'shoulder-external-rotation': 'check the range against the limit set'
	},
	'no-weight-through-arm': {
		'weight-through-arm': ''
	},
	'no-added-load': {
		'added-load': '',
		lifting: ''
	},
	'non-weight-bearing': {
		'full-weight-bearing': '',
		'single-leg-standing': 'that puts all the weight through one leg',
		kneeling: 'kneeling takes weight through the leg'
	},
	'partial-weight-bearing': {
		'full-weight-bearing': '',
		'single-leg-standing': 'that puts all the weight through one leg'
	},
	'falls-risk': {
		'standing-balance': '',
		'single-leg-standing': 'that risks a fall'
	},
	'knee-flexion-limit-90': {
		'knee-flexion-beyond-90': '',
		kneeling: 'kneeling bends the knee past 90°'
	},
	'no-kneeling': {
		kneeling: ''
	},
	'posterior-hip-precautions': {
		'hip-flexion-beyond-90': '',
		'hip-adduction-past-midline': '',
		'hip-internal-rotation': ''
	},
	'no-prone-lying': {
		'lying-prone': ''
	}
};

/** One precaution or tag, resolved: a vocabulary entry, or free text kept as written. */
export type Resolved<Id extends string> =
	| { kind: 'known'; id: Id; label: string }
	| { kind: 'free'; text: string; label: string };

/** Free text is compared trimmed, with runs of spaces as one and without regard to case. */
export function normaliseFreeText(text: string): string {
	return text.trim().replace(/\s+/g, ' ').toLowerCase();
}

function resolver<Id extends string>(vocabulary: Record<Id, string>) {
	const byLabel = new Map<string, Id>();
	for (const id of Object.keys(vocabulary) as Id[]) {
		byLabel.set(normaliseFreeText(vocabulary[id]), id);
	}
	return (text: string): Resolved<Id> => {
		const id = Object.hasOwn(vocabulary, text)
			? (text as Id)
			: byLabel.get(normaliseFreeText(text));
		if (id !== undefined) return { kind: 'known', id, label: vocabulary[id] };
		return { kind: 'free', text: text.trim(), label: text.trim() };
	};
}

/** A stored precaution (an id, a vocabulary label, or free text) resolved against the vocabulary. */
export const resolvePrecaution = resolver<PrecautionId>(PRECAUTIONS);

/** A stored exercise tag (an id, a vocabulary label, or free text) resolved against the vocabulary. */
export const resolveTag = resolver<ExerciseTag>(EXERCISE_TAGS);

/** One clash between a patient's precaution and an exercise's tag. */
export interface PrecautionConflict {
	precaution: Resolved<PrecautionId>;
	tag: Resolved<ExerciseTag>;
	/** A sentence for the clinician. */
	reason: string;
	/** Set when the tag came from the exercise's movement type rather than from its tags. */
	fromMovementType?: MovementType;
}

/**
 * Tags an exercise carries by its movement type, whether or not anyone also tagged it: any
 * movement but passive at the shoulder moves it with its own muscles (so it clashes with
 * "passive motion only"), and a resisted exercise works against a load.
 */
export function impliedTags(movementType: MovementType, bodyRegion: string): ExerciseTag[] {
	const tags: ExerciseTag[] = [];
	if (movementType !== 'passive' && /shoulder/i.test(bodyRegion))
		tags.push('active-shoulder-motion');
	if (movementType === 'resisted') tags.push('added-load');
	return tags;
}

/** Shown with conflicts: the product flags; the clinician decides. */
export const PRECAUTION_CAUTION =
	'A reminder, not a rule: the treating clinician and the surgeon’s protocol decide what is safe for this patient.';

/**
 * Every conflict between a patient's precautions and an exercise's tags, in the patient's order:
 * vocabulary pairs from CONFLICTS, and free text matching free text (see `normaliseFreeText`).
 */
export function precautionConflicts(
	patientPrecautions: readonly string[],
	exerciseTags: readonly string[],
	movement?: { movementType: MovementType; bodyRegion: string }
): PrecautionConflict[] {
	const tagged = exerciseTags.filter((t) => t.trim() !== '').map(resolveTag);
	const taggedIds = new Set(tagged.flatMap((t) => (t.kind === 'known' ? [t.id] : [])));
	const implied = movement
		? impliedTags(movement.movementType, movement.bodyRegion)
				.filter((id) => !taggedIds.has(id))
				.map((id) => ({ ...resolveTag(id), implied: true as const }))
		: [];
	const tags: (Resolved<ExerciseTag> & { implied?: true })[] = [...tagged, ...implied];
	const conflicts: PrecautionConflict[] = [];
	const seen = new Set<string>();
	for (const raw of patientPrecautions) {
		if (raw.trim() === '') continue;
		const precaution = resolvePrecaution(raw);
		for (const tag of tags) {
			let reason: string | undefined;
			if (precaution.kind === 'known' && tag.kind === 'known') {
				const why = CONFLICTS[precaution.id][tag.id];
				if (why !== undefined) {
					const what =
						tag.implied && movement
							? `is marked ${MOVEMENT_LABELS[movement.movementType].toLowerCase()}, so it ${tag.label}`
							: tag.label;
					reason = `${precaution.label}. This exercise ${what}${why ? `: ${why}` : ''}.`;
				}
			} else if (
				precaution.kind === 'free' &&
				tag.kind === 'free' &&
				normaliseFreeText(precaution.text) === normaliseFreeText(tag.text)
			) {
				reason = `The patient's precaution “${precaution.label}” matches this exercise's tag “${tag.label}”.`;
			}
			const key = `${precaution.label}\u0000${tag.label}`;
			if (reason && !seen.has(key)) {
				seen.add(key);
				const { implied, ...resolved } = tag;
				conflicts.push({
					precaution,
					tag: resolved,
					reason,
					...(implied && movement ? { fromMovementType: movement.movementType } : {})
				});
			}
		}
	}
	return conflicts;
}

/** What a precaution may carry beyond its words: an end, and degrees where it limits a range. */
export const precautionDetailSchema = z
	.object({
		degrees: z
			.number()
			.int('Give whole degrees, e.g. 20.')
			.min(0, 'Degrees cannot be below 0.')
			.max(180, 'Degrees cannot be above 180.')
			.nullable()
			.default(null)
	})
	.and(untilSchema);

export type PrecautionDetail = z.output<typeof precautionDetailSchema>;

/** Details stored for each precaution, keyed by the precaution as stored. */
export const precautionDetailsSchema = z.record(z.string(), precautionDetailSchema);

const NO_DETAIL: PrecautionDetail = { degrees: null, untilWeek: null, untilDate: null };

/** The detail of a precaution, or none. */
export function detailOf(
	details: Readonly<Record<string, PrecautionDetail>>,
	precaution: string
): PrecautionDetail {
	return Object.hasOwn(details, precaution) ? details[precaution] : NO_DETAIL;
}

/** The precautions that still hold on a date: those with no end, or whose end has not passed. */
export function precautionsOn(
	precautions: readonly string[],
	details: Readonly<Record<string, PrecautionDetail>>,
	operationDate: LocalDate | null,
	date: LocalDate
): string[] {
	return precautions.filter((p) => holdsOn(detailOf(details, p), operationDate, date));
}

/**
 * A precaution in words with its degrees and end: "Shoulder: limit outward rotation (20°), until
 * Sunday 13 December". `formatDay` writes a date the way the screen does.
 */
export function describePrecaution(
	precaution: string,
	details: Readonly<Record<string, PrecautionDetail>>,
	operationDate: LocalDate | null,
	formatDay: (date: LocalDate) => string
): string {
	const detail = detailOf(details, precaution);
	const degrees = detail.degrees !== null ? ` (${detail.degrees}°)` : '';
	const last = lastDay(detail, operationDate);
	const end =
		last !== null
			? `, until ${formatDay(last)}`
			: detail.untilWeek !== null
				? `, until week ${detail.untilWeek} after the operation`
				: '';
	return `${resolvePrecaution(precaution).label}${degrees}${end}`;
}

/**
 * Precautions that limit a motion's range, with the degrees their words carry (the 90° ones) —
 * a clinician's own degrees on the precaution win.
 */
export const PRECAUTION_RANGES: Partial<
	Record<PrecautionId, { motions: readonly MotionId[]; degrees: number | null }>
> = {
	'shoulder-elevation-limit-90': {
		motions: ['shoulder-flexion', 'shoulder-abduction'],
		degrees: 90
	},
	'shoulder-external-rotation-limit': { motions: ['shoulder-external-rotation'], degrees: null },
	'knee-flexion-limit-90': { motions: ['knee-flexion'], degrees: 90 }
};

/**
 * A range target or limit set beyond what a holding precaution allows for the same motion, as a
 * sentence for the clinician (e.g. a target of 45° of outward rotation against a 20° limit).
 */
export function rangeClashes(
	precautions: readonly string[],
	details: Readonly<Record<string, PrecautionDetail>>,
	guides: readonly { motion: MotionId; kind: 'target' | 'limit'; degrees: number }[]
): string[] {
	const clashes: string[] = [];
	for (const raw of precautions) {
		const precaution = resolvePrecaution(raw);
		if (precaution.kind !== 'known') continue;
		const range = PRECAUTION_RANGES[precaution.id];
		const degrees = detailOf(details, raw).degrees ?? range?.degrees ?? null;
		if (!range || degrees === null) continue;
		for (const guide of guides) {
			if (range.motions.includes(guide.motion) && guide.degrees > degrees) {
				clashes.push(
					`The ${guide.kind} of ${guide.degrees}° goes past the precaution “${precaution.label}” (${degrees}°).`
				);
			}
		}
	}
	return clashes;
}
