/**
 * Submissions to the public library: a clinician freezes one of their clinic's exercises (its
 * segment, captions, dosage and words) with consent and a licence, and it waits for an
 * educator. Educators review submissions from every clinic — the library is shared — but see
 * only what was submitted: never the clinic's patients, recordings or other exercises.
 */
import { dosageOf } from '$lib/dosage';
import { and, asc, desc, eq, inArray, ne } from 'drizzle-orm';
import { diffCues, type CueDiff } from '$lib/captions/diff';
import { LIBRARY_FIELDS, pickFields } from '$lib/exercises/columns';
import { computeCaptionChecklist, computeChecklist, type Checklist } from '$lib/library/checklist';
import type {
	ExerciseSnapshot,
	Licence,
	SubmissionKind,
	SubmissionStatus
} from '$lib/library/types';
import { db } from '../db';
import { segmentCaptions, type SegmentCaptions } from '../segments';
import { clipShape } from '../sessions';
import {
	clinics,
	exercises,
	libraryExercises,
	libraryReviews,
	librarySubmissions,
	libraryVersions,
	segments,
	users,
	type Exercise,
	type LibraryExercise,
	type LibraryReview,
	type LibrarySubmission,
	type LibraryVersion,
	type SegmentRow
} from '../db/schema';

/** A refusal the caller can show as it is; `status` is the HTTP status to answer. */
export class LibraryError extends Error {
	constructor(
		readonly status: number,
		message: string
	) {
		super(message);
	}
}

/** Submissions an educator still has to decide. */
export const OPEN_STATUSES: SubmissionStatus[] = ['waiting'];

/** The exercise of the clinic, with its segment (null when it has none), or null. */
export function findClinicExercise(
	clinicId: string,
	exerciseId: string
): { exercise: Exercise; segment: SegmentRow | null } | null {
	const row = db()
		.select({ exercise: exercises, segment: segments })
		.from(exercises)
		.leftJoin(
			segments,
			and(eq(segments.id, exercises.segmentId), eq(segments.clinicId, exercises.clinicId))
		)
		.where(and(eq(exercises.id, exerciseId), eq(exercises.clinicId, clinicId)))
		.get();
	return row ? { exercise: row.exercise, segment: row.segment } : null;
}

/** The words a clinician may adjust for the public on the submission form. */
export interface PublicWording {
	title: string;
	description: string;
	coachingCues: string[];
	safetyNotes: string;
}

/**
 * The exercise frozen for the library: its clinical fields and dosage as they stand, the
 * segment's captions as patients see them now (the recording's current track, clipped), and the
 * public wording (the exercise's own unless the clinician
 * adjusted it). A coaching cue keeps its moment in the clip when its words are unchanged.
 */
export function snapshotOf(
	exercise: Exercise,
	segment: SegmentRow,
	wording?: PublicWording
): ExerciseSnapshot {
	const captions = segmentCaptions(segment);
	const words = wording ?? {
		title: exercise.title,
		description: exercise.description,
		coachingCues: exercise.coachingCues.map((c) => c.text),
		safetyNotes: exercise.safetyNotes
	};
	return {
		// Every library field as the exercise stores it (a copy), then the public wording over it.
		...pickFields(exercise, LIBRARY_FIELDS),
		title: words.title.trim(),
		description: words.description.trim(),
		dosage: dosageOf(exercise),
		coachingCues: words.coachingCues
			.map((text) => text.trim())
			.filter(Boolean)
			.map((text) => {
				const same = exercise.coachingCues.find((c) => c.text.trim() === text);
				return same?.atSeconds !== undefined ? { text, atSeconds: same.atSeconds } : { text };
			}),
		safetyNotes: words.safetyNotes.trim(),
		segment: {
			id: segment.id,
			durationSeconds: segment.clipDurationSeconds,
			posterCount: segment.posterCount,
			captionsLanguage: captions.language,
			...clipShape(segment)
		},
		cues: captions.cues.map((c) => ({ ...c }))
	};
}

