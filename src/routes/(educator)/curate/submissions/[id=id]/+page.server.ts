import { error, fail, redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { z } from 'zod';
import { diffCues } from '$lib/captions/diff';
import { plainText } from '$lib/captions/text';
import { describeDosage } from '$lib/dosage';
import { captionChangeRows, captionChangeSummary } from '$lib/library/caption-changes';
import { judgementItemsFor } from '$lib/library/checklist';
import { DECISIONS, LICENCE_LABELS, type ExerciseSnapshot } from '$lib/library/types';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { libraryVersions } from '$lib/server/db/schema';
import { submissionUrls } from '$lib/server/library/media';
import {
	approvalBlockers,
	approvalProblems,
	commentProblem,
	decideSubmission,
	revisionProblem
} from '$lib/server/library/publishing';
import { LibraryError, submissionForReview } from '$lib/server/library/submissions';
import { renderSafetyNotes } from '$lib/server/markdown';
import { eq } from 'drizzle-orm';
import type { Actions, PageServerLoad } from './$types';

/** The fields that differ between what is public and what was submitted, in words. */
function changedFields(before: ExerciseSnapshot, after: ExerciseSnapshot): string[] {
	const fields: [string, (s: ExerciseSnapshot) => unknown][] = [
		['Title', (s) => s.title],
		['Description', (s) => s.description],
		[
			'Body region, position, movement type or side',
			(s) => [s.bodyRegion, s.position, s.movementType, s.side]
		],
		['Phase', (s) => s.phase],
		['Equipment', (s) => s.equipment],
		['Dosage', (s) => s.dosage],
		['Key points', (s) => s.coachingCues],
		['Safety notes', (s) => s.safetyNotes],
		['Demonstration (segment)', (s) => s.segment.id],
		['Captions', (s) => s.cues]
	];
	return fields
		.filter(([, read]) => JSON.stringify(read(before)) !== JSON.stringify(read(after)))
		.map(([name]) => name);
}

export const load: PageServerLoad = async ({ params }) => {
	requireRole('educator');
	const found = submissionForReview(params.id);
	if (!found) error(404, 'Not found.');
	const { submission: s, checklist, segment, entry, revises } = found;
	const snapshot = s.snapshot;
	const judgementItems = judgementItemsFor(s.kind);
	// A caption revision plays the clip of the version it revises; the rest, the clinic's segment.
	const posterCount = s.kind === 'captions' ? revises?.posterCount : segment?.posterCount;
	const diff = s.kind === 'captions' ? diffCues(revises?.snapshot.cues ?? [], snapshot.cues) : null;
	const current = entry?.currentVersionId
		? db()
				.select()
				.from(libraryVersions)
				.where(eq(libraryVersions.id, entry.currentVersionId))
				.get()
		: undefined;
	return {
		submission: {
			id: s.id,
			kind: s.kind,
			status: s.status,
			createdAt: s.createdAt.toISOString(),
			clinicName: found.clinicName,
			submitter: found.submitter,
			noteToReviewer: s.noteToReviewer,
			consentConfirmed: s.consentConfirmed,
			consentDetails: s.consentDetails,
			licence: LICENCE_LABELS[s.licence],
			attribution: s.attribution
		},
		exercise: {
			title: snapshot.title,
			description: snapshot.description,
			bodyRegion: snapshot.bodyRegion,
			side: snapshot.side,
			position: snapshot.position,
			movementType: snapshot.movementType,
			phase: snapshot.phase,
			equipment: snapshot.equipment,
			precautionTags: snapshot.precautionTags,
			dosage: describeDosage(snapshot.dosage),
			coachingCues: snapshot.coachingCues,
			safetyHtml: renderSafetyNotes(snapshot.safetyNotes)
		},
		media:
			posterCount !== undefined
				? {
						...submissionUrls(s.id, posterCount),
						language: snapshot.segment.captionsLanguage
					}
				: null,
		revision: diff
			? {
					version: revises?.version ?? null,
					summary: captionChangeSummary(diff),
					rows: captionChangeRows(diff),
					problem: s.status === 'waiting' ? revisionProblem(entry, s.revisesVersionId) : null
				}
			: null,
		lines: snapshot.cues.map((c) => ({ start: c.start, end: c.end, text: plainText(c.text) })),
		checklist,
		blockers: approvalBlockers(
			checklist,
			judgementItems.map((j) => j.id),
			s.kind
		),
		judgementItems,
		form: await superValidate({ judgement: [], decision: '', comment: '' }, zod4(decisionForm), {
			errors: false
		}),
		reviews: found.reviews.map((r) => ({
			id: r.id,
			decision: r.decision,
			comment: r.comment,
			reviewerName: r.reviewerName,
			createdAt: r.createdAt.toISOString()
		})),
		published: entry
			? {
					slug: entry.slug,
					status: entry.status,
					version: current?.version ?? null,
					changes: current ? changedFields(current.snapshot, snapshot) : []
				}
			: null
	};
};

const decisionForm = z.object({
	/** The educator's own judgement: the ids of the items ticked. */
	judgement: z.array(z.string()),
	// Posted as text so that no choice made is read as no choice: nothing is approved by default.
	decision: z
		.string()
		.pipe(z.enum(DECISIONS, { error: 'Choose approve, request changes or reject.' })),
	comment: z.string().max(4000, 'Keep the comment under 4,000 characters.')
});

export const actions: Actions = {
	decide: async ({ params, request }) => {
		const educator = requireRole('educator');
		const form = await superValidate(request, zod4(decisionForm));
		if (!form.valid) return fail(400, { form });
		const found = submissionForReview(params.id);
		if (!found) error(404, 'Not found.');
		// Everything that keeps this decision back, each beside what would answer it, in one go.
		// (A submission decided meanwhile is said by decideSubmission.)
		const { decision, comment, judgement } = form.data;
		const waiting = found.submission.status === 'waiting';
		const uncommented = commentProblem(decision, comment);
		if (waiting && uncommented) setError(form, 'comment', uncommented);
		if (waiting && decision === 'approved') {
			const problems = approvalProblems(found.checklist, judgement, found.submission.kind);
			for (const problem of problems.judgement) setError(form, 'judgement._errors', problem);
			for (const problem of problems.checks) setError(form, 'decision', problem);
		}
		if (!form.valid) return fail(400, { form });
		let result;
		try {
			result = await decideSubmission(
				params.id,
				{ id: educator.id, name: educator.name },
				form.data
			);
		} catch (e) {
			if (e instanceof LibraryError) {
				if (e.status === 404) error(404, 'Not found.');
				form.valid = false;
				form.message = e.message;
				return fail(e.status, { form });
			}
			throw e;
		}
		redirect(
			303,
			resolve(
				`/(educator)/curate/submissions/[id=id]?decided=${result.decision}${result.mailed ? '' : '&unmailed=1'}`,
				{ id: params.id }
			)
		);
	}
};
