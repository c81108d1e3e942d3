/**
 * Exercises made from a recording's segments in one step: each ready segment's narration (its
 * captions, as patients are shown them) proposes the exercise, the clinician reviews the rows,
 * and only the rows they tick are made — all or none, as drafts unless the clinician ticks
 * "ready for programmes" on the same page (the exercise form's own checks apply either way).
 */
import { and, eq, inArray, isNull } from 'drizzle-orm';
import { draftExercise } from '$lib/authoring/exercise-draft';
import { proposalRow, type ProposalRow } from '$lib/authoring/exercise-proposals';
import { vocabularyFor } from '$lib/authoring/vocabulary';
import { parseDraft, type ExerciseDraft } from '$lib/exercises/form';
import type { Principal } from '../auth/principal';
import { db } from '../db';
import { exercises, segments, type Exercise, type Recording } from '../db/schema';
import { segmentCaptions } from '../segments';
import { createExercise } from './index';

/** The most segments one recording's page proposes exercises for. */
export const MAX_PROPOSAL_ROWS = 30;

export interface SegmentProposal {
	row: ProposalRow;
	status: 'cutting' | 'ready' | 'failed';
	/** Exercises of the clinic already made from this segment. */
	existing: { id: string; title: string }[];
}

/** A proposal for each of the recording's current segments, in order. */
export function segmentProposals(recording: Recording): SegmentProposal[] {
	const rows = db()
		.select()
		.from(segments)
		.where(
			and(
				eq(segments.recordingId, recording.id),
				eq(segments.clinicId, recording.clinicId),
				isNull(segments.supersededAt)
			)
		)
		.orderBy(segments.position)
		.limit(MAX_PROPOSAL_ROWS)
		.all();
	const made = rows.length
		? db()
				.select({ id: exercises.id, title: exercises.title, segmentId: exercises.segmentId })
				.from(exercises)
				.where(
					and(
						eq(exercises.clinicId, recording.clinicId),
						inArray(
							exercises.segmentId,
							rows.map((r) => r.id)
						)
					)
				)
				.all()
		: [];
	return rows.map((segment) => {
		const captions = segmentCaptions(segment);
		const narration = draftExercise(captions.cues, vocabularyFor(captions.language));
		return {
			row: proposalRow(segment, narration),
			status: segment.status,
			existing: made
				.filter((e) => e.segmentId === segment.id)
				.map((e) => ({ id: e.id, title: e.title }))
		};
	});
}

export type MadeExercises =
	| { ok: true; created: Exercise[] }
	| { ok: false; problems: { row: number; path: string; message: string }[] };

/**
 * Makes the ticked rows as exercises (drafts, or ready when asked), all or none. Each row must
 * name one of this recording's current, ready segments, and pass the exercise form's own checks.
 */
export function makeExercisesFromSegments(
	clinician: Principal,
	recording: Recording,
	rows: { make: boolean; draft: ExerciseDraft }[],
	/** Ready for programmes at once when the clinician says so; drafts otherwise. */
	exerciseStatus: 'draft' | 'ready' = 'draft'
): MadeExercises {
	const offered = new Map(
		segmentProposals(recording).map((p) => [p.row.segmentId, p.status] as const)
	);
	const problems: { row: number; path: string; message: string }[] = [];
	const inputs: Parameters<typeof createExercise>[1][] = [];
	rows.forEach((row, index) => {
		if (!row.make) return;
		const segmentStatus = offered.get(row.draft.segmentId);
		if (segmentStatus !== 'ready') {
			problems.push({
				row: index,
				path: 'segmentId',
				message:
					segmentStatus === undefined
						? 'This segment is no longer one of the recording’s segments.'
						: 'This segment is not cut yet; make its exercise once it is ready.'
			});
			return;
		}
		const parsed = parseDraft({ ...row.draft, status: exerciseStatus });
		if (!parsed.ok) {
			for (const p of parsed.problems) problems.push({ row: index, ...p });
			return;
		}
		inputs.push(parsed.input);
	});
	if (problems.length > 0) return { ok: false, problems };
	if (inputs.length === 0) {
		return {
			ok: false,
			problems: [{ row: -1, path: '', message: 'Tick at least one segment to make its exercise.' }]
		};
	}
	const created = db().transaction(() => inputs.map((input) => createExercise(clinician, input)));
	return { ok: true, created };
}