export interface SubmissionInput {
	wording: PublicWording;
	consentConfirmed: boolean;
	consentDetails: string;
	licence: Licence;
	attribution: string;
	noteToReviewer: string;
}

/** The newest public exercise made from this exercise that may still take a new version. */
export function entryForExercise(exerciseId: string): LibraryExercise | null {
	return (
		db()
			.select()
			.from(libraryExercises)
			.where(
				and(
					eq(libraryExercises.sourceExerciseId, exerciseId),
					ne(libraryExercises.status, 'retired')
				)
			)
			.orderBy(desc(libraryExercises.createdAt))
			.get() ?? null
	);
}

/**
 * Sends the exercise to the review queue as it stands now. An earlier submission of the same
 * exercise that nobody has decided yet (or that was sent back) is replaced by this one, so the
 * queue holds one per exercise; whatever is already public stays public until this is approved.
 */
export function submitExercise(
	clinician: { id: string; clinicId: string },
	exerciseId: string,
	input: SubmissionInput
): LibrarySubmission {
	const found = findClinicExercise(clinician.clinicId, exerciseId);
	if (!found) throw new LibraryError(404, 'Not found.');
	const { exercise, segment } = found;
	if (exercise.status === 'retired') {
		throw new LibraryError(409, 'This exercise is retired; it cannot go to the library.');
	}
	if (!segment) {
		throw new LibraryError(409, 'Choose a segment for this exercise before submitting it.');
	}
	if (segment.status !== 'ready') {
		throw new LibraryError(409, 'The segment’s clip is not cut yet; submit once it is ready.');
	}
	if (!input.consentConfirmed) {
		throw new LibraryError(400, 'Confirm that everyone filmed agreed to publication.');
	}
	const snapshot = snapshotOf(exercise, segment, input.wording);
	const store = db();
	return store.transaction(
		(tx) => {
			tx.update(librarySubmissions)
				.set({ status: 'superseded', decidedAt: new Date() })
				.where(
					and(
						eq(librarySubmissions.exerciseId, exercise.id),
						inArray(librarySubmissions.status, ['waiting', 'changes-requested'])
					)
				)
				.run();
			return tx
				.insert(librarySubmissions)
				.values({
					clinicId: clinician.clinicId,
					exerciseId: exercise.id,
					segmentId: segment.id,
					libraryExerciseId: entryForExercise(exercise.id)?.id ?? null,
					snapshot,
					consentConfirmed: true,
					consentDetails: input.consentDetails.trim(),
					licence: input.licence,
					attribution: input.attribution.trim(),
					noteToReviewer: input.noteToReviewer.trim(),
					submittedBy: clinician.id
				})
				.returning()
				.get();
		},
		{ behavior: 'immediate' }
	);
}

/** A published version by id; null if unknown. */
export function findVersion(id: string): LibraryVersion | null {
	return db().select().from(libraryVersions).where(eq(libraryVersions.id, id)).get() ?? null;
}

/** The newest public exercise made from this exercise, retired ones included; null if none. */
function newestEntryForExercise(exerciseId: string): LibraryExercise | null {
	return (
		entryForExercise(exerciseId) ??
		db()
			.select()
			.from(libraryExercises)
			.where(eq(libraryExercises.sourceExerciseId, exerciseId))
			.orderBy(desc(libraryExercises.createdAt))
			.get() ??
		null
	);
}

/** How a public exercise's captions stand against what its segment shows now. */
export interface CaptionRevision {
	entry: LibraryExercise;
	/** The version on show (or last shown, for an exercise taken down). */
	version: LibraryVersion;
	/** The segment's captions now: the recording's current track, clipped to it. */
	captions: SegmentCaptions;
	/** From the version's captions to these, cue by cue. */
	diff: CueDiff;
	/** Why the changes cannot be sent now, in words; null when they can. */
	refusal: string | null;
}

const sameCues = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);

/**
 * Whether the library's version of this exercise shows other captions than its segment does
 * now (a fix saved in the studio reaches the clinic's patients at once, the library only
 * through a caption revision). Null when there is nothing to compare: the exercise was never
 * approved, or its segment is no longer the one the library shows (that is a new submission).
 */
