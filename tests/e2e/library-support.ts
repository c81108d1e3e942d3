/**
 * Library records put straight into the e2e database and storage, for the role matrix and the
 * library journey: exercises on seeded segments, submissions, public exercises (published,
 * unpublished, retired) with their public copies, and collections.
 */
import { PutObjectCommand } from '@aws-sdk/client-s3';
import { database, storageClient } from './support';

interface SeedCue {
	id: string;
	start: number;
	end: number;
	text: string;
}

async function put(key: string, body: string | Uint8Array, type: string): Promise<void> {
	const s3 = storageClient();
	try {
		await s3.send(
			new PutObjectCommand({ Bucket: 'kinelume', Key: key, Body: body, ContentType: type })
		);
	} finally {
		s3.destroy();
	}
}

export interface SeedExercise {
	title: string;
	description?: string;
	safetyNotes?: string;
	bodyRegion?: string;
	position?: string;
	movementType?: string;
	equipment?: string[];
	coachingCues?: { text: string }[];
}

/** An exercise of the segment's clinic on that segment; returns its id. */
export function seedExercise(segmentId: string, exercise: SeedExercise): string {
	const db = database();
	const id = crypto.randomUUID();
	try {
		const { clinicId } = db
			.prepare('select clinic_id as clinicId from segment where id = ?')
			.get(segmentId) as {
			clinicId: string;
		};
		const now = Date.now();
		db.prepare(
			`insert into exercise (id, clinic_id, segment_id, title, description, body_region, position, movement_type,
			 equipment, phase, coaching_cues, safety_notes, sets, reps, hold_seconds, rest_seconds, sessions_per_day,
			 days_per_week, status, created_at, updated_at)
			 values (?, ?, ?, ?, ?, ?, ?, ?, ?, 1, ?, ?, 1, 8, 0, 30, 3, 7, 'ready', ?, ?)`
		).run(
			id,
			clinicId,
			segmentId,
			exercise.title,
			exercise.description ?? '',
			exercise.bodyRegion ?? 'Knee',
			exercise.position ?? 'supine',
			exercise.movementType ?? 'active-assisted',
			JSON.stringify(exercise.equipment ?? ['Towel']),
			JSON.stringify(exercise.coachingCues ?? [{ text: 'Keep the heel on the bed' }]),
			exercise.safetyNotes ?? 'Tightness at the end of the bend is normal. Stop if pain is sharp.',
			now,
			now
		);
	} finally {
		db.close();
	}
	return id;
}

function snapshotOf(
	title: string,
	segmentId: string,
	cues: SeedCue[],
	shape: { width: number; height: number } | null = null
) {
	return {
		title,
		description: `${title}, as the library shows it.`,
		bodyRegion: 'Knee',
		side: 'either',
		position: 'supine',
		movementType: 'active-assisted',
		equipment: ['Towel'],
		phase: 1,
		dosage: {
			sets: 1,
			reps: 8,
			holdSeconds: 0,
			restSeconds: 30,
			sessionsPerDay: 3,
			daysPerWeek: 7
		},
		coachingCues: [{ text: 'Keep the heel on the bed' }],
		safetyNotes: 'Tightness at the end of the bend is normal. Stop if pain is sharp.',
		precautionTags: [],
		segment: {
			id: segmentId,
			durationSeconds: 1,
			posterCount: 1,
			captionsLanguage: 'en-GB',
			...(shape ?? {})
		},
		cues
	};
}

/**
 * A public exercise with one version and its public copies (a few bytes of clip and a poster)
 * under library/<version>/, in the given state; returns its ids and address.
 */
export async function seedPublicExercise(
	clinicId: string,
	{
		title,
		slug,
		status = 'published',
		cues = [{ id: '1', start: 0, end: 1, text: 'Public cue.' }],
		shape = null
	}: {
		title: string;
		slug: string;
		status?: 'published' | 'unpublished' | 'retired';
		cues?: SeedCue[];
		/** The clip's picture size, as publishing records it. */
		shape?: { width: number; height: number } | null;
	}
): Promise<{ entryId: string; versionId: string; slug: string }> {
	const db = database();
	const entryId = crypto.randomUUID();
	const versionId = crypto.randomUUID();
	const segmentId = crypto.randomUUID();
	try {
		const now = Date.now();
		db.prepare(
			`insert into library_exercise (id, slug, clinic_id, status, current_version_id, created_at, updated_at, retired_at)
			 values (?, ?, ?, ?, ?, ?, ?, ?)`
		).run(entryId, slug, clinicId, status, versionId, now, now, status === 'retired' ? now : null);
		db.prepare(
			`insert into library_version (id, library_exercise_id, version, title, body_region, position, movement_type,
			 phase, equipment, snapshot, licence, attribution, poster_count, clip_duration_seconds, clip_size, published_at)
			 values (?, ?, 1, ?, 'Knee', 'supine', 'active-assisted', 1, '["Towel"]', ?, 'cc-by-nc-4.0', 'E2E team', 1, 1, 12, ?)`
		).run(
			versionId,
			entryId,
			title,
			JSON.stringify(snapshotOf(title, segmentId, cues, shape)),
			now
		);
		if (status === 'published') {
			const text = snapshotOf(title, segmentId, cues);
			db.prepare(
				`insert into library_search (title, description, coaching_cues, captions, library_exercise_id) values (?, ?, ?, ?, ?)`
			).run(
				title,
				text.description,
				'Keep the heel on the bed',
				cues.map((c) => c.text).join('\n'),
				entryId
			);
		}
	} finally {
		db.close();
	}
	// Copies exist for every state, so a 404 or 410 below is the app's decision, not a missing file.
	await put(`library/${versionId}/segments/${segmentId}.mp4`, 'public clip bytes', 'video/mp4');
	await put(`library/${versionId}/posters/0.jpg`, 'public poster bytes', 'image/jpeg');
	return { entryId, versionId, slug };
}

