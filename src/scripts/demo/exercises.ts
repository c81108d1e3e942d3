import { dosageOf } from '../../lib/dosage';
import { and, eq, isNull } from 'drizzle-orm';
import { addDays } from '../../lib/clinical/calendar';
import type { ExerciseInput } from '../../lib/exercises/schema';
import { loadPrincipal } from '../../lib/server/auth/principal';
import { db, schema } from '../../lib/server/db';
import { createExercise, updateExercise } from '../../lib/server/exercises';
import {
	createProgramme,
	patientToday,
	publishProgramme,
	saveProgramme
} from '../../lib/server/programmes';

/**
 * The demo clinic's exercises, one per demonstration segment of the knee-replacement clips (the
 * segments carry the same titles), and two programmes for the demo patient: the first weeks at
 * home, published (so the patient's pages have something to show and the inbox has the e-mail),
 * and a draft for weeks 2 to 6 whose strengthening exercise and standing balance work raise the
 * builder's flags. The dosages are invented starting points in the spirit of common practice
 * (start low, build up), not advice.
 */

type Definition = Omit<ExerciseInput, 'segmentId' | 'status'>;

const SAFETY_FIRST_WEEK = `Stop and call the clinic if:

- the pain is **sharp** or getting worse,
- the calf becomes hot, red or swollen,
- the wound leaks or looks redder.

Tightness at the end of the movement is normal.`;

const common = {
	bodyRegion: 'Knee',
	side: 'either',
	description: '',
	equipment: [] as string[],
	precautionTags: [] as string[],
	bounds: {},
	secondsPerRep: null,
	progression: { kind: 'none' }
} as const;