export function captionRevisionOf(
	exercise: Exercise,
	segment: SegmentRow | null
): CaptionRevision | null {
	const entry = newestEntryForExercise(exercise.id);
	const version = entry?.currentVersionId ? findVersion(entry.currentVersionId) : null;
	if (!entry || !version || !segment || segment.id !== version.snapshot.segment.id) return null;
	const captions = segmentCaptions(segment);
	const diff = diffCues(version.snapshot.cues, captions.cues);
	const undecided = db()
		.select()
		.from(librarySubmissions)
		.where(
			and(eq(librarySubmissions.exerciseId, exercise.id), eq(librarySubmissions.status, 'waiting'))
		)
		.orderBy(desc(librarySubmissions.createdAt))
		.get();
	let refusal: string | null = null;
	if (entry.status === 'retired') {
		refusal =
			'This exercise was retired from the library, so its captions there cannot change. Submit the whole exercise to publish it anew.';
	} else if (entry.status === 'unpublished') {
		refusal =
			'This exercise is unpublished from the library; caption changes can be sent once an educator publishes it again.';
	} else if (exercise.status === 'retired') {
		refusal = 'This exercise is retired, so it cannot go to the library.';
	} else if (undecided?.kind === 'exercise') {
		refusal =
			'A submission of the whole exercise is waiting for review, with the captions it was sent with. Submit it again to include the new captions.';
	} else if (diff.entries.length === 0) {
		refusal = 'The captions are the same as in the library’s version; there is nothing to send.';
	} else if (undecided && sameCues(undecided.snapshot.cues, captions.cues)) {
		refusal = 'These caption changes are waiting for an educator’s review.';
	}
	return { entry, version, captions, diff, refusal };
}

/**
 * Sends the segment's captions as they are now as a caption revision of the library's current
 * version: its snapshot is that version's, with only the cues new, so approving it publishes
 * the same clip and words with the new captions. `captionsVersion`, when given, is the track
 * version the clinician looked at: captions saved since are refused rather than sent unseen.
 * An earlier caption revision still waiting (or sent back) is replaced by this one.
 */
export function submitCaptionRevision(
	clinician: { id: string; clinicId: string },
	exerciseId: string,
	input: { captionsVersion?: number; noteToReviewer: string }
): LibrarySubmission {
	const found = findClinicExercise(clinician.clinicId, exerciseId);
	if (!found) throw new LibraryError(404, 'Not found.');
	const { exercise, segment } = found;
	const revision = captionRevisionOf(exercise, segment);
	if (!revision) {
		throw new LibraryError(
			409,
			'The library shows no version of this exercise with its segment; submit the whole exercise instead.'
		);
	}
	if (revision.refusal) throw new LibraryError(409, revision.refusal);
	if (input.captionsVersion !== undefined && input.captionsVersion !== revision.captions.version) {
		throw new LibraryError(
			409,
			'The captions were saved again since this page was opened; look at the changes below, then send them.'
		);
	}
	const { entry, version, captions } = revision;
	const snapshot: ExerciseSnapshot = {
		...version.snapshot,
		segment: { ...version.snapshot.segment, captionsLanguage: captions.language },
		cues: captions.cues.map((c) => ({ ...c }))
	};
	const approved = version.submissionId
		? db()
				.select({ consentDetails: librarySubmissions.consentDetails })
				.from(librarySubmissions)
				.where(eq(librarySubmissions.id, version.submissionId))
				.get()
		: undefined;
	return db().transaction(
		(tx) => {
			// Checked again inside the write: a whole submission sent meanwhile wins.
			const waitingWhole = tx
				.select({ id: librarySubmissions.id })
				.from(librarySubmissions)
				.where(
					and(
						eq(librarySubmissions.exerciseId, exercise.id),
						eq(librarySubmissions.kind, 'exercise'),
						eq(librarySubmissions.status, 'waiting')
					)
				)
				.get();
			if (waitingWhole) {
				throw new LibraryError(
					409,
					'A submission of the whole exercise is waiting for review, with the captions it was sent with. Submit it again to include the new captions.'
				);
			}
			tx.update(librarySubmissions)
				.set({ status: 'superseded', decidedAt: new Date() })
				.where(
					and(
						eq(librarySubmissions.exerciseId, exercise.id),
						eq(librarySubmissions.kind, 'captions'),
						inArray(librarySubmissions.status, ['waiting', 'changes-requested'])
					)
				)
				.run();
			return tx
				.insert(librarySubmissions)
				.values({
					clinicId: clinician.clinicId,
					exerciseId: exercise.id,
					segmentId: segment?.id ?? null,
					libraryExerciseId: entry.id,
					kind: 'captions',
					revisesVersionId: version.id,
					snapshot,
					// The consent and licence are those the version was approved with.
					consentConfirmed: true,
					consentDetails: approved?.consentDetails ?? '',
					licence: version.licence,
					attribution: version.attribution,
					noteToReviewer: input.noteToReviewer.trim(),
					submittedBy: clinician.id
				})
				.returning()
				.get();
		},
		{ behavior: 'immediate' }
	);
}

