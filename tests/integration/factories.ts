/**
 * Shared test factories: a clinic, a patient, a ready exercise and a published programme, written
 * through the app's own schema. They open the database only when called, so a test file may
 * still choose its own DATABASE_PATH before its first call.
 */
import { db, schema } from '$lib/server/db';

type Patient = typeof schema.patients.$inferSelect;
type ProgrammeStatus = (typeof schema.programmes.$inferInsert)['status'];

export function makeClinic(name: string) {
	return db().insert(schema.clinics).values({ name }).returning().get();
}

export function makePatient(
	clinicId: string,
	name: string,
	{ timeZone = 'Europe/London', emailDomain = 'tests.example' } = {}
): Patient {
	return db()
		.insert(schema.patients)
		.values({
			clinicId,
			fullName: name,
			email: `${name.toLowerCase().replace(/\W+/g, '.')}@${emailDomain}`,
			timeZone
		})
		.returning()
		.get();
}

export function makeExercise(clinicId: string, title: string, safetyNotes = '') {
	return db()
		.insert(schema.exercises)
		.values({
			clinicId,
			title,
			bodyRegion: 'Knee',
			position: 'supine',
			movementType: 'active',
			safetyNotes,
			sets: 1,
			reps: 8,
			sessionsPerDay: 3,
			daysPerWeek: 7,
			status: 'ready'
		})
		.returning()
		.get();
}

/** A programme of one item per exercise given; returns the programme and its items. */
export function makeProgramme(
	patient: Patient,
	exerciseIds: string[],
	{
		status = 'published' as ProgrammeStatus,
		startDate = '2026-03-02',
		endDate = null as string | null,
		sessionsPerDay = 3,
		daysPerWeek = 7
	} = {}
) {
	const programme = db()
		.insert(schema.programmes)
		.values({
			clinicId: patient.clinicId,
			patientId: patient.id,
			title: 'Knee programme',
			status,
			startDate,
			endDate,
			publishedAt: status === 'draft' ? null : new Date()
		})
		.returning()
		.get();
	const items = exerciseIds.map((exerciseId, position) =>
		db()
			.insert(schema.programmeItems)
			.values({
				programmeId: programme.id,
				exerciseId,
				position,
				sets: 2,
				reps: 8,
				holdSeconds: 0,
				restSeconds: 30,
				sessionsPerDay,
				daysPerWeek,
				progression: { kind: 'reps', addPerWeek: 2, ceiling: 15 }
			})
			.returning()
			.get()
	);
	return { programme, items };
}