const DEFINITIONS: Definition[] = [
	{
		...common,
		title: 'Ankle pumps',
		description: 'Lying on the back, point the toes away and pull them back, both ankles.',
		side: 'both',
		position: 'supine',
		movementType: 'active',
		phase: 2,
		coachingCues: [
			{ text: 'Point your toes away, then pull them up toward your shins.' },
			{ text: 'Slow and controlled; your knees stay still.' }
		],
		safetyNotes: SAFETY_FIRST_WEEK,
		dosage: {
			sets: 1,
			reps: 10,
			holdSeconds: 0,
			restSeconds: 0,
			sessionsPerDay: 4,
			daysPerWeek: 7
		},
		bounds: { reps: { min: 5, max: 30 } }
	},
	{
		...common,
		title: 'Quadriceps sets',
		description: 'Tighten the front of the thigh and press the back of the knee into a towel.',
		position: 'supine',
		movementType: 'active',
		phase: 2,
		equipment: ['Rolled towel'],
		coachingCues: [
			{ text: 'Press the back of your knee down into the towel.' },
			{ text: 'Hold for a count of four, then relax.' },
			{ text: 'Breathe normally.' }
		],
		safetyNotes: SAFETY_FIRST_WEEK,
		dosage: {
			sets: 1,
			reps: 8,
			holdSeconds: 4,
			restSeconds: 30,
			sessionsPerDay: 3,
			daysPerWeek: 7
		},
		progression: { kind: 'reps', addPerWeek: 2, ceiling: 15 },
		bounds: { holdSeconds: { min: 3, max: 10 } }
	},
	{
		...common,
		title: 'Heel slides',
		description: 'Slide the heel toward the bottom to bend the knee, then slide it back.',
		position: 'supine',
		movementType: 'active-assisted',
		phase: 2,
		coachingCues: [
			{ text: 'Slowly slide your heel toward your bottom.' },
			{ text: 'Bend as far as is comfortable, pause, slide back.' },
			{ text: 'Tightness at the end of the bend is normal.' }
		],
		safetyNotes: SAFETY_FIRST_WEEK,
		dosage: {
			sets: 1,
			reps: 8,
			holdSeconds: 1,
			restSeconds: 30,
			sessionsPerDay: 3,
			daysPerWeek: 7
		},
		progression: { kind: 'reps', addPerWeek: 2, ceiling: 15 }
	},
	{
		...common,
		title: 'Straight-leg raise',
		description:
			'With the thigh tight and the knee straight, lift the leg to the other knee’s height.',
		position: 'supine',
		movementType: 'active',
		phase: 2,
		coachingCues: [
			{ text: 'Bend your other knee, foot flat on the bed.' },
			{ text: 'Tighten your thigh so the knee is straight, then lift.' },
			{ text: 'Hold for two seconds and lower slowly.' }
		],
		safetyNotes: `${SAFETY_FIRST_WEEK}\n\nIf the knee bends as you lift, do quadriceps sets instead and ask at your next visit.`,
		dosage: {
			sets: 1,
			reps: 5,
			holdSeconds: 2,
			restSeconds: 30,
			sessionsPerDay: 3,
			daysPerWeek: 7
		},
		progression: { kind: 'reps', addPerWeek: 1, ceiling: 10 }
	},
	{
		...common,
		title: 'Seated knee extension',
		description: 'Sitting tall, straighten the operated knee, hold, and lower slowly.',
		position: 'seated',
		movementType: 'active',
		phase: 3,
		equipment: ['Chair'],
		coachingCues: [
			{ text: 'Sit tall, well back in the chair.' },
			{ text: 'Straighten the knee and pull your toes up.' },
			{ text: 'Hold for two seconds, then lower slowly.' }
		],
		safetyNotes: 'Use a sturdy chair without wheels. Stop if the pain is **sharp**.',
		dosage: {
			sets: 2,
			reps: 8,
			holdSeconds: 2,
			restSeconds: 45,
			sessionsPerDay: 2,
			daysPerWeek: 7
		},
		progression: { kind: 'reps', addPerWeek: 2, ceiling: 12 }
	},
	{
		...common,
		title: 'Sit to stand',
		description: 'From the front of a chair, lean forward and stand up through both legs.',
		side: 'both',
		position: 'seated',
		movementType: 'active',
		phase: 4,
		equipment: ['Chair'],
		precautionTags: ['full-weight-bearing'],
		coachingCues: [
			{ text: 'Feet flat, slightly behind your knees.' },
			{ text: 'Lean forward, nose over your toes, and push up.' },
			{ text: 'Reach back and sit down slowly.' }
		],
		safetyNotes:
			'Use your hands on the chair if you need to. Stop if you feel **dizzy** or the pain is sharp.',
		dosage: {
			sets: 1,
			reps: 5,
			holdSeconds: 0,
			restSeconds: 60,
			sessionsPerDay: 2,
			daysPerWeek: 5
		},
		progression: { kind: 'sets', addAfterWeeks: 2, add: 1, ceiling: 3 },
		bounds: { reps: { min: 3, max: 12 } }
	},
	{
		...common,
		title: 'Standing hamstring curl',
		description: 'Holding a counter, bend the operated knee to bring the heel toward the bottom.',
		position: 'standing',
		movementType: 'active',
		phase: 3,
		equipment: ['Kitchen counter'],
		precautionTags: ['single-leg-standing'],
		coachingCues: [
			{ text: 'Hold the counter lightly; knees side by side.' },
			{ text: 'Bend the knee, heel toward your bottom.' },
			{ text: 'Hold for two seconds and lower slowly.' }
		],
		safetyNotes: 'Always hold on. Stop if the pain is **sharp** or getting worse.',
		dosage: {
			sets: 1,
			reps: 8,
			holdSeconds: 2,
			restSeconds: 45,
			sessionsPerDay: 2,
			daysPerWeek: 7
		},
		progression: { kind: 'reps', addPerWeek: 2, ceiling: 12 }
	}
];

const DEMO_PATIENT_EMAIL = 'patient@alder-street.example';
const FIRST_WEEKS = ['Ankle pumps', 'Quadriceps sets', 'Heel slides', 'Straight-leg raise'];
const WEEKS_2_TO_6 = ['Seated knee extension', 'Sit to stand', 'Standing hamstring curl'];

function currentSegmentTitled(clinicId: string, title: string) {
	return db()
		.select()
		.from(schema.segments)
		.where(
			and(
				eq(schema.segments.clinicId, clinicId),
				eq(schema.segments.title, title),
				eq(schema.segments.status, 'ready'),
				isNull(schema.segments.supersededAt)
			)
		)
		.get();
}

async function waitForSegments(clinicId: string, titles: string[], timeoutMs: number) {
	const until = Date.now() + timeoutMs;
	while (Date.now() < until) {
		if (titles.every((t) => currentSegmentTitled(clinicId, t))) return true;
		await new Promise((r) => setTimeout(r, 2000));
	}
	return false;
}

/**
 * Creates (or completes) the demo exercises and the demo patient's programmes; safe to run
 * again. Waits up to `timeoutMs` for the demo segments to be cut; an exercise whose segment is
 * not there stays a draft without a demonstration, and only exercises with one are published.
 */