/**
 * The computed checklist of a submission (or of a snapshot about to be submitted): every item
 * for a whole exercise, the caption items alone for a caption revision.
 */
export function checklistOf(
	submission: Pick<LibrarySubmission, 'snapshot' | 'consentConfirmed' | 'licence' | 'attribution'> &
		Partial<Pick<LibrarySubmission, 'kind'>>
): Checklist {
	if (submission.kind === 'captions') return computeCaptionChecklist(submission.snapshot);
	return computeChecklist({
		snapshot: submission.snapshot,
		consentConfirmed: submission.consentConfirmed,
		licence: submission.licence,
		attribution: submission.attribution
	});
}

/** A clinic's submissions of one exercise, newest first, each with its reviews. */
export function exerciseSubmissions(
	clinicId: string,
	exerciseId: string
): (LibrarySubmission & { reviews: LibraryReview[] })[] {
	const rows = db()
		.select()
		.from(librarySubmissions)
		.where(
			and(eq(librarySubmissions.clinicId, clinicId), eq(librarySubmissions.exerciseId, exerciseId))
		)
		.orderBy(desc(librarySubmissions.createdAt))
		.all();
	const reviews = reviewsOf(rows.map((r) => r.id));
	return rows.map((r) => ({ ...r, reviews: reviews.filter((v) => v.submissionId === r.id) }));
}

function reviewsOf(submissionIds: string[]): LibraryReview[] {
	if (submissionIds.length === 0) return [];
	return db()
		.select()
		.from(libraryReviews)
		.where(inArray(libraryReviews.submissionId, submissionIds))
		.orderBy(asc(libraryReviews.createdAt))
		.all();
}

export interface QueueRow {
	id: string;
	title: string;
	clinicName: string;
	submittedBy: string;
	createdAt: Date;
	decidedAt: Date | null;
	status: SubmissionStatus;
	kind: SubmissionKind;
	/** Whether it would replace something already public. */
	updatesPublished: boolean;
	passed: number;
	total: number;
}

export const QUEUE_VIEWS = ['waiting', 'changes-requested', 'decided'] as const;
export type QueueView = (typeof QUEUE_VIEWS)[number];

const VIEW_STATUSES: Record<QueueView, SubmissionStatus[]> = {
	waiting: ['waiting'],
	'changes-requested': ['changes-requested'],
	decided: ['approved', 'rejected']
};

/**
 * The review queue across every clinic: waiting submissions oldest first (first come, first
 * served), sent-back and decided ones newest first.
 */
