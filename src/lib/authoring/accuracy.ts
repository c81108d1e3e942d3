/**
 * How well drafts match what a physiotherapist would have filled in, field by field. For a
 * one-value field: a proposal that is present and right is a true positive, present and wrong a
 * false positive, missing where a value was expected a false negative, and absent where none was
 * expected a true negative. Equipment and safety notes count each item: a proposed item that is
 * expected is a true positive, one that is not a false positive, an expected item not proposed a
 * false negative, and nothing proposed where nothing was expected a true negative.
 */
import { DOSAGE_FIELDS, type DosageField } from '$lib/dosage/types';
import type { ExerciseSide, MovementType, Position } from '$lib/exercises/vocabulary';
import type { DraftAmount, ExerciseDraft } from './exercise-draft';
import { matchingForm } from './transcript';

/** A dosage number as a clinician would settle it from the narration: one value or a range. */
export type ExpectedAmount = number | { min: number; max: number };

/** What a physiotherapist would fill in from one narration; a missing field is not said. */
export interface ExpectedExercise {
	title?: string;
	bodyRegion?: string;
	position?: Position;
	equipment?: string[];
	movementType?: MovementType;
	side?: ExerciseSide;
	dosage?: Partial<Record<DosageField, ExpectedAmount>>;
	/** Short quotes of the cautions said; each should appear in one drafted note. */
	safetyNotes?: string[];
}

export const DRAFT_FIELDS = [
	'title',
	'bodyRegion',
	'position',
	'equipment',
	'movementType',
	'side',
	...DOSAGE_FIELDS,
	'safetyNotes'
] as const;
export type DraftField = (typeof DRAFT_FIELDS)[number];

export interface FieldCounts {
	truePositives: number;
	falsePositives: number;
	falseNegatives: number;
	trueNegatives: number;
}

export interface FieldScore extends FieldCounts {
	/** True positives over all proposals; null when nothing was proposed. */
	precision: number | null;
	/** True positives over true positives and misses; null when nothing was expected. */
	recall: number | null;
}

const zero = (): FieldCounts => ({
	truePositives: 0,
	falsePositives: 0,
	falseNegatives: 0,
	trueNegatives: 0
});

/** Text compared without case, punctuation or spacing differences. */
const comparable = (text: string) =>
	matchingForm(text)
		.replace(/[^\p{L}\p{N}' ]+/gu, ' ')
		.replace(/\s+/g, ' ')
		.trim();

function single<P, E>(
	proposed: P | undefined,
	expected: E | undefined,
	same: (proposed: P, expected: E) => boolean
): FieldCounts {
	const counts = zero();
	if (proposed === undefined && expected === undefined) counts.trueNegatives++;
	else if (proposed === undefined) counts.falseNegatives++;
	else if (expected !== undefined && same(proposed, expected)) counts.truePositives++;
	else counts.falsePositives++;
	return counts;
}

const sameAmount = (proposed: DraftAmount, expected: ExpectedAmount) =>
	typeof expected === 'number'
		? proposed.kind === 'exact' && proposed.value === expected
		: proposed.kind === 'range' && proposed.min === expected.min && proposed.max === expected.max;

function equipmentCounts(proposed: readonly string[], expected: readonly string[]): FieldCounts {
	const counts = zero();
	const want = new Set(expected.map(comparable));
	const got = new Set(proposed.map(comparable));
	if (want.size === 0 && got.size === 0) counts.trueNegatives++;
	for (const item of got) {
		if (want.has(item)) counts.truePositives++;
		else counts.falsePositives++;
	}
	for (const item of want) if (!got.has(item)) counts.falseNegatives++;
	return counts;
}

function safetyNoteCounts(notes: readonly string[], quotes: readonly string[]): FieldCounts {
	const counts = zero();
	const bullets = notes.map(comparable);
	const wanted = quotes.map(comparable);
	if (bullets.length === 0 && wanted.length === 0) counts.trueNegatives++;
	for (const quote of wanted) {
		if (bullets.some((b) => b.includes(quote))) counts.truePositives++;
		else counts.falseNegatives++;
	}
	// A note that holds none of the expected quotes is a proposal nobody asked for.
	for (const bullet of bullets)
		if (!wanted.some((q) => bullet.includes(q))) counts.falsePositives++;
	return counts;
}

/** The counts for one draft against one expected answer. */
export function compareDraft(
	draft: ExerciseDraft,
	expected: ExpectedExercise
): Record<DraftField, FieldCounts> {
	const text = (a: string, b: string) => comparable(a) === comparable(b);
	const exactly = <T>(a: T, b: T) => a === b;
	const dosage = Object.fromEntries(
		DOSAGE_FIELDS.map((field) => [
			field,
			single(draft.dosage[field]?.value, expected.dosage?.[field], sameAmount)
		])
	) as Record<DosageField, FieldCounts>;
	return {
		...dosage,
		title: single(draft.title?.value, expected.title, text),
		bodyRegion: single(draft.bodyRegion?.value, expected.bodyRegion, text),
		position: single(draft.position?.value, expected.position, exactly),
		equipment: equipmentCounts(
			draft.equipment.map((e) => e.value),
			expected.equipment ?? []
		),
		movementType: single(draft.movementType?.value, expected.movementType, exactly),
		side: single(draft.side?.value, expected.side, exactly),
		safetyNotes: safetyNoteCounts(
			draft.safetyNotes?.notes.map((n) => n.value) ?? [],
			expected.safetyNotes ?? []
		)
	};
}

/** Counts summed over many drafts, with precision and recall per field. */
export function scoreDrafts(
	pairs: readonly { draft: ExerciseDraft; expected: ExpectedExercise }[]
): Record<DraftField, FieldScore> {
	const totals = Object.fromEntries(DRAFT_FIELDS.map((f) => [f, zero()])) as Record<
		DraftField,
		FieldCounts
	>;
	for (const { draft, expected } of pairs) {
		const counts = compareDraft(draft, expected);
		for (const field of DRAFT_FIELDS) {
			for (const key of Object.keys(totals[field]) as (keyof FieldCounts)[]) {
				totals[field][key] += counts[field][key];
			}
		}
	}
	const ratio = (part: number, whole: number) => (whole === 0 ? null : part / whole);
	return Object.fromEntries(
		DRAFT_FIELDS.map((field) => {
			const c = totals[field];
			const score: FieldScore = {
				...c,
				precision: ratio(c.truePositives, c.truePositives + c.falsePositives),
				recall: ratio(c.truePositives, c.truePositives + c.falseNegatives)
			};
			return [field, score];
		})
	) as Record<DraftField, FieldScore>;
}