/** A submission of an exercise, waiting for review; returns its id. */
export function seedSubmission(exerciseId: string, submittedByEmail: string): string {
	const db = database();
	const id = crypto.randomUUID();
	try {
		const exercise = db
			.prepare(
				'select clinic_id as clinicId, segment_id as segmentId, title from exercise where id = ?'
			)
			.get(exerciseId) as { clinicId: string; segmentId: string; title: string };
		const segment = db.prepare('select cues from segment where id = ?').get(exercise.segmentId) as {
			cues: string;
		};
		const user = db.prepare('select id from user where email = ?').get(submittedByEmail) as {
			id: string;
		};
		db.prepare(
			`insert into library_submission (id, clinic_id, exercise_id, segment_id, snapshot, consent_confirmed,
			 consent_details, licence, attribution, status, submitted_by, created_at)
			 values (?, ?, ?, ?, ?, 1, 'Signed form on file', 'cc-by-nc-4.0', 'E2E team', 'waiting', ?, ?)`
		).run(
			id,
			exercise.clinicId,
			exerciseId,
			exercise.segmentId,
			JSON.stringify(
				snapshotOf(exercise.title, exercise.segmentId, JSON.parse(segment.cues) as SeedCue[])
			),
			user.id,
			Date.now()
		);
	} finally {
		db.close();
	}
	return id;
}

/**
 * A caption revision of a seeded public exercise's version, waiting for review: the version's
 * snapshot with one cue changed. Its files are the version's public copies. Returns its id.
 */
export function seedCaptionRevision(
	published: { entryId: string; versionId: string },
	submittedByEmail: string
): string {
	const db = database();
	const id = crypto.randomUUID();
	try {
		const version = db
			.prepare('select snapshot, licence, attribution from library_version where id = ?')
			.get(published.versionId) as { snapshot: string; licence: string; attribution: string };
		const { clinicId } = db
			.prepare('select clinic_id as clinicId from library_exercise where id = ?')
			.get(published.entryId) as { clinicId: string };
		const user = db.prepare('select id from user where email = ?').get(submittedByEmail) as {
			id: string;
		};
		const snapshot = JSON.parse(version.snapshot) as { cues: SeedCue[] };
		snapshot.cues = snapshot.cues.map((c, i) =>
			i === 0 ? { ...c, text: `${c.text} Revised.` } : c
		);
		db.prepare(
			`insert into library_submission (id, clinic_id, library_exercise_id, kind, revises_version_id, snapshot,
			 consent_confirmed, consent_details, licence, attribution, status, submitted_by, created_at)
			 values (?, ?, ?, 'captions', ?, ?, 1, '', ?, ?, 'waiting', ?, ?)`
		).run(
			id,
			clinicId,
			published.entryId,
			published.versionId,
			JSON.stringify(snapshot),
			version.licence,
			version.attribution,
			user.id,
			Date.now()
		);
	} finally {
		db.close();
	}
	return id;
}

/** A collection in the given state holding the given public exercises in order; returns its ids. */
export function seedCollection(
	title: string,
	slug: string,
	status: 'draft' | 'published' | 'unpublished',
	entryIds: string[]
): { id: string; slug: string } {
	const db = database();
	const id = crypto.randomUUID();
	try {
		const now = Date.now();
		db.prepare(
			`insert into library_collection (id, slug, title, introduction, status, created_at, updated_at, published_at)
			 values (?, ?, ?, 'An introduction with **bold** words.', ?, ?, ?, ?)`
		).run(id, slug, title, status, now, now, status === 'published' ? now : null);
		entryIds.forEach((entryId, position) =>
			db
				.prepare(
					'insert into library_collection_item (collection_id, library_exercise_id, position) values (?, ?, ?)'
				)
				.run(id, entryId, position)
		);
	} finally {
		db.close();
	}
	return { id, slug };
}
