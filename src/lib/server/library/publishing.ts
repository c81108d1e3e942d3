/**
 * An educator's decisions: approve (which publishes a new, immutable version), request
 * changes or reject — each e-mailed to the clinician — and, for what is already public,
 * unpublish, publish again and retire.
 */
import { and, desc, eq, max } from 'drizzle-orm';
import { judgementItemsFor, judgementTicked, type Checklist } from '$lib/library/checklist';
import { slugify, uniqueSlug } from '$lib/library/slug';
import type { Decision, SubmissionKind } from '$lib/library/types';
import { config } from '../config';
import { db } from '../db';
import {
	libraryCollectionItems,
	libraryExercises,
	libraryReviews,
	librarySubmissions,
	libraryVersions,
	users,
	type LibraryExercise,
	type LibraryVersion
} from '../db/schema';
import { sendMail } from '../mail';
import { decisionMail } from './mail';
import {
	copySegmentToLibrary,
	copyVersionMedia,
	deleteVersionMedia,
	type CopiedMedia
} from './media';
import { forgetCatalogue } from './catalogue';
import { reindexEntry } from './search-index';
import { LibraryError, submissionForReview } from './submissions';

export interface Reviewer {
	id: string;
	name: string;
}

export interface DecisionInput {
	decision: Decision;
	comment: string;
	judgement: string[];
}

export interface DecisionResult {
	decision: Decision;
	/** Set on approval: the public address and the version made. */
	slug?: string;
	versionId?: string;
	/** Whether the clinician's e-mail went out (a failure does not undo the decision). */
	mailed: boolean;
}

/**
 * The reasons an approval cannot go ahead, in words for the educator, by what would answer them:
 * the checks that do not pass, and the educator's own judgement not yet confirmed.
 */
export function approvalProblems(
	checklist: Checklist,
	judgement: readonly string[],
	kind: SubmissionKind = 'exercise'
): { checks: string[]; judgement: string[] } {
	const ticked = judgementTicked(judgement, kind);
	return {
		checks: checklist.items
			.filter((i) => !i.passed)
			.map((i) => `Not yet met: ${i.label.toLowerCase()}.`),
		judgement: judgementItemsFor(kind)
			.filter((item) => !ticked.includes(item.id))
			.map((item) => `Confirm: ${item.label.toLowerCase()}.`)
	};
}

/** The reasons an approval cannot go ahead, in words for the educator; empty when it can. */
export function approvalBlockers(
	checklist: Checklist,
	judgement: readonly string[],
	kind: SubmissionKind = 'exercise'
): string[] {
	const problems = approvalProblems(checklist, judgement, kind);
	return [...problems.checks, ...problems.judgement];
}

/** Why the comment cannot go with this decision as it is, or null: the clinician needs a reason. */
export function commentProblem(decision: Decision, comment: string): string | null {
	return decision !== 'approved' && comment.trim().length < 5
		? 'Write the clinician a comment: say what to change or why.'
		: null;
}

/**
 * Why a caption revision cannot be published onto its public exercise now, in words for the
 * educator; null when it can. It must still revise the version on show, of an exercise on show.
 */
export function revisionProblem(
	entry: Pick<LibraryExercise, 'status' | 'currentVersionId'> | null | undefined,
	revisesVersionId: string | null
): string | null {
	if (!entry || !revisesVersionId) {
		return 'The published exercise these captions were for is gone. Reject this submission.';
	}
	if (entry.status === 'retired') {
		return 'This exercise was retired from the library, so its captions cannot change there. Reject this submission.';
	}
	if (entry.status === 'unpublished') {
		return 'This exercise is unpublished; publish it again before approving caption changes, or request changes.';
	}
	if (entry.currentVersionId !== revisesVersionId) {
		return 'A newer version was published after these caption changes were sent. Request changes, so the clinician sends them again on top of it.';
	}
	return null;
}

