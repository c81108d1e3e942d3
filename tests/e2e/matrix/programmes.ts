import { database } from '../support';
import { clinicianApi, everyone, onlyPage, type Fixture, type MatrixPart } from './types';

/** An exercise (no segment) straight into the e2e database; returns its id. */
function insertExercise(clinicId: string, title: string): string {
	const db = database();
	const id = crypto.randomUUID();
	try {
		const now = Date.now();
		db.prepare(
			`insert into exercise (id, clinic_id, title, body_region, position, movement_type, sets, reps,
			 sessions_per_day, days_per_week, status, created_at, updated_at)
			 values (?, ?, ?, 'Knee', 'supine', 'active', 1, 8, 3, 7, 'draft', ?, ?)`
		).run(id, clinicId, title, now, now);
	} finally {
		db.close();
	}
	return id;
}

/** A programme of one item for a patient; returns the programme's id. */
function insertProgramme(patientId: string, exerciseId: string, status: string): string {
	const db = database();
	const id = crypto.randomUUID();
	try {
		const { clinicId } = db
			.prepare('select clinic_id as clinicId from patient where id = ?')
			.get(patientId) as { clinicId: string };
		const now = Date.now();
		db.prepare(
			`insert into programme (id, clinic_id, patient_id, title, status, start_date, created_at, updated_at, published_at)
			 values (?, ?, ?, 'Matrix programme', ?, '2026-11-10', ?, ?, ?)`
		).run(id, clinicId, patientId, status, now, now, status === 'published' ? now : null);
		db.prepare(
			`insert into programme_item (id, programme_id, exercise_id, position, sets, reps, hold_seconds,
			 rest_seconds, sessions_per_day, days_per_week) values (?, ?, ?, 0, 1, 8, 0, 30, 3, 7)`
		).run(crypto.randomUUID(), id, exerciseId);
	} finally {
		db.close();
	}
	return id;
}

const ownOrOther = (own: number) => ({ ...onlyPage('clinician'), clinician: own });

/** Exercises, patients' details and programmes (the builder, its JSON API and the printed sheet). */
export const programmesPart: MatrixPart = {
	seed(f: Fixture) {
		const exerciseId = insertExercise(f.clinicId, 'Matrix exercise');
		const otherClinicExerciseId = insertExercise(f.otherClinicId, 'Other clinic exercise');
		return {
			exerciseId,
			otherClinicExerciseId,
			programmeId: insertProgramme(f.patientId, exerciseId, 'draft'),
			otherClinicProgrammeId: insertProgramme(
				f.otherClinicPatientId,
				otherClinicExerciseId,
				'published'
			)
		};
	},
	rows: [
		{ route: '/(clinician)/exercises', path: () => '/exercises', expect: onlyPage('clinician') },
		{
			route: '/(clinician)/exercises',
			note: 'searched and filtered',
			path: () => '/exercises?q=knee&status=ready&position=supine&phase=2&equipment=chair',
			expect: onlyPage('clinician')
		},
		{
			route: '/(clinician)/exercises/new',
			path: () => '/exercises/new',
			expect: onlyPage('clinician')
		},
		{
			route: '/(clinician)/exercises/[id=id]',
			note: "own clinic's exercise",
			path: (f) => `/exercises/${f.extra.exerciseId}`,
			expect: onlyPage('clinician')
		},
		{
			route: '/(clinician)/exercises/[id=id]',
			note: "another clinic's exercise",
			path: (f) => `/exercises/${f.extra.otherClinicExerciseId}`,
			expect: ownOrOther(404)
		},
		{
			route: '/api/safety-notes/preview',
			note: 'POST only (its roles are checked in programmes.e2e.ts)',
			path: () => '/api/safety-notes/preview',
			expect: everyone(405)
		},
		{
			route: '/(clinician)/patients/[id=id]/details',
			note: "own clinic's patient",
			path: (f) => `/patients/${f.patientId}/details`,
			expect: onlyPage('clinician')
		},
		{
			route: '/(clinician)/patients/[id=id]/details',
			note: "another clinic's patient",
			path: (f) => `/patients/${f.otherClinicPatientId}/details`,
			expect: ownOrOther(404)
		},
		{
			route: '/(clinician)/programmes/new',
			note: 'for a patient of the clinic',
			path: (f) => `/programmes/new?patient=${f.patientId}`,
			expect: onlyPage('clinician')
		},
		{
			route: '/(clinician)/programmes/new',
			note: "for another clinic's patient",
			path: (f) => `/programmes/new?patient=${f.otherClinicPatientId}`,
			expect: ownOrOther(404)
		},
		{
			route: '/(clinician)/programmes/[id=id]',
			note: "own clinic's programme",
			path: (f) => `/programmes/${f.extra.programmeId}`,
			expect: onlyPage('clinician')
		},
		{
			route: '/(clinician)/programmes/[id=id]',
			note: "another clinic's programme",
			path: (f) => `/programmes/${f.extra.otherClinicProgrammeId}`,
			expect: ownOrOther(404)
		},
		{
			route: '/(clinician)/programmes/[id=id]/sheet',
			note: "own clinic's programme",
			path: (f) => `/programmes/${f.extra.programmeId}/sheet`,
			expect: onlyPage('clinician')
		},
		{
			route: '/(clinician)/programmes/[id=id]/sheet',
			note: "another clinic's programme",
			path: (f) => `/programmes/${f.extra.otherClinicProgrammeId}/sheet`,
			expect: ownOrOther(404)
		},
		{
			route: '/api/programmes/[id=id]',
			note: "own clinic's programme",
			path: (f) => `/api/programmes/${f.extra.programmeId}`,
			expect: clinicianApi(200)
		},
		{
			route: '/api/programmes/[id=id]',
			note: "another clinic's programme",
			path: (f) => `/api/programmes/${f.extra.otherClinicProgrammeId}`,
			expect: clinicianApi(404)
		}
	]
};
