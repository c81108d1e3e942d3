import { dosageOf } from '../../lib/dosage';
import { and, eq, inArray } from 'drizzle-orm';
import {
	addDays,
	datesFrom,
	daysBetween,
	localDateOf,
	startOfLocalDay
} from '../../lib/clinical/calendar';
import { sessionsOfferedOn } from '../../lib/clinical/adherence';
import { hashPassword } from '../../lib/server/auth/passwords';
import { loadPrincipal, type Principal } from '../../lib/server/auth/principal';
import { db, schema } from '../../lib/server/db';
import type { Patient } from '../../lib/server/db/schema/patients';
import { createProgramme, publishProgramme, saveProgramme } from '../../lib/server/programmes';
import { DEMO_PASSWORD } from './seed';

/**
 * Follow-up for the demo clinic: weeks of session logs and goniometer readings, so that the
 * caseload, the patient pages' charts and the weekly digest have something true to say. All of
 * it is invented. Three stories:
 * - Walter Brindle (the demo patient) follows his first weeks at home well, pain easing;
 * - Hilda Crane, an invented patient five weeks after a right knee replacement, whose pain has
 *   risen over the last week — the caseload's pain flag;
 * - Edna Marsh, in the balance class, who logged for two weeks and then stopped — the
 *   "no sessions logged" flag.
 * Safe to run again: a patient who already has logs or readings gets no more.
 */

const HILDA = {
	name: 'Hilda Crane',
	email: 'hilda.crane@alder-street.example',
	condition: 'Right total knee replacement'
};
const EDNA_EMAIL = 'edna.marsh@alder-street.example';
const WALTER_EMAIL = 'patient@alder-street.example';

/** Local clock times of the day's sessions (hours), in the patient's time zone. */
const SESSION_HOURS = [9, 13, 17, 20];

/** A small deterministic sequence, so the demo looks the same on every machine. */
function sequence(seed: number) {
	let state = seed;
	return () => {
		state = (state * 1103515245 + 12345) % 2147483648;
		return state / 2147483648;
	};
}

function ensureHilda(clinician: Principal, passwordHash: string, today: string): Patient {
	const store = db();
	const found = store.query.patients
		.findFirst({
			where: and(
				eq(schema.patients.clinicId, clinician.clinicId),
				eq(schema.patients.email, HILDA.email)
			)
		})
		.sync();
	if (found) return found;
	const user =
		store.query.users.findFirst({ where: eq(schema.users.email, HILDA.email) }).sync() ??
		store
			.insert(schema.users)
			.values({ email: HILDA.email, name: HILDA.name, passwordHash, emailVerified: new Date() })
			.returning()
			.get();
	const patient = store
		.insert(schema.patients)
		.values({
			clinicId: clinician.clinicId,
			userId: user.id,
			fullName: HILDA.name,
			email: HILDA.email,
			affectedSide: 'right',
			condition: HILDA.condition,
			operationDate: addDays(today, -36),
			protocol: 'knee-replacement',
			precautions: ['no-kneeling']
		})
		.returning()
		.get();
	store
		.insert(schema.patientClinicians)
		.values({ patientId: patient.id, clinicianUserId: clinician.id })
		.run();
	return patient;
}

function patientByEmail(clinicId: string, email: string): Patient | undefined {
	return db()
		.query.patients.findFirst({
			where: and(eq(schema.patients.clinicId, clinicId), eq(schema.patients.email, email))
		})
		.sync();
}

function readyExercises(clinicId: string, titles: string[]) {
	const rows = db()
		.select()
		.from(schema.exercises)
		.where(
			and(
				eq(schema.exercises.clinicId, clinicId),
				eq(schema.exercises.status, 'ready'),
				inArray(schema.exercises.title, titles)
			)
		)
		.all();
	return titles.flatMap((t) => rows.filter((r) => r.title === t && r.segmentId));
}