export function listQueue(view: QueueView = 'waiting', limit = 200): QueueRow[] {
	const rows = db()
		.select({
			submission: librarySubmissions,
			clinicName: clinics.name,
			submitterName: users.name,
			submitterEmail: users.email
		})
		.from(librarySubmissions)
		.innerJoin(clinics, eq(clinics.id, librarySubmissions.clinicId))
		.leftJoin(users, eq(users.id, librarySubmissions.submittedBy))
		.where(inArray(librarySubmissions.status, VIEW_STATUSES[view]))
		.orderBy(
			view === 'waiting' ? asc(librarySubmissions.createdAt) : desc(librarySubmissions.createdAt)
		)
		.limit(limit)
		.all();
	return rows.map(({ submission: s, clinicName, submitterName, submitterEmail }) => {
		const checklist = checklistOf(s);
		return {
			id: s.id,
			title: s.snapshot.title,
			clinicName,
			submittedBy: submitterName ?? submitterEmail ?? 'A former member',
			createdAt: s.createdAt,
			decidedAt: s.decidedAt,
			status: s.status,
			kind: s.kind,
			updatesPublished: s.libraryExerciseId !== null,
			passed: checklist.items.filter((i) => i.passed).length,
			total: checklist.items.length
		};
	});
}

/** How many submissions wait in each view, for the queue's tabs. */
export function queueCounts(): Record<QueueView, number> {
	const rows = db()
		.select({ status: librarySubmissions.status })
		.from(librarySubmissions)
		.where(ne(librarySubmissions.status, 'superseded'))
		.all();
	const counts: Record<QueueView, number> = { waiting: 0, 'changes-requested': 0, decided: 0 };
	for (const { status } of rows) {
		for (const view of QUEUE_VIEWS) if (VIEW_STATUSES[view].includes(status)) counts[view]++;
	}
	return counts;
}

export interface SubmissionForReview {
	submission: LibrarySubmission;
	clinicName: string;
	submitter: { name: string; email: string } | null;
	reviews: (LibraryReview & { reviewerName: string })[];
	checklist: Checklist;
	/** The public exercise it would update, if any. */
	entry: LibraryExercise | null;
	/** For a caption revision: the version whose captions it replaces (null if it is gone). */
	revises: LibraryVersion | null;
	/** The segment row behind the clip (null when its recording was deleted since). */
	segment: SegmentRow | null;
}

/** One submission with everything the review screen shows, from any clinic; null if unknown. */
export function submissionForReview(id: string): SubmissionForReview | null {
	const row = db()
		.select({
			submission: librarySubmissions,
			clinicName: clinics.name,
			submitterName: users.name,
			submitterEmail: users.email
		})
		.from(librarySubmissions)
		.innerJoin(clinics, eq(clinics.id, librarySubmissions.clinicId))
		.leftJoin(users, eq(users.id, librarySubmissions.submittedBy))
		.where(eq(librarySubmissions.id, id))
		.get();
	if (!row) return null;
	const s = row.submission;
	const reviews = db()
		.select({ review: libraryReviews, reviewerName: users.name, reviewerEmail: users.email })
		.from(libraryReviews)
		.leftJoin(users, eq(users.id, libraryReviews.reviewerId))
		.where(eq(libraryReviews.submissionId, s.id))
		.orderBy(asc(libraryReviews.createdAt))
		.all()
		.map((r) => ({
			...r.review,
			reviewerName: r.reviewerName ?? r.reviewerEmail ?? 'An educator'
		}));
	const entry = s.libraryExerciseId
		? (db()
				.select()
				.from(libraryExercises)
				.where(eq(libraryExercises.id, s.libraryExerciseId))
				.get() ?? null)
		: null;
	const segment = s.segmentId
		? (db()
				.select()
				.from(segments)
				.where(and(eq(segments.id, s.segmentId), eq(segments.clinicId, s.clinicId)))
				.get() ?? null)
		: null;
	return {
		submission: s,
		clinicName: row.clinicName,
		submitter: row.submitterEmail
			? { name: row.submitterName ?? row.submitterEmail, email: row.submitterEmail }
			: null,
		reviews,
		checklist: checklistOf(s),
		entry,
		revises: s.revisesVersionId ? findVersion(s.revisesVersionId) : null,
		segment
	};
}

/** The submission row alone (any clinic), for the media endpoints; null if unknown. */
export function findSubmission(id: string): LibrarySubmission | null {
	return db().select().from(librarySubmissions).where(eq(librarySubmissions.id, id)).get() ?? null;
}
