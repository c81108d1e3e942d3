import { and, eq } from 'drizzle-orm';
import type { NormSourceId } from '$lib/clinical/rom';
import {
	dailyPain,
	patientFigures,
	weeklyAdherence,
	type FigureLog,
	type PatientFigures
} from '$lib/followup/figures';
import type { RomEntry } from '$lib/followup/rom-form';
import { localDateOf } from '$lib/clinical/calendar';
import { db, schema } from '../db';
import { findPatientInClinic } from '../patients';
import { figureInput, loadRecords } from './records';

/** Everything the clinician's patient page and its charts show, for one patient of their clinic. */
export interface PatientFollowup {
	patientId: string;
	normSource: NormSourceId;
	programmes: {
		id: string;
		title: string;
		status: 'draft' | 'published' | 'ended';
		startDate: string;
		endDate: string | null;
		exercises: number;
	}[];
	figures: PatientFigures;
	weekly: ReturnType<typeof weeklyAdherence>;
	pain: ReturnType<typeof dailyPain>;
	/** Session logs, newest first. */
	logs: FigureLog[];
}

/** The follow-up of a patient of `clinicId`, or null when there is no such patient in that clinic. */
export function patientFollowup(
	clinicId: string,
	patientId: string,
	options: { normSource?: NormSourceId; now?: Date } = {}
): PatientFollowup | null {
	const patient = findPatientInClinic(clinicId, patientId);
	if (!patient) return null;
	const now = options.now ?? new Date();
	const normSource = options.normSource ?? 'aaos';
	const records = loadRecords(clinicId, [patient]).get(patient.id)!;
	const input = figureInput(records);
	return {
		patientId: patient.id,
		normSource,
		programmes: records.programmes.map((p) => ({
			id: p.id,
			title: p.title,
			status: p.status,
			startDate: p.startDate,
			endDate: p.endDate,
			exercises: p.items.length
		})),
		figures: patientFigures(input, now, { normSource }),
		weekly: weeklyAdherence(input, now),
		pain: dailyPain(input),
		logs: [...input.logs].reverse()
	};
}

export class RomError extends Error {}

/**
 * Records a goniometer reading for a patient of the clinician's clinic. A date after the
 * patient's today is refused (a reading cannot come from the future).
 */
export function addRomMeasurement(
	clinician: { id: string; clinicId: string },
	patientId: string,
	entry: RomEntry,
	now = new Date()
) {
	const patient = findPatientInClinic(clinician.clinicId, patientId);
	if (!patient) throw new RomError('That patient is not in your clinic.');
	if (entry.measuredOn > localDateOf(now, patient.timeZone)) {
		throw new RomError('The date of the measurement is after today.');
	}
	return db()
		.insert(schema.romMeasurements)
		.values({
			clinicId: clinician.clinicId,
			patientId,
			motion: entry.motion,
			side: entry.side,
			mode: entry.mode,
			degrees: entry.degrees,
			measuredOn: entry.measuredOn,
			note: entry.note,
			instrument: entry.instrument,
			armPosition: entry.armPosition,
			recordedBy: clinician.id
		})
		.returning()
		.get();
}

/** Removes a reading entered by mistake; false when it is not this patient's in this clinic. */
export function deleteRomMeasurement(
	clinician: { clinicId: string },
	patientId: string,
	measurementId: string
): boolean {
	const result = db()
		.delete(schema.romMeasurements)
		.where(
			and(
				eq(schema.romMeasurements.id, measurementId),
				eq(schema.romMeasurements.patientId, patientId),
				eq(schema.romMeasurements.clinicId, clinician.clinicId)
			)
		)
		.run();
	return result.changes > 0;
}
