import { PutObjectCommand } from '@aws-sdk/client-s3';
import { hash } from '@node-rs/argon2';
import { database, DEMO_PASSWORD, storageClient } from './support';

interface SeedCue {
	id: string;
	start: number;
	end: number;
	text: string;
}

/**
 * Puts a ready segment of `recordingId` straight into the e2e database and storage: its clip
 * (a few bytes unless a real clip is given) and one poster, with `cues` already shifted to zero.
 * Returns the segment's id.
 */
export async function seedReadySegment(
	recordingId: string,
	{
		title = 'Seeded segment',
		start = 0,
		end = 1,
		cues = [{ id: '1', start: 0, end: 0.8, text: 'Seeded segment cue.' }],
		clip,
		status = 'ready'
	}: {
		title?: string;
		start?: number;
		end?: number;
		cues?: SeedCue[];
		clip?: Uint8Array;
		status?: 'ready' | 'cutting';
	} = {}
): Promise<string> {
	const db = database();
	const id = crypto.randomUUID();
	let clinicId: string;
	try {
		({ clinicId } = db
			.prepare('select clinic_id as clinicId from recording where id = ?')
			.get(recordingId) as { clinicId: string });
		const position =
			(
				db.prepare('select count(*) as n from segment where recording_id = ?').get(recordingId) as {
					n: number;
				}
			).n ?? 0;
		db.prepare(
			`insert into segment (id, recording_id, clinic_id, position, title, start_seconds, end_seconds, status,
			 clip_duration_seconds, clip_size, poster_count, cues, captions_version, captions_language, created_at)
			 values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, 1, 'en-GB', ?)`
		).run(
			id,
			recordingId,
			clinicId,
			position,
			title,
			start,
			end,
			status,
			status === 'ready' ? end - start : null,
			clip?.length ?? 12,
			status === 'ready' ? 1 : 0,
			JSON.stringify(cues),
			Date.now()
		);
	} finally {
		db.close();
	}
	if (status === 'ready') {
		const s3 = storageClient();
		const prefix = `clinics/${clinicId}/recordings/${recordingId}/segments/${id}`;
		await s3.send(
			new PutObjectCommand({
				Bucket: 'kinelume',
				Key: `${prefix}.mp4`,
				Body: clip ?? 'seeded bytes',
				ContentType: 'video/mp4'
			})
		);
		await s3.send(
			new PutObjectCommand({
				Bucket: 'kinelume',
				Key: `${prefix}/posters/0.jpg`,
				Body: 'seeded bytes',
				ContentType: 'image/jpeg'
			})
		);
		s3.destroy();
	}
	return id;
}

/**
 * A patient of the segment's clinic who can sign in with the demo password, with a PUBLISHED
 * programme whose one exercise is built on the segment. A patient of its own, so no demo
 * patient's programme changes. Returns the patient's e-mail address.
 */
export async function seedPatientWithProgramme(segmentId: string): Promise<string> {
	const db = database();
	const email = `segment-viewer-${segmentId.slice(0, 8)}@alder-street.example`;
	try {
		const { clinicId, title } = db
			.prepare('select clinic_id as clinicId, title from segment where id = ?')
			.get(segmentId) as { clinicId: string; title: string };
		const now = Date.now();
		const userId = crypto.randomUUID();
		const patientId = crypto.randomUUID();
		const exerciseId = crypto.randomUUID();
		const programmeId = crypto.randomUUID();
		db.prepare(
			'insert into user (id, name, email, password_hash, created_at) values (?, ?, ?, ?, ?)'
		).run(userId, 'Segment Viewer', email, await hash(DEMO_PASSWORD), now);
		db.prepare(
			`insert into patient (id, clinic_id, user_id, full_name, email, created_at) values (?, ?, ?, 'Segment Viewer', ?, ?)`
		).run(patientId, clinicId, userId, email, now);
		db.prepare(
			`insert into exercise (id, clinic_id, segment_id, title, body_region, position, movement_type, sets, reps,
			 sessions_per_day, days_per_week, created_at, updated_at)
			 values (?, ?, ?, ?, 'knee', 'supine', 'active', 1, 8, 3, 7, ?, ?)`
		).run(exerciseId, clinicId, segmentId, title, now, now);
		db.prepare(
			`insert into programme (id, clinic_id, patient_id, title, status, start_date, created_at, updated_at, published_at)
			 values (?, ?, ?, 'Home programme', 'published', '2030-01-01', ?, ?, ?)`
		).run(programmeId, clinicId, patientId, now, now, now);
		db.prepare(
			`insert into programme_item (id, programme_id, exercise_id, position, sets, reps, sessions_per_day, days_per_week)
			 values (?, ?, ?, 0, 1, 8, 3, 7)`
		).run(crypto.randomUUID(), programmeId, exerciseId);
	} finally {
		db.close();
	}
	return email;
}
