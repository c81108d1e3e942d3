import { and, asc, count, desc, eq, inArray, ne } from 'drizzle-orm';
import { localDateOf } from '$lib/clinical/calendar';
import { describeDosage, dosageOf, type Progression } from '$lib/dosage';
import type { ProgrammeSaveData } from '$lib/programmes/schema';
import { config } from '../config';
import { db } from '../db';
import {
	exercises,
	programmeItems,
	programmes,
	sessionLogs,
	type Patient,
	type Programme,
	type ProgrammeItem
} from '../db/schema';
import type { Principal } from '../auth/principal';
import { withSegments, type ExerciseRow } from '../exercises';
import { sendMail } from '../mail';
import { programmePublishedMail } from '../mail/templates';
import { findPatientInClinic } from '../patients';

/** A refusal the clinician can act on; `status` is the HTTP status to answer it with. */
export class ProgrammeError extends Error {
	constructor(
		message: string,
		readonly status: 400 | 404 | 409 = 409
	) {
		super(message);
	}
}

export type ProgrammeItemView = ProgrammeItem & { exercise: ExerciseRow; logCount: number };

export interface ProgrammeView {
	programme: Programme;
	patient: Patient;
	items: ProgrammeItemView[];
}

/** Today in the patient's own calendar. */
export function patientToday(patient: Pick<Patient, 'timeZone'>, now = new Date()): string {
	return localDateOf(now, patient.timeZone);
}

function programmeInClinic(clinicId: string, programmeId: string): Programme | undefined {
	return db()
		.select()
		.from(programmes)
		.where(and(eq(programmes.id, programmeId), eq(programmes.clinicId, clinicId)))
		.get();
}

/** A programme of the clinic with its patient and its items in order; null for any other id. */
export function findProgramme(clinicId: string, programmeId: string): ProgrammeView | null {
	const programme = programmeInClinic(clinicId, programmeId);
	if (!programme) return null;
	const patient = findPatientInClinic(clinicId, programme.patientId);
	if (!patient) return null;
	const rows = db()
		.select({ item: programmeItems, exercise: exercises })
		.from(programmeItems)
		.innerJoin(exercises, eq(exercises.id, programmeItems.exerciseId))
		.where(eq(programmeItems.programmeId, programme.id))
		.orderBy(asc(programmeItems.position))
		.all();
	const withSegment = withSegments(rows.map((r) => r.exercise));
	const logCounts = new Map<string, number>();
	if (rows.length > 0) {
		for (const r of db()
			.select({ id: sessionLogs.programmeItemId, n: count() })
			.from(sessionLogs)
			.where(
				inArray(
					sessionLogs.programmeItemId,
					rows.map((r) => r.item.id)
				)
			)
			.groupBy(sessionLogs.programmeItemId)
			.all())
			logCounts.set(r.id, r.n);
	}
	return {
		programme,
		patient,
		items: rows.map((r, i) => ({
			...r.item,
			exercise: withSegment[i],
			logCount: logCounts.get(r.item.id) ?? 0
		}))
	};
}

/** A patient's programmes, newest first. */
export function listProgrammesForPatient(clinicId: string, patientId: string): Programme[] {
	return db()
		.select()
		.from(programmes)
		.where(and(eq(programmes.clinicId, clinicId), eq(programmes.patientId, patientId)))
		.orderBy(desc(programmes.createdAt))
		.all();
}

/** Starts an empty draft programme for a patient of the clinician's clinic. */
export function createProgramme(
	clinician: Principal,
	patientId: string,
	input: { title: string; startDate: string; endDate: string | null }
): Programme {
	const patient = findPatientInClinic(clinician.clinicId, patientId);
	if (!patient) throw new ProgrammeError('That patient is not in your clinic.', 404);
	return db()
		.insert(programmes)
		.values({
			clinicId: clinician.clinicId,
			patientId,
			title: input.title,
			startDate: input.startDate,
			endDate: input.endDate,
			createdBy: clinician.id
		})
		.returning()
		.get();
}