function entryIsTaken(slug: string): boolean {
	return (
		db()
			.select({ id: libraryExercises.id })
			.from(libraryExercises)
			.where(eq(libraryExercises.slug, slug))
			.get() !== undefined
	);
}

/**
 * Decides a waiting submission. Approval copies the clip and posters to the library first
 * (storage is not part of the database transaction), then in one transaction — which checks
 * again that nobody decided meanwhile — adds the version, points the public exercise at it and
 * reindexes it. If that transaction fails, the copies are removed again.
 */
export async function decideSubmission(
	submissionId: string,
	reviewer: Reviewer,
	input: DecisionInput
): Promise<DecisionResult> {
	const found = submissionForReview(submissionId);
	if (!found) throw new LibraryError(404, 'Not found.');
	const { submission, checklist, segment, revises } = found;
	const kind = submission.kind;
	if (submission.status !== 'waiting') {
		throw new LibraryError(409, 'This submission was already decided; reload to see the decision.');
	}
	const comment = input.comment.trim();
	const uncommented = commentProblem(input.decision, comment);
	if (uncommented) throw new LibraryError(400, uncommented);
	const judgement = judgementTicked(input.judgement, kind);

	let published: { version: LibraryVersion; entry: LibraryExercise } | null = null;
	if (input.decision === 'approved') {
		const blockers = approvalBlockers(checklist, judgement, kind);
		if (blockers.length > 0) throw new LibraryError(400, blockers.join(' '));
		const versionId = crypto.randomUUID();
		let copy: () => Promise<CopiedMedia>;
		if (kind === 'captions') {
			const problem = revisionProblem(found.entry, submission.revisesVersionId);
			if (problem || !revises) throw new LibraryError(409, problem ?? 'Not found.');
			// A caption revision shows the pictures of the version it revises: its own copies of them.
			copy = () => copyVersionMedia(revises, versionId);
		} else {
			if (!segment || segment.status !== 'ready') {
				throw new LibraryError(
					409,
					'The clip behind this submission is no longer there (its recording may have been deleted). Request changes so the clinician can submit again.'
				);
			}
			copy = () => copySegmentToLibrary(segment, versionId);
		}
		let media;
		try {
			media = await copy();
		} catch (error) {
			await deleteVersionMedia(versionId).catch(() => undefined);
			console.error(`[library] copying media for ${submission.id} failed:`, error);
			throw new LibraryError(
				503,
				'The clip could not be copied to the library just now; nothing was published. Try again in a moment.'
			);
		}
		try {
			published = publishVersion(
				submission.id,
				versionId,
				reviewer,
				comment,
				judgement,
				checklist,
				media
			);
		} catch (error) {
			await deleteVersionMedia(versionId).catch(() => undefined);
			throw error;
		}
	} else {
		db().transaction(
			(tx) => {
				const current = tx
					.select({ status: librarySubmissions.status })
					.from(librarySubmissions)
					.where(eq(librarySubmissions.id, submission.id))
					.get();
				if (current?.status !== 'waiting') {
					throw new LibraryError(
						409,
						'This submission was already decided; reload to see the decision.'
					);
				}
				tx.insert(libraryReviews)
					.values({
						submissionId: submission.id,
						reviewerId: reviewer.id,
						decision: input.decision,
						comment,
						checklist,
						judgement
					})
					.run();
				tx.update(librarySubmissions)
					.set({ status: input.decision, decidedAt: new Date() })
					.where(eq(librarySubmissions.id, submission.id))
					.run();
			},
			{ behavior: 'immediate' }
		);
	}

	const mailed = await mailClinician(found.submitter?.email ?? null, submission.clinicId, {
		decision: input.decision,
		kind,
		title: submission.snapshot.title,
		reviewerName: reviewer.name,
		comment,
		url: published
			? `${config().ORIGIN}/library/exercises/${published.entry.slug}`
			: submission.exerciseId
				? `${config().ORIGIN}/exercises/${submission.exerciseId}/submit`
				: `${config().ORIGIN}/exercises`
	});
	return {
		decision: input.decision,
		slug: published?.entry.slug,
		versionId: published?.version.id,
		mailed
	};
}

