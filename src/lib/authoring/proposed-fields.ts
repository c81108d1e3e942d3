/**
 * The fields of the drafts-from-narration form and their names, apart from ./exercise-proposals
 * so the page that draws the form loads none of the exercise schema (drizzle-zod) with them.
 */
import { DOSAGE_FIELDS } from '$lib/dosage/types';

/** The exercise form fields a narration can fill. */
export const PROPOSED_FIELDS = [
	'title',
	'bodyRegion',
	'position',
	'movementType',
	'side',
	'equipment',
	'safetyNotes',
	...DOSAGE_FIELDS
] as const;
export type ProposedField = (typeof PROPOSED_FIELDS)[number];

/** The form name of a row's field: `row-<index>-<field>` (dosage fields as `row-<i>-dosage.sets`). */
export function rowFieldName(index: number, field: ProposedField): string {
	return (DOSAGE_FIELDS as readonly string[]).includes(field)
		? `row-${index}-dosage.${field}`
		: `row-${index}-${field}`;
}