/**
 * Saves the whole programme as the builder shows it: its fields, then its items in order. An
 * item keeps its id while it stays (session logs and the printed sheet's codes point at it); a
 * new row gets a new id. An item with logged sessions cannot be removed, so a patient's record
 * is never lost — end the programme and start a new one instead. New rows take only exercises
 * of the clinic that are ready; rows already there keep theirs even if retired since.
 */
export function saveProgramme(
	clinician: Principal,
	programmeId: string,
	input: ProgrammeSaveData
): ProgrammeView {
	const store = db();
	store.transaction((tx) => {
		const programme = tx
			.select()
			.from(programmes)
			.where(and(eq(programmes.id, programmeId), eq(programmes.clinicId, clinician.clinicId)))
			.get();
		if (!programme) throw new ProgrammeError('Not found.', 404);
		if (programme.status === 'ended')
			throw new ProgrammeError('This programme has ended and can no longer change.');

		const existing = tx
			.select()
			.from(programmeItems)
			.where(eq(programmeItems.programmeId, programmeId))
			.all();
		const existingById = new Map(existing.map((i) => [i.id, i]));
		for (const item of input.items) {
			if (item.id && !existingById.has(item.id))
				throw new ProgrammeError(
					'An exercise row no longer belongs to this programme. Reload the page to see its current state.'
				);
		}
		const exerciseIds = [...new Set(input.items.map((i) => i.exerciseId))];
		const found =
			exerciseIds.length === 0
				? []
				: tx
						.select({ id: exercises.id, status: exercises.status, title: exercises.title })
						.from(exercises)
						.where(
							and(inArray(exercises.id, exerciseIds), eq(exercises.clinicId, clinician.clinicId))
						)
						.all();
		const exerciseById = new Map(found.map((e) => [e.id, e]));
		for (const item of input.items) {
			const exercise = exerciseById.get(item.exerciseId);
			if (!exercise) throw new ProgrammeError('One of the exercises is not in your clinic.', 400);
			const kept = item.id ? existingById.get(item.id) : undefined;
			const sameExercise = kept?.exerciseId === item.exerciseId;
			if (!sameExercise && exercise.status !== 'ready')
				throw new ProgrammeError(
					`“${exercise.title}” is not ready yet (or is retired): mark it ready on its page first.`
				);
		}

		const keptIds = new Set(input.items.flatMap((i) => (i.id ? [i.id] : [])));
		const removed = existing.filter((i) => !keptIds.has(i.id));
		if (removed.length > 0) {
			const logged = tx
				.select({ id: sessionLogs.programmeItemId })
				.from(sessionLogs)
				.where(
					inArray(
						sessionLogs.programmeItemId,
						removed.map((r) => r.id)
					)
				)
				.limit(1)
				.get();
			if (logged)
				throw new ProgrammeError(
					'An exercise you removed has sessions logged against it. To keep the patient’s record, end this programme and start a new one instead.'
				);
			tx.delete(programmeItems)
				.where(
					inArray(
						programmeItems.id,
						removed.map((r) => r.id)
					)
				)
				.run();
		}

		input.items.forEach((item, position) => {
			const values = {
				...item.dosage,
				weekdays: item.weekdays ?? null,
				rangeGuides: item.rangeGuides ?? [],
				progression: item.progression,
				position
			};
			if (item.id) {
				tx.update(programmeItems)
					.set({ ...values, exerciseId: item.exerciseId })
					.where(eq(programmeItems.id, item.id))
					.run();
			} else {
				tx.insert(programmeItems)
					.values({ ...values, programmeId, exerciseId: item.exerciseId })
					.run();
			}
		});

		tx.update(programmes)
			.set({
				title: input.title,
				startDate: input.startDate,
				endDate: input.endDate,
				note: input.note,
				updatedAt: new Date()
			})
			.where(eq(programmes.id, programmeId))
			.run();
	});
	const view = findProgramme(clinician.clinicId, programmeId);
	if (!view) throw new ProgrammeError('Not found.', 404);
	return view;
}