function publishVersion(
	submissionId: string,
	versionId: string,
	reviewer: Reviewer,
	comment: string,
	judgement: string[],
	checklist: Checklist,
	media: CopiedMedia
): { version: LibraryVersion; entry: LibraryExercise } {
	return db().transaction(
		(tx) => {
			const submission = tx
				.select()
				.from(librarySubmissions)
				.where(eq(librarySubmissions.id, submissionId))
				.get();
			if (!submission || submission.status !== 'waiting') {
				throw new LibraryError(
					409,
					'This submission was already decided; reload to see the decision.'
				);
			}
			const snapshot = submission.snapshot;
			let entry = submission.libraryExerciseId
				? tx
						.select()
						.from(libraryExercises)
						.where(eq(libraryExercises.id, submission.libraryExerciseId))
						.get()
				: undefined;
			if (submission.kind === 'captions') {
				// Checked again inside the write: nothing else may have been published meanwhile.
				const problem = revisionProblem(entry, submission.revisesVersionId);
				if (problem) throw new LibraryError(409, problem);
			}
			// A retired exercise stays retired (its address answers 410); approving anew starts another.
			if (!entry || entry.status === 'retired') {
				entry = tx
					.insert(libraryExercises)
					.values({
						slug: uniqueSlug(slugify(snapshot.title), entryIsTaken),
						clinicId: submission.clinicId,
						sourceExerciseId: submission.exerciseId,
						status: 'published'
					})
					.returning()
					.get();
			}
			const latest =
				tx
					.select({ n: max(libraryVersions.version) })
					.from(libraryVersions)
					.where(eq(libraryVersions.libraryExerciseId, entry.id))
					.get()?.n ?? 0;
			const version = tx
				.insert(libraryVersions)
				.values({
					id: versionId,
					libraryExerciseId: entry.id,
					version: latest + 1,
					submissionId: submission.id,
					title: snapshot.title,
					bodyRegion: snapshot.bodyRegion,
					position: snapshot.position,
					movementType: snapshot.movementType,
					phase: snapshot.phase,
					equipment: snapshot.equipment,
					snapshot,
					licence: submission.licence,
					attribution: submission.attribution,
					posterCount: media.posterCount,
					clipDurationSeconds: snapshot.segment.durationSeconds,
					clipSize: media.clipSize,
					clipVersions: media.clipVersions,
					publishedBy: reviewer.id
				})
				.returning()
				.get();
			entry = tx
				.update(libraryExercises)
				.set({ currentVersionId: version.id, status: 'published', updatedAt: new Date() })
				.where(eq(libraryExercises.id, entry.id))
				.returning()
				.get();
			tx.insert(libraryReviews)
				.values({
					submissionId: submission.id,
					reviewerId: reviewer.id,
					decision: 'approved',
					comment,
					checklist,
					judgement
				})
				.run();
			tx.update(librarySubmissions)
				.set({ status: 'approved', decidedAt: new Date(), libraryExerciseId: entry.id })
				.where(eq(librarySubmissions.id, submission.id))
				.run();
			reindexEntry(entry.id);
			forgetCatalogue();
			return { version, entry };
		},
		{ behavior: 'immediate' }
	);
}

async function mailClinician(
	email: string | null,
	clinicId: string,
	content: Parameters<typeof decisionMail>[0]
): Promise<boolean> {
	if (!email) return false;
	try {
		await sendMail({ clinicId, to: email, ...decisionMail(content) });
		return true;
	} catch (error) {
		console.error(`[library] the decision e-mail to ${email} failed:`, error);
		return false;
	}
}

