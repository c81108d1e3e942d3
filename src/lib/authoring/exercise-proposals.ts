/**
 * Draft exercises for the segments of one recording, as a form the clinician reviews before
 * anything is saved: the narration's proposals fill the exercise form's fields, each with the
 * caption words it came from; what the narration did not say keeps the new-exercise defaults,
 * and a vague amount ("a few times a day") is left blank with the words, for the clinician to
 * settle. Pure: the server reads the segments' captions, the page shows the rows.
 */
import { DOSAGE_FIELDS, type DosageField } from '$lib/dosage/types';
import { newExerciseDraft, type ExerciseDraft as ExerciseFormDraft } from '$lib/exercises/form';
import { PROPOSED_FIELDS, rowFieldName, type ProposedField } from './proposed-fields';
import type { ExerciseDraft as NarrationDraft, Proposal } from './exercise-draft';

/** One segment's draft exercise as a form row. */
export interface ProposalRow {
	segmentId: string;
	segmentTitle: string;
	/** The exercise form's fields, filled from the narration where it said something. */
	draft: ExerciseFormDraft;
	/** The caption words each filled field came from. */
	from: Partial<Record<ProposedField, string>>;
	/** Dosage fields said as a range: the words and the range, left blank to choose. */
	settle: Partial<Record<DosageField, string>>;
}

/** The caption words of a proposal: "lying on your back", or several joined with " … ". */
export function wordsOf(proposal: Proposal<unknown>): string {
	return proposal.from.map((s) => s.words).join(' … ');
}

/**
 * A segment's form row from what its narration proposes. The title falls back to the segment's
 * own name (the clinician named it when confirming segments), the rest to the form's defaults.
 */
export function proposalRow(
	segment: { id: string; title: string },
	narration: NarrationDraft
): ProposalRow {
	const draft = newExerciseDraft(segment.id);
	const from: ProposalRow['from'] = {};
	const settle: ProposalRow['settle'] = {};
	const take = <T>(field: ProposedField, proposal: Proposal<T> | null, set: (v: T) => void) => {
		if (!proposal) return;
		set(proposal.value);
		from[field] = wordsOf(proposal);
	};
	draft.title = segment.title;
	take('title', narration.title, (v) => (draft.title = v));
	take('bodyRegion', narration.bodyRegion, (v) => (draft.bodyRegion = v));
	take('position', narration.position, (v) => (draft.position = v));
	take('movementType', narration.movementType, (v) => (draft.movementType = v));
	take('side', narration.side, (v) => (draft.side = v));
	if (narration.equipment.length > 0) {
		draft.equipment = narration.equipment.map((e) => e.value).join(', ');
		from.equipment = narration.equipment.map(wordsOf).join(' … ');
	}
	if (narration.safetyNotes) {
		draft.safetyNotes = narration.safetyNotes.markdown;
		from.safetyNotes = narration.safetyNotes.notes.map(wordsOf).join(' … ');
	}
	for (const field of DOSAGE_FIELDS) {
		const proposal = narration.dosage[field];
		if (!proposal) continue;
		from[field] = wordsOf(proposal);
		if (proposal.value.kind === 'exact') {
			draft.dosage[field] = String(proposal.value.value);
		} else {
			draft.dosage[field] = '';
			settle[field] = `Said as ${proposal.value.min}–${proposal.value.max}: choose a number.`;
		}
	}
	return { segmentId: segment.id, segmentTitle: segment.title, draft, from, settle };
}

/**
 * The rows a form posted: each row's segment, whether to make it, and its fields, on top of the
 * new-exercise defaults (the fields this page does not show keep them). At most `maxRows`.
 */
export function rowsFromForm(
	form: FormData,
	maxRows: number
): { make: boolean; draft: ExerciseFormDraft }[] {
	const get = (name: string) => {
		const v = form.get(name);
		return typeof v === 'string' ? v : '';
	};
	const count = Math.min(Math.max(0, Number(get('rowCount')) || 0), maxRows);
	return Array.from({ length: count }, (_, i) => {
		const draft = newExerciseDraft(get(`row-${i}-segmentId`));
		for (const field of PROPOSED_FIELDS) {
			const value = get(rowFieldName(i, field));
			if ((DOSAGE_FIELDS as readonly string[]).includes(field)) {
				draft.dosage[field as DosageField] = value;
			} else {
				draft[field as Exclude<ProposedField, DosageField>] = value;
			}
		}
		return { make: get(`row-${i}-make`) === 'on', draft };
	});
}