export interface Published {
	view: ProgrammeView;
	/** Whether it had been published before (the e-mail then says it changed). */
	changed: boolean;
	/** Programmes of the same patient ended because this one replaced them. */
	ended: number;
}

/**
 * Publishes a programme (or, when it is published already, tells the patient it changed) and
 * e-mails the patient. Any other published programme of the patient ends: a patient follows one
 * programme at a time. The database is updated before the e-mail goes; a mail failure is thrown
 * to the caller with the programme published, so sending again is safe.
 */
export async function publishProgramme(
	clinician: Principal,
	programmeId: string
): Promise<Published> {
	const before = findProgramme(clinician.clinicId, programmeId);
	if (!before) throw new ProgrammeError('Not found.', 404);
	if (before.programme.status === 'ended')
		throw new ProgrammeError('This programme has ended; start a new one instead.');
	if (before.items.length === 0)
		throw new ProgrammeError('Add at least one exercise before publishing.', 400);
	const missing = before.items.find((i) => !i.exercise.segmentId);
	if (missing)
		throw new ProgrammeError(
			`“${missing.exercise.title}” has no demonstration to replay. Choose its segment on the exercise page first.`,
			400
		);
	const changed = before.programme.status === 'published';
	let ended = 0;
	db().transaction((tx) => {
		ended = tx
			.update(programmes)
			.set({ status: 'ended', updatedAt: new Date() })
			.where(
				and(
					eq(programmes.patientId, before.patient.id),
					eq(programmes.status, 'published'),
					ne(programmes.id, programmeId)
				)
			)
			.run().changes;
		tx.update(programmes)
			.set({
				status: 'published',
				publishedAt: new Date(),
				updatedAt: new Date()
			})
			.where(eq(programmes.id, programmeId))
			.run();
	});
	const view = findProgramme(clinician.clinicId, programmeId)!;
	await sendMail({
		clinicId: clinician.clinicId,
		to: view.patient.email,
		...programmePublishedMail({
			clinicName: clinician.clinicName,
			patientName: view.patient.fullName,
			clinicianName: clinician.name,
			title: view.programme.title,
			startDate: view.programme.startDate,
			exercises: view.items.map((i) => ({
				title: i.exercise.title,
				dosage: describeDosage(i, i.weekdays)
			})),
			url: new URL('/today', config().ORIGIN).toString(),
			changed,
			hasAccount: view.patient.userId !== null
		})
	});
	return { view, changed, ended };
}

/** Ends a programme: the patient no longer sees it as today's; its logs stay. */
export function endProgramme(clinician: Principal, programmeId: string): Programme {
	const programme = programmeInClinic(clinician.clinicId, programmeId);
	if (!programme) throw new ProgrammeError('Not found.', 404);
	return db()
		.update(programmes)
		.set({ status: 'ended', updatedAt: new Date() })
		.where(eq(programmes.id, programmeId))
		.returning()
		.get();
}

/** Starts a new draft for the same patient with the same exercises, dosages and progressions. */
export function copyProgramme(
	clinician: Principal,
	programmeId: string,
	startDate: string
): Programme {
	const view = findProgramme(clinician.clinicId, programmeId);
	if (!view) throw new ProgrammeError('Not found.', 404);
	return db().transaction((tx) => {
		const copy = tx
			.insert(programmes)
			.values({
				clinicId: clinician.clinicId,
				patientId: view.patient.id,
				title: view.programme.title,
				startDate,
				note: view.programme.note,
				createdBy: clinician.id
			})
			.returning()
			.get();
		view.items.forEach((item, position) => {
			tx.insert(programmeItems)
				.values({
					...dosageOf(item),
					weekdays: item.weekdays,
					rangeGuides: item.rangeGuides,
					progression: item.progression as Progression,
					position,
					programmeId: copy.id,
					exerciseId: item.exerciseId
				})
				.run();
		});
		return copy;
	});
}