export async function seedDemoExercises(
	clinicianEmail: string,
	log: (line: string) => void = console.log,
	{ timeoutMs = 10 * 60_000 }: { timeoutMs?: number } = {}
): Promise<{ exercises: number; published: boolean }> {
	const store = db();
	const user = store.query.users
		.findFirst({ where: eq(schema.users.email, clinicianEmail) })
		.sync();
	const clinician = user ? loadPrincipal(user.id) : null;
	if (!clinician || clinician.role !== 'clinician')
		throw new Error(`No demo clinician ${clinicianEmail}`);

	const allCut = await waitForSegments(
		clinician.clinicId,
		DEFINITIONS.map((d) => d.title),
		timeoutMs
	);
	if (!allCut) log('  some demo segments are not cut yet; their exercises stay drafts');

	const ids = new Map<string, string>();
	for (const definition of DEFINITIONS) {
		const segment = currentSegmentTitled(clinician.clinicId, definition.title);
		const input: ExerciseInput = {
			...definition,
			segmentId: segment?.id ?? null,
			status: segment ? 'ready' : 'draft'
		} as ExerciseInput;
		const existing = store
			.select()
			.from(schema.exercises)
			.where(
				and(
					eq(schema.exercises.clinicId, clinician.clinicId),
					eq(schema.exercises.title, definition.title)
				)
			)
			.get();
		if (existing) {
			// Keep what a clinician changed; only give a demonstration to one that has none yet.
			if (!existing.segmentId && segment)
				updateExercise(clinician, existing.id, { ...input, title: existing.title });
			ids.set(definition.title, existing.id);
		} else {
			ids.set(definition.title, createExercise(clinician, input).id);
		}
	}

	const patient = store.query.patients
		.findFirst({
			where: and(
				eq(schema.patients.clinicId, clinician.clinicId),
				eq(schema.patients.email, DEMO_PATIENT_EMAIL)
			)
		})
		.sync();
	if (!patient) return { exercises: ids.size, published: false };
	const operationDate = patient.operationDate ?? addDays(patientToday(patient), -9);
	if (!patient.operationDate) {
		store
			.update(schema.patients)
			.set({
				operationDate,
				protocol: 'knee-replacement',
				precautions: ['no-kneeling', 'falls-risk']
			})
			.where(eq(schema.patients.id, patient.id))
			.run();
	}
	const already = store
		.select({ id: schema.programmes.id })
		.from(schema.programmes)
		.where(eq(schema.programmes.patientId, patient.id))
		.get();
	if (already) return { exercises: ids.size, published: false };

	const exerciseRows = (titles: string[]) =>
		titles.flatMap((title) => {
			const row = store
				.select()
				.from(schema.exercises)
				.where(eq(schema.exercises.id, ids.get(title)!))
				.get();
			return row && row.status === 'ready' ? [row] : [];
		});
	const itemsOf = (rows: ReturnType<typeof exerciseRows>) =>
		rows.map((e) => ({
			exerciseId: e.id,
			dosage: dosageOf(e),
			progression: e.progression
		}));

	const firstRows = exerciseRows(FIRST_WEEKS);
	let published = false;
	if (firstRows.length > 0) {
		const first = createProgramme(clinician, patient.id, {
			title: 'First weeks at home',
			startDate: addDays(operationDate, 3),
			endDate: addDays(operationDate, 20)
		});
		const items = itemsOf(firstRows);
		// Walter finds the straight-leg raise hard: fewer reps than the exercise's default.
		const raise = items.find((_, i) => firstRows[i].title === 'Straight-leg raise');
		if (raise) raise.dosage = { ...raise.dosage, reps: 3 };
		saveProgramme(clinician, first.id, {
			title: 'First weeks at home',
			startDate: first.startDate,
			endDate: first.endDate,
			note: 'Little and often. Ice and raise the leg after each session if it helps.',
			items
		});
		await publishProgramme(clinician, first.id);
		published = true;
		log(`  published "First weeks at home" for the demo patient with ${items.length} exercises`);
	}
	const laterRows = exerciseRows(WEEKS_2_TO_6);
	if (laterRows.length > 0) {
		const later = createProgramme(clinician, patient.id, {
			title: 'Weeks 2 to 6 (draft)',
			startDate: addDays(operationDate, 14),
			endDate: null
		});
		saveProgramme(clinician, later.id, {
			title: 'Weeks 2 to 6 (draft)',
			startDate: later.startDate,
			endDate: null,
			note: '',
			items: itemsOf(laterRows)
		});
	}
	return { exercises: ids.size, published };
}