/** A public exercise by id, for the educator's table; null if unknown. */
export function findEntry(id: string): LibraryExercise | null {
	return db().select().from(libraryExercises).where(eq(libraryExercises.id, id)).get() ?? null;
}

/** Takes a published exercise off the public pages (its address answers 404) until published again. */
export function unpublishEntry(id: string): LibraryExercise {
	return setEntryStatus(id, ['published'], 'unpublished');
}

/** Puts an unpublished exercise back, with the version it had. */
export function republishEntry(id: string): LibraryExercise {
	return setEntryStatus(id, ['unpublished'], 'published');
}

/**
 * Withdraws an exercise for good: its address answers 410, it leaves every collection, and
 * its public copies are deleted. A later approval of the same exercise starts a new address.
 */
export async function retireEntry(id: string): Promise<LibraryExercise> {
	const entry = setEntryStatus(id, ['published', 'unpublished'], 'retired', () => {
		db()
			.delete(libraryCollectionItems)
			.where(eq(libraryCollectionItems.libraryExerciseId, id))
			.run();
	});
	const versions = db()
		.select({ id: libraryVersions.id })
		.from(libraryVersions)
		.where(eq(libraryVersions.libraryExerciseId, id))
		.all();
	for (const v of versions) {
		await deleteVersionMedia(v.id).catch((error) =>
			console.error(`[library] deleting the copies of version ${v.id} failed:`, error)
		);
	}
	return entry;
}

function setEntryStatus(
	id: string,
	from: LibraryExercise['status'][],
	to: LibraryExercise['status'],
	alsoInTransaction?: () => void
): LibraryExercise {
	return db().transaction(
		(tx) => {
			const entry = tx.select().from(libraryExercises).where(eq(libraryExercises.id, id)).get();
			if (!entry) throw new LibraryError(404, 'Not found.');
			if (!from.includes(entry.status)) {
				throw new LibraryError(
					409,
					`This exercise is ${entry.status}; it cannot become ${to} from there.`
				);
			}
			if (to === 'published' && !entry.currentVersionId) {
				throw new LibraryError(409, 'This exercise has no approved version to show.');
			}
			const updated = tx
				.update(libraryExercises)
				.set({
					status: to,
					updatedAt: new Date(),
					...(to === 'retired' ? { retiredAt: new Date() } : {})
				})
				.where(and(eq(libraryExercises.id, id), eq(libraryExercises.status, entry.status)))
				.returning()
				.get();
			alsoInTransaction?.();
			reindexEntry(id);
			forgetCatalogue();
			return updated;
		},
		{ behavior: 'immediate' }
	);
}

export interface EntryRow {
	id: string;
	slug: string;
	title: string;
	status: LibraryExercise['status'];
	version: number;
	bodyRegion: string;
	publishedAt: Date;
	publishedBy: string;
	clinicName: string;
}

/** Every public exercise with its current version, for the educator's table (newest first). */
export function listEntries(): EntryRow[] {
	const rows = db()
		.select({
			entry: libraryExercises,
			version: libraryVersions,
			publisherName: users.name,
			publisherEmail: users.email
		})
		.from(libraryExercises)
		.innerJoin(libraryVersions, eq(libraryVersions.id, libraryExercises.currentVersionId))
		.leftJoin(users, eq(users.id, libraryVersions.publishedBy))
		.orderBy(desc(libraryVersions.publishedAt))
		.all();
	const clinicNames = new Map(
		db()
			.query.clinics.findMany({ columns: { id: true, name: true } })
			.sync()
			.map((c) => [c.id, c.name])
	);
	return rows.map(({ entry, version, publisherName, publisherEmail }) => ({
		id: entry.id,
		slug: entry.slug,
		title: version.title,
		status: entry.status,
		version: version.version,
		bodyRegion: version.bodyRegion,
		publishedAt: version.publishedAt,
		publishedBy: publisherName ?? publisherEmail ?? 'An educator',
		clinicName: clinicNames.get(entry.clinicId) ?? ''
	}));
}
