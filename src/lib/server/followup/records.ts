import { and, asc, desc, eq, gte, inArray } from 'drizzle-orm';
import { db, schema } from '../db';
import type { Patient } from '../db/schema/patients';
import type { Programme, ProgrammeItem, RomMeasurement } from '../db/schema/programmes';
import { localDateOf } from '$lib/clinical/calendar';
import type { FigureInput } from '$lib/followup/figures';

/** A programme item with the exercise's title, as follow-up shows and counts it. */
export interface FollowupItem extends ProgrammeItem {
	exerciseTitle: string;
}

export interface FollowupProgramme extends Programme {
	items: FollowupItem[];
	pauses: { fromDate: string; toDate: string; reason: string }[];
}

/** One stored session log, with the exercise it was for. */
export interface FollowupLog {
	id: string;
	programmeId: string;
	programmeItemId: string;
	exerciseTitle: string;
	doneAt: Date;
	localDate: string;
	setsDone: number;
	repsDone: number;
	pain: number;
	sharpPain: boolean;
	note: string;
}

/** Everything follow-up reads about one patient. */
export interface PatientRecords {
	patient: Patient;
	programmes: FollowupProgramme[];
	logs: FollowupLog[];
	rom: RomMeasurement[];
}

/**
 * The programmes (with items and pauses) and session logs of several patients of one clinic, in
 * a fixed number of queries whatever the number of patients. Logs before `logsFrom` are left out
 * when it is given (the caseload only looks back a few weeks).
 */
export function loadRecords(
	clinicId: string,
	patients: Patient[],
	options: { logsFrom?: string } = {}
): Map<string, PatientRecords> {
	const out = new Map<string, PatientRecords>();
	for (const p of patients) {
		if (p.clinicId !== clinicId) continue;
		out.set(p.id, { patient: p, programmes: [], logs: [], rom: [] });
	}
	const ids = [...out.keys()];
	if (ids.length === 0) return out;
	const store = db();

	const programmes = store
		.select()
		.from(schema.programmes)
		.where(and(eq(schema.programmes.clinicId, clinicId), inArray(schema.programmes.patientId, ids)))
		.orderBy(desc(schema.programmes.startDate), desc(schema.programmes.createdAt))
		.all();
	const programmeIds = programmes.map((p) => p.id);
	const byProgramme = new Map<string, FollowupProgramme>();
	for (const programme of programmes) {
		const full: FollowupProgramme = { ...programme, items: [], pauses: [] };
		byProgramme.set(programme.id, full);
		out.get(programme.patientId)!.programmes.push(full);
	}

	if (programmeIds.length > 0) {
		const items = store
			.select({ item: schema.programmeItems, exerciseTitle: schema.exercises.title })
			.from(schema.programmeItems)
			.innerJoin(schema.exercises, eq(schema.exercises.id, schema.programmeItems.exerciseId))
			.where(inArray(schema.programmeItems.programmeId, programmeIds))
			.orderBy(asc(schema.programmeItems.position))
			.all();
		for (const { item, exerciseTitle } of items) {
			byProgramme.get(item.programmeId)?.items.push({ ...item, exerciseTitle });
		}
		const pauses = store
			.select()
			.from(schema.programmePauses)
			.where(inArray(schema.programmePauses.programmeId, programmeIds))
			.orderBy(asc(schema.programmePauses.fromDate))
			.all();
		for (const pause of pauses) {
			byProgramme.get(pause.programmeId)?.pauses.push({
				fromDate: pause.fromDate,
				toDate: pause.toDate,
				reason: pause.reason
			});
		}
	}

	const logConditions = [
		eq(schema.sessionLogs.clinicId, clinicId),
		inArray(schema.sessionLogs.patientId, ids)
	];
	if (options.logsFrom) logConditions.push(gte(schema.sessionLogs.localDate, options.logsFrom));
	const logs = store
		.select({
			log: schema.sessionLogs,
			programmeId: schema.programmeItems.programmeId,
			exerciseTitle: schema.exercises.title
		})
		.from(schema.sessionLogs)
		.innerJoin(
			schema.programmeItems,
			eq(schema.programmeItems.id, schema.sessionLogs.programmeItemId)
		)
		.innerJoin(schema.exercises, eq(schema.exercises.id, schema.programmeItems.exerciseId))
		.where(and(...logConditions))
		.orderBy(asc(schema.sessionLogs.doneAt))
		.all();
	for (const { log, programmeId, exerciseTitle } of logs) {
		out.get(log.patientId)?.logs.push({
			id: log.id,
			programmeId,
			programmeItemId: log.programmeItemId,
			exerciseTitle,
			doneAt: log.doneAt,
			localDate: log.localDate,
			setsDone: log.setsDone,
			repsDone: log.repsDone,
			pain: log.pain,
			sharpPain: log.sharpPain,
			note: log.note
		});
	}
	const readings = store
		.select()
		.from(schema.romMeasurements)
		.where(
			and(
				eq(schema.romMeasurements.clinicId, clinicId),
				inArray(schema.romMeasurements.patientId, ids)
			)
		)
		.orderBy(asc(schema.romMeasurements.measuredOn), asc(schema.romMeasurements.createdAt))
		.all();
	for (const reading of readings) out.get(reading.patientId)?.rom.push(reading);
	return out;
}

/** The records in the shape the pure follow-up figures read. */
export function figureInput(records: PatientRecords): FigureInput {
	const { patient } = records;
	return {
		timeZone: patient.timeZone,
		operationDate: patient.operationDate,
		protocol: patient.protocol,
		protocolShiftWeeks: patient.protocolShiftWeeks,
		affectedSide: patient.affectedSide,
		birthYear: patient.birthYear,
		sex: patient.sex,
		programmes: records.programmes.map((p) => ({
			id: p.id,
			title: p.title,
			status: p.status,
			startDate: p.startDate,
			// An ended programme without an end date stopped asking for sessions the day it ended.
			endDate:
				p.endDate ?? (p.status === 'ended' ? localDateOf(p.updatedAt, patient.timeZone) : null),
			items: p.items.map((i) => ({
				id: i.id,
				exerciseTitle: i.exerciseTitle,
				sessionsPerDay: i.sessionsPerDay,
				daysPerWeek: i.daysPerWeek,
				weekdays: i.weekdays,
				rangeGuides: i.rangeGuides
			})),
			pauses: p.pauses
		})),
		logs: records.logs,
		rom: records.rom.map((r) => ({
			id: r.id,
			motion: r.motion,
			side: r.side,
			mode: r.mode,
			degrees: r.degrees,
			measuredOn: r.measuredOn,
			note: r.note,
			instrument: r.instrument,
			armPosition: r.armPosition
		}))
	};
}

/** The clinic's patients, by name; only `clinicianId`'s own when given. */
export function clinicPatients(clinicId: string, clinicianId?: string): Patient[] {
	const store = db();
	if (!clinicianId) {
		return store
			.select()
			.from(schema.patients)
			.where(eq(schema.patients.clinicId, clinicId))
			.orderBy(asc(schema.patients.fullName))
			.all();
	}
	return store
		.select({ patient: schema.patients })
		.from(schema.patients)
		.innerJoin(schema.patientClinicians, eq(schema.patientClinicians.patientId, schema.patients.id))
		.where(
			and(
				eq(schema.patients.clinicId, clinicId),
				eq(schema.patientClinicians.clinicianUserId, clinicianId)
			)
		)
		.orderBy(asc(schema.patients.fullName))
		.all()
		.map((r) => r.patient);
}