/** A published programme made the way a clinician makes one, unless the patient has any. */
async function ensureProgramme(
	clinician: Principal,
	patient: Patient,
	input: { title: string; startDate: string; titles: string[]; note: string }
): Promise<boolean> {
	const has = db()
		.select({ id: schema.programmes.id })
		.from(schema.programmes)
		.where(eq(schema.programmes.patientId, patient.id))
		.get();
	if (has) return true;
	const exercises = readyExercises(clinician.clinicId, input.titles);
	if (exercises.length === 0) return false;
	const programme = createProgramme(clinician, patient.id, {
		title: input.title,
		startDate: input.startDate,
		endDate: null
	});
	saveProgramme(clinician, programme.id, {
		title: input.title,
		startDate: input.startDate,
		endDate: null,
		note: input.note,
		items: exercises.map((e) => ({
			exerciseId: e.id,
			// Two sessions a day keeps a demo week readable.
			dosage: { ...dosageOf(e), sessionsPerDay: Math.min(e.sessionsPerDay, 2) },
			progression: e.progression
		}))
	});
	await publishProgramme(clinician, programme.id);
	return true;
}

interface LogPlan {
	/** Chance (0–1) that a prescribed session was done on a given date. */
	doneChance: (date: string) => number;
	/** The pain score logged on a date (before a little day-to-day noise). */
	pain: (date: string) => number;
}

/** Session logs for every item of the patient's programmes, from each start up to `today`. */
function logSessions(patient: Patient, today: string, now: Date, plan: LogPlan, seed: number) {
	const store = db();
	const logged = store
		.select({ id: schema.sessionLogs.id })
		.from(schema.sessionLogs)
		.where(eq(schema.sessionLogs.patientId, patient.id))
		.get();
	if (logged) return 0;
	const random = sequence(seed);
	const items = store
		.select({ item: schema.programmeItems, programme: schema.programmes })
		.from(schema.programmeItems)
		.innerJoin(schema.programmes, eq(schema.programmes.id, schema.programmeItems.programmeId))
		.where(
			and(
				eq(schema.programmes.patientId, patient.id),
				inArray(schema.programmes.status, ['published', 'ended'])
			)
		)
		.all();
	let count = 0;
	store.transaction((tx) => {
		for (const { item, programme } of items) {
			const last = programme.endDate && programme.endDate < today ? programme.endDate : today;
			for (const date of datesFrom(programme.startDate, last)) {
				const dayStart = startOfLocalDay(date, patient.timeZone);
				const due = sessionsOfferedOn(
					{
						startDate: programme.startDate,
						endDate: programme.endDate,
						sessionsPerDay: item.sessionsPerDay,
						daysPerWeek: item.daysPerWeek,
						weekdays: item.weekdays
					},
					date
				);
				for (let s = 0; s < due; s++) {
					const doneAt = new Date(dayStart + (SESSION_HOURS[s] ?? 20) * 3_600_000 + s * 60_000);
					if (doneAt > now || random() > plan.doneChance(date)) continue;
					const noise = random() < 0.25 ? (random() < 0.5 ? -1 : 1) : 0;
					tx.insert(schema.sessionLogs)
						.values({
							clinicId: patient.clinicId,
							patientId: patient.id,
							programmeItemId: item.id,
							clientId: crypto.randomUUID(),
							doneAt,
							localDate: localDateOf(doneAt, patient.timeZone),
							setsDone: item.sets,
							repsDone: item.reps,
							pain: Math.max(0, Math.min(10, Math.round(plan.pain(date)) + noise))
						})
						.run();
					count++;
				}
			}
		}
	});
	return count;
}

type Reading = [
	motion: string,
	side: 'left' | 'right',
	mode: 'active' | 'passive',
	degrees: number,
	daysAgo: number
];

function recordReadings(
	clinician: Principal,
	patient: Patient,
	today: string,
	readings: Reading[]
) {
	const store = db();
	const any = store
		.select({ id: schema.romMeasurements.id })
		.from(schema.romMeasurements)
		.where(eq(schema.romMeasurements.patientId, patient.id))
		.get();
	if (any) return 0;
	for (const [motion, side, mode, degrees, daysAgo] of readings) {
		store
			.insert(schema.romMeasurements)
			.values({
				clinicId: clinician.clinicId,
				patientId: patient.id,
				motion,
				side,
				mode,
				degrees,
				measuredOn: addDays(today, -daysAgo),
				recordedBy: clinician.id
			})
			.run();
	}
	return readings.length;
}

/**
 * Adds the demo follow-up (see above). Runs after the demo exercises and programmes exist;
 * without ready exercises only the readings are added. Answers what it added.
 */
