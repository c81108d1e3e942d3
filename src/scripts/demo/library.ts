import { and, eq } from 'drizzle-orm';
import { db, schema } from '../../lib/server/db';
import {
	addToCollection,
	createCollection,
	publishCollection,
	setCover
} from '../../lib/server/library/collections';
import { decideSubmission } from '../../lib/server/library/publishing';
import { findPublicExercise } from '../../lib/server/library/public';
import {
	checklistOf,
	submitExercise,
	type SubmissionInput
} from '../../lib/server/library/submissions';
import { JUDGEMENT_ITEMS } from '../../lib/library/checklist';

/**
 * The demo library: three of the demo clinic's exercises submitted by its clinician and
 * approved by its educator through the same path as in the app (so their clips and posters are
 * copied to the library), one collection of them, and one more submission left waiting in the
 * queue for whoever tries the review desk. Runs after the demo exercises exist; safe to run
 * again (an exercise already submitted is left alone).
 */
export const DEMO_PUBLISHED = ['Ankle pumps', 'Heel slides', 'Sit to stand'];
export const DEMO_WAITING = 'Quadriceps sets';
export const DEMO_COLLECTION = 'Knee replacement: the first weeks at home';

const INTRODUCTION = [
	'Three exercises many people are given in the first weeks after a knee replacement, in the order they are usually learnt.',
	'',
	'- Start with **ankle pumps**: they keep the blood moving while you rest.',
	'- **Heel slides** bring the bend back, a little more each day.',
	'- **Sit to stand** comes once you are steady on your feet.',
	'',
	'Do only the exercises your clinician gave you, at the dosage they set.'
].join('\n');

function person(email: string) {
	const user = db()
		.query.users.findFirst({ where: eq(schema.users.email, email) })
		.sync();
	const membership = user
		? db()
				.query.memberships.findFirst({ where: eq(schema.memberships.userId, user.id) })
				.sync()
		: undefined;
	if (!user || !membership) throw new Error(`No demo staff member ${email}`);
	return { id: user.id, name: user.name ?? email, clinicId: membership.clinicId };
}

function input(exercise: typeof schema.exercises.$inferSelect): SubmissionInput {
	return {
		wording: {
			title: exercise.title,
			description: exercise.description,
			coachingCues: exercise.coachingCues.map((c) => c.text),
			// The clinic's own wording speaks to its patients; the public page speaks to anyone.
			safetyNotes: exercise.safetyNotes.replace(
				'Stop and call the clinic if:',
				'Stop and contact your clinician if:'
			)
		},
		consentConfirmed: true,
		consentDetails: 'Signed consent forms are kept in the clinic office (invented demo data).',
		licence: 'cc-by-nc-4.0',
		attribution: 'Alder Street Community Clinic physiotherapy team',
		noteToReviewer: ''
	};
}

export async function seedDemoLibrary(
	clinicianEmail: string,
	educatorEmail: string,
	log: (line: string) => void = console.log
): Promise<{ published: number; waiting: number }> {
	const clinician = person(clinicianEmail);
	const educator = person(educatorEmail);
	const exercise = (title: string) =>
		db()
			.select()
			.from(schema.exercises)
			.where(
				and(eq(schema.exercises.clinicId, clinician.clinicId), eq(schema.exercises.title, title))
			)
			.get();
	const alreadySubmitted = (exerciseId: string) =>
		db()
			.select({ id: schema.librarySubmissions.id })
			.from(schema.librarySubmissions)
			.where(eq(schema.librarySubmissions.exerciseId, exerciseId))
			.get() !== undefined;

	let published = 0;
	const slugs: string[] = [];
	for (const title of DEMO_PUBLISHED) {
		const found = exercise(title);
		if (!found) {
			log(`  library: no demo exercise "${title}" yet; skipped`);
			continue;
		}
		if (alreadySubmitted(found.id)) continue;
		try {
			const submission = submitExercise(clinician, found.id, input(found));
			const checklist = checklistOf(submission);
			if (!checklist.passed) {
				const failing = checklist.items.filter((i) => !i.passed).map((i) => i.label);
				log(`  library: "${title}" left in the queue; not yet met: ${failing.join('; ')}`);
				continue;
			}
			const result = await decideSubmission(submission.id, educator, {
				decision: 'approved',
				comment: 'Clear demonstration with readable captions. Thank you.',
				judgement: JUDGEMENT_ITEMS.map((j) => j.id)
			});
			if (result.slug) slugs.push(result.slug);
			published++;
		} catch (error) {
			log(`  library: "${title}" could not be published: ${(error as Error).message}`);
		}
	}

	let waiting = 0;
	const queued = exercise(DEMO_WAITING);
	if (queued && !alreadySubmitted(queued.id)) {
		submitExercise(clinician, queued.id, {
			...input(queued),
			noteToReviewer: 'The towel roll is small in the picture; tell me if it needs a close-up.'
		});
		waiting++;
	}

	const hasCollection = db()
		.select({ id: schema.libraryCollections.id })
		.from(schema.libraryCollections)
		.where(eq(schema.libraryCollections.title, DEMO_COLLECTION))
		.get();
	if (!hasCollection && slugs.length > 0) {
		const collection = createCollection(educator.id, {
			title: DEMO_COLLECTION,
			introduction: INTRODUCTION
		});
		let cover: { entryId: string; posters: number } | null = null;
		for (const slug of slugs) {
			const entry = findPublicExercise(slug);
			if (entry?.kind !== 'published') continue;
			addToCollection(collection.id, entry.value.entry.id);
			cover ??=
				entry.value.version.posterCount > 0
					? { entryId: entry.value.entry.id, posters: entry.value.version.posterCount }
					: null;
		}
		if (cover) setCover(collection.id, cover.entryId, Math.min(1, cover.posters - 1));
		publishCollection(collection.id);
	}
	return { published, waiting };
}
