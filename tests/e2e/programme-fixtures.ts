/**
 * Small factories for patients with home programmes, straight into the e2e database (the way
 * support.ts seeds recordings): a patient who can sign in, an exercise on a segment, and a
 * programme of items with their own dosage.
 */
import { hash } from '@node-rs/argon2';
import { database, DEMO_PASSWORD } from './support';

/** A patient of the clinic of `clinicianEmail` who signs in with the demo password. */
export async function seedSignInPatient(
	clinicianEmail: string,
	{ name = 'Seeded Patient', timeZone = 'Europe/London' } = {}
): Promise<{ patientId: string; email: string }> {
	const db = database();
	const patientId = crypto.randomUUID();
	const email = `patient-${patientId.slice(0, 8)}@alder-street.example`;
	try {
		const { clinicId } = db
			.prepare(
				'select m.clinic_id as clinicId from membership m join user u on u.id = m.user_id where u.email = ?'
			)
			.get(clinicianEmail) as { clinicId: string };
		const userId = crypto.randomUUID();
		const now = Date.now();
		db.prepare(
			'insert into user (id, name, email, password_hash, created_at) values (?, ?, ?, ?, ?)'
		).run(userId, name, email, await hash(DEMO_PASSWORD), now);
		db.prepare(
			`insert into patient (id, clinic_id, user_id, full_name, email, condition, time_zone, created_at)
			 values (?, ?, ?, ?, ?, 'Left total knee replacement', ?, ?)`
		).run(patientId, clinicId, userId, name, email, timeZone, now);
	} finally {
		db.close();
	}
	return { patientId, email };
}

export interface SeedItem {
	title: string;
	segmentId?: string | null;
	safetyNotes?: string;
	sets?: number;
	reps?: number;
	holdSeconds?: number;
	restSeconds?: number;
	sessionsPerDay?: number;
	daysPerWeek?: number;
}

/**
 * A programme for a patient with one item per exercise given (each exercise made in the
 * patient's clinic). `publishedAt` defaults to now for a published programme; give an older time
 * to keep a programme the patient already follows as their current one.
 */
export function seedProgramme(
	patientId: string,
	items: SeedItem[],
	{
		status = 'published' as 'draft' | 'published' | 'ended',
		startDate = new Date().toISOString().slice(0, 10),
		title = 'Knee programme',
		note = '',
		publishedAt = Date.now()
	} = {}
): { programmeId: string; itemIds: string[]; exerciseIds: string[] } {
	const db = database();
	const programmeId = crypto.randomUUID();
	const itemIds: string[] = [];
	const exerciseIds: string[] = [];
	try {
		const { clinicId } = db
			.prepare('select clinic_id as clinicId from patient where id = ?')
			.get(patientId) as { clinicId: string };
		const now = Date.now();
		db.prepare(
			`insert into programme (id, clinic_id, patient_id, title, status, start_date, note, created_at, updated_at, published_at)
			 values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`
		).run(
			programmeId,
			clinicId,
			patientId,
			title,
			status,
			startDate,
			note,
			now,
			now,
			status === 'draft' ? null : publishedAt
		);
		items.forEach((item, position) => {
			const exerciseId = crypto.randomUUID();
			const dosage = {
				sets: item.sets ?? 2,
				reps: item.reps ?? 5,
				hold: item.holdSeconds ?? 0,
				rest: item.restSeconds ?? 30,
				sessions: item.sessionsPerDay ?? 3,
				days: item.daysPerWeek ?? 7
			};
			db.prepare(
				`insert into exercise (id, clinic_id, segment_id, title, body_region, position, movement_type, safety_notes,
				 sets, reps, hold_seconds, rest_seconds, sessions_per_day, days_per_week, status, created_at, updated_at)
				 values (?, ?, ?, ?, 'Knee', 'supine', 'active', ?, ?, ?, ?, ?, ?, ?, 'ready', ?, ?)`
			).run(
				exerciseId,
				clinicId,
				item.segmentId ?? null,
				item.title,
				item.safetyNotes ?? '',
				dosage.sets,
				dosage.reps,
				dosage.hold,
				dosage.rest,
				dosage.sessions,
				dosage.days,
				now,
				now
			);
			const itemId = crypto.randomUUID();
			db.prepare(
				`insert into programme_item (id, programme_id, exercise_id, position, sets, reps, hold_seconds,
				 rest_seconds, sessions_per_day, days_per_week) values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`
			).run(
				itemId,
				programmeId,
				exerciseId,
				position,
				dosage.sets,
				dosage.reps,
				dosage.hold,
				dosage.rest,
				dosage.sessions,
				dosage.days
			);
			itemIds.push(itemId);
			exerciseIds.push(exerciseId);
		});
	} finally {
		db.close();
	}
	return { programmeId, itemIds, exerciseIds };
}

/** An exercise in the clinic of `clinicianEmail`, ready to be added to a programme. */
export function seedExercise(
	clinicianEmail: string,
	exercise: {
		title: string;
		segmentId: string;
		bodyRegion: string;
		position: string;
		movementType: string;
		equipment?: string[];
		precautionTags?: string[];
		safetyNotes?: string;
		phase?: number;
	}
): string {
	const db = database();
	const id = crypto.randomUUID();
	try {
		const { clinicId } = db
			.prepare(
				'select m.clinic_id as clinicId from membership m join user u on u.id = m.user_id where u.email = ?'
			)
			.get(clinicianEmail) as { clinicId: string };
		const now = Date.now();
		db.prepare(
			`insert into exercise (id, clinic_id, segment_id, title, body_region, side, position, movement_type,
			 equipment, phase, safety_notes, precaution_tags, sets, reps, hold_seconds, rest_seconds,
			 sessions_per_day, days_per_week, status, created_at, updated_at)
			 values (?, ?, ?, ?, ?, 'either', ?, ?, ?, ?, ?, ?, 1, 8, 0, 0, 3, 7, 'ready', ?, ?)`
		).run(
			id,
			clinicId,
			exercise.segmentId,
			exercise.title,
			exercise.bodyRegion,
			exercise.position,
			exercise.movementType,
			JSON.stringify(exercise.equipment ?? []),
			exercise.phase ?? 2,
			exercise.safetyNotes ?? '',
			JSON.stringify(exercise.precautionTags ?? []),
			now,
			now
		);
	} finally {
		db.close();
	}
	return id;
}

/** The session logs of a patient, newest first, read back from the database. */
export function sessionLogsOf(
	patientId: string
): { clientId: string; setsDone: number; repsDone: number; pain: number; note: string }[] {
	const db = database();
	try {
		return db
			.prepare(
				`select client_id as clientId, sets_done as setsDone, reps_done as repsDone, pain, note
				 from session_log where patient_id = ? order by created_at desc`
			)
			.all(patientId) as {
			clientId: string;
			setsDone: number;
			repsDone: number;
			pain: number;
			note: string;
		}[];
	} finally {
		db.close();
	}
}