export async function seedDemoFollowup(
	clinicianEmail: string,
	log: (line: string) => void = console.log,
	now = new Date()
): Promise<{ logs: number; readings: number }> {
	const store = db();
	const user = store.query.users
		.findFirst({ where: eq(schema.users.email, clinicianEmail) })
		.sync();
	const clinician = user ? loadPrincipal(user.id) : null;
	if (!clinician || clinician.role !== 'clinician') {
		throw new Error(`No demo clinician ${clinicianEmail}`);
	}
	const totals = { logs: 0, readings: 0 };
	const todayIn = (p: Patient) => localDateOf(now, p.timeZone);

	const walter = patientByEmail(clinician.clinicId, WALTER_EMAIL);
	if (walter) {
		const today = todayIn(walter);
		const operated = walter.operationDate ?? addDays(today, -9);
		// Most sessions done; pain easing from 4 to 3 after the first week.
		totals.logs += logSessions(
			walter,
			today,
			now,
			{ doneChance: () => 0.85, pain: (date) => (date > addDays(operated, 7) ? 3 : 4) },
			11
		);
		const first = daysBetween(operated, today) - 3;
		const readings: Reading[] = [
			['knee-flexion', 'right', 'active', 128, first],
			['knee-flexion', 'left', 'active', 68, first],
			['knee-extension', 'left', 'active', -12, first],
			['knee-flexion', 'left', 'active', 81, 1],
			['knee-extension', 'left', 'active', -7, 1]
		];
		totals.readings += recordReadings(
			clinician,
			walter,
			today,
			readings.filter((r) => r[4] >= 0 && (r[4] === 1 ? first > 1 : true))
		);
	}

	const passwordHash = await hashPassword(DEMO_PASSWORD);
	const hildaToday = localDateOf(now, 'Europe/London');
	const hilda = ensureHilda(clinician, passwordHash, hildaToday);
	const hildaStart = addDays(hildaToday, -29);
	const hildaHas = await ensureProgramme(clinician, hilda, {
		title: 'Knee home programme',
		startDate: hildaStart,
		titles: ['Heel slides', 'Quadriceps sets', 'Seated knee extension'],
		note: 'Keep the knee moving little and often.'
	});
	if (hildaHas) {
		// Pain about 2 in the first week, 3 after, then about 5 in the last 7 days.
		totals.logs += logSessions(
			hilda,
			hildaToday,
			now,
			{
				doneChance: (date) => (date > addDays(hildaToday, -7) ? 0.7 : 0.9),
				pain: (date) => (date > addDays(hildaToday, -7) ? 5 : date < addDays(hildaStart, 7) ? 2 : 3)
			},
			23
		);
	}
	totals.readings += recordReadings(clinician, hilda, hildaToday, [
		['knee-flexion', 'left', 'active', 132, 28],
		['knee-flexion', 'right', 'active', 84, 28],
		['knee-extension', 'right', 'active', -10, 28],
		['knee-flexion', 'right', 'active', 95, 21],
		['knee-flexion', 'right', 'passive', 100, 21],
		['knee-flexion', 'right', 'active', 104, 14],
		['knee-extension', 'right', 'active', -5, 14],
		// A small dip, within the 10° a goniometer can be out: not counted as a change.
		['knee-flexion', 'right', 'active', 99, 2],
		['knee-extension', 'right', 'active', -4, 2]
	]);

	const edna = patientByEmail(clinician.clinicId, EDNA_EMAIL);
	if (edna) {
		const today = todayIn(edna);
		const ednaHas = await ensureProgramme(clinician, edna, {
			title: 'Balance class home practice',
			startDate: addDays(today, -24),
			titles: ['Sit to stand'],
			note: 'Stand close to the kitchen counter so you can hold on.'
		});
		if (ednaHas) {
			// Two keen weeks, then nothing: the caseload flags a week without a session.
			totals.logs += logSessions(
				edna,
				today,
				now,
				{ doneChance: (date) => (date < addDays(today, -9) ? 0.9 : 0), pain: () => 1 },
				37
			);
		}
	}
	log(
		`  follow-up: ${totals.logs} session logs and ${totals.readings} range-of-motion readings added`
	);
	return totals;
}
