/**
 * Shared test factories, written through the app's own schema: a clinic, a staff member, a
 * patient, a recording and its segment, an exercise, a programme with its items and a logged
 * session. Each takes only what differs from a plain default (the table's own insert type) and
 * returns the row as stored. They open the database only when called, so a test file may still
 * choose its own DATABASE_PATH first: import them after it (`await import('./factories')`).
 * Media for a recording (a clip made with ffmpeg, stored or uploaded) is in recordings-support.ts.
 */
import { hashPassword } from '$lib/server/auth/passwords';
import { db, schema } from '$lib/server/db';

type NewClinic = typeof schema.clinics.$inferInsert;
type NewUser = typeof schema.users.$inferInsert;
type NewPatient = typeof schema.patients.$inferInsert;
type NewRecording = typeof schema.recordings.$inferInsert;
type NewSegment = typeof schema.segments.$inferInsert;
type NewExercise = typeof schema.exercises.$inferInsert;
type NewProgramme = typeof schema.programmes.$inferInsert;
type NewProgrammeItem = typeof schema.programmeItems.$inferInsert;
type NewSessionLog = typeof schema.sessionLogs.$inferInsert;
type Role = (typeof schema.memberships.$inferInsert)['role'];
type Patient = typeof schema.patients.$inferSelect;
type Recording = typeof schema.recordings.$inferSelect;

/** A staff member as made here: their user row, with their clinic and role. */
export type Staff = typeof schema.users.$inferSelect & { clinicId: string; role: Role };

/** Words to an address part: "Ada Quill" → "ada.quill". */
const slug = (words: string) => words.toLowerCase().replace(/\W+/g, '.');
/** Keeps made-up addresses apart between calls (addresses are unique per table or clinic). */
const unique = () => crypto.randomUUID().slice(0, 8);

export function makeClinic(name: string, changes: Partial<NewClinic> = {}) {
	return db()
		.insert(schema.clinics)
		.values({ name, ...changes })
		.returning()
		.get();
}

/**
 * A member of the clinic's staff with `role`: a user and their membership. Without a password,
 * as after accepting an invitation by e-mailed link (makeStaffWithPassword gives one).
 */
export function makeStaff(
	clinicId: string,
	role: Role = 'clinician',
	changes: Partial<NewUser> = {}
): Staff {
	const name = changes.name ?? `Test ${role}`;
	const user = db()
		.insert(schema.users)
		.values({ email: `${slug(name)}.${unique()}@tests.example`, name, ...changes })
		.returning()
		.get();
	db().insert(schema.memberships).values({ userId: user.id, clinicId, role }).run();
	return { ...user, clinicId, role };
}

/** A staff member who signs in with `password`, hashed as the app hashes it (argon2id). */
export async function makeStaffWithPassword(
	clinicId: string,
	role: Role,
	password: string,
	changes: Partial<NewUser> = {}
): Promise<Staff> {
	return makeStaff(clinicId, role, { ...changes, passwordHash: await hashPassword(password) });
}

/**
 * A patient of the clinic (a record without a sign-in), looked after by the `careOf` clinicians.
 * The address is made from the name at `emailDomain` unless `email` is given.
 */
export function makePatient(
	clinicId: string,
	fullName: string,
	{
		emailDomain = 'tests.example',
		careOf = [],
		...changes
	}: Partial<NewPatient> & { emailDomain?: string; careOf?: { id: string }[] } = {}
): Patient {
	const patient = db()
		.insert(schema.patients)
		.values({
			clinicId,
			fullName,
			email: `${slug(fullName)}.${unique()}@${emailDomain}`,
			timeZone: 'Europe/London',
			...changes
		})
		.returning()
		.get();
	for (const clinician of careOf) {
		db()
			.insert(schema.patientClinicians)
			.values({ patientId: patient.id, clinicianUserId: clinician.id })
			.run();
	}
	return patient;
}

/** A recording row (30 s, 320×240, H.264, ready unless `status` says otherwise); no media. */
export function makeRecording(clinicId: string, changes: Partial<NewRecording> = {}): Recording {
	const status = changes.status ?? 'ready';
	return db()
		.insert(schema.recordings)
		.values({
			clinicId,
			title: 'Knee class',
			originalFilename: 'knee.mp4',
			contentType: 'video/mp4',
			sizeBytes: 1,
			durationSeconds: 30,
			width: 320,
			height: 240,
			videoCodec: 'h264',
			status,
			readyAt: status === 'ready' ? new Date() : null,
			...changes
		})
		.returning()
		.get();
}

/**
 * A segment of the recording, cut and ready unless `status` says otherwise: by default the whole
 * recording, with one poster. No media: library-support's makeSegment stores its clip too.
 */
export function makeSegment(
	recording: Pick<Recording, 'id' | 'clinicId' | 'durationSeconds'>,
	changes: Partial<NewSegment> = {}
) {
	const { status = 'ready', startSeconds = 0, endSeconds = recording.durationSeconds } = changes;
	return db()
		.insert(schema.segments)
		.values({
			recordingId: recording.id,
			clinicId: recording.clinicId,
			position: 0,
			title: 'Heel slides',
			startSeconds,
			endSeconds,
			status,
			clipDurationSeconds: status === 'cutting' ? null : endSeconds - startSeconds,
			posterCount: 1,
			...changes
		})
		.returning()
		.get();
}

/** A ready exercise of the clinic (a knee exercise lying down, 1 × 8, three times a day). */
export function makeExercise(
	clinicId: string,
	title = 'Heel slides',
	changes: Partial<NewExercise> = {}
) {
	return db()
		.insert(schema.exercises)
		.values({
			clinicId,
			title,
			bodyRegion: 'Knee',
			position: 'supine',
			movementType: 'active',
			sets: 1,
			reps: 8,
			sessionsPerDay: 3,
			daysPerWeek: 7,
			status: 'ready',
			...changes
		})
		.returning()
		.get();
}

/**
 * A programme for the patient, published unless `status` says otherwise, of one item per
 * exercise given, each with the dosage in `item`; returns the programme and its items.
 */
export function makeProgramme(
	patient: Pick<Patient, 'id' | 'clinicId'>,
	exerciseIds: string[],
	{ item = {}, ...changes }: Partial<NewProgramme> & { item?: Partial<NewProgrammeItem> } = {}
) {
	const status = changes.status ?? 'published';
	const programme = db()
		.insert(schema.programmes)
		.values({
			clinicId: patient.clinicId,
			patientId: patient.id,
			title: 'Knee programme',
			status,
			startDate: '2026-03-02',
			publishedAt: status === 'draft' ? null : new Date(),
			...changes
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
				sessionsPerDay: 3,
				daysPerWeek: 7,
				progression: { kind: 'reps', addPerWeek: 2, ceiling: 15 },
				...item
			})
			.returning()
			.get()
	);
	return { programme, items };
}

/**
 * A session the patient logged for a programme item, stored as it is (no checks): on `localDate`
 * at 10:00 UTC unless `doneAt` says otherwise, one set of 8 and no pain.
 */
export function makeSessionLog(
	patient: Pick<Patient, 'id' | 'clinicId'>,
	programmeItemId: string,
	{ localDate = '2026-03-02', ...changes }: Partial<NewSessionLog> = {}
) {
	return db()
		.insert(schema.sessionLogs)
		.values({
			clinicId: patient.clinicId,
			patientId: patient.id,
			programmeItemId,
			clientId: crypto.randomUUID(),
			doneAt: new Date(`${localDate}T10:00:00Z`),
			localDate,
			setsDone: 1,
			repsDone: 8,
			pain: 0,
			...changes
		})
		.returning()
		.get();
}
