import { and, eq, inArray, or } from 'drizzle-orm';
import { itemFromSaved, type BuilderExercise, type ProgrammeDraft } from '$lib/programmes/builder';
import type { Progression } from '$lib/dosage';
import { BUILDER_FIELDS, pickFields } from '$lib/exercises/columns';
import { db } from '../db';
import { exercises } from '../db/schema';
import { withSegments, type ExerciseRow } from '../exercises';
import { dosageOf } from '$lib/dosage';
import { patientToday, type ProgrammeView } from './index';

function toBuilderExercise(e: ExerciseRow): BuilderExercise {
	return {
		...pickFields(e, BUILDER_FIELDS),
		id: e.id,
		segmentSeconds: e.segment?.durationSeconds ?? null,
		defaultDosage: dosageOf(e),
		defaultProgression: e.progression as Progression,
		posterUrl: e.segment?.posterUrl ?? null,
		hasSegment: e.segment !== null
	};
}

/**
 * What the builder may add: the clinic's ready exercises, plus every exercise already in the
 * programme (whatever its state now), by title.
 */
export function builderCatalogue(clinicId: string, inProgramme: string[]): BuilderExercise[] {
	const rows = db()
		.select()
		.from(exercises)
		.where(
			and(
				eq(exercises.clinicId, clinicId),
				inProgramme.length
					? or(eq(exercises.status, 'ready'), inArray(exercises.id, inProgramme))
					: eq(exercises.status, 'ready')
			)
		)
		.all()
		.sort((a, b) => a.title.localeCompare(b.title));
	return withSegments(rows).map(toBuilderExercise);
}

/** Everything the builder page and the JSON endpoint send about a programme. */
export function builderState(view: ProgrammeView) {
	const { programme, patient } = view;
	const draft: ProgrammeDraft = {
		title: programme.title,
		startDate: programme.startDate,
		endDate: programme.endDate ?? '',
		note: programme.note,
		items: view.items.map((i) =>
			itemFromSaved({
				id: i.id,
				exerciseId: i.exerciseId,
				dosage: dosageOf(i),
				weekdays: i.weekdays,
				rangeGuides: i.rangeGuides,
				progression: i.progression as Progression,
				logCount: i.logCount
			})
		)
	};
	return {
		programme: {
			id: programme.id,
			status: programme.status,
			publishedAt: programme.publishedAt?.toISOString() ?? null,
			updatedAt: programme.updatedAt.toISOString()
		},
		patient: {
			id: patient.id,
			fullName: patient.fullName,
			email: patient.email,
			hasAccount: patient.userId !== null,
			condition: patient.condition,
			affectedSide: patient.affectedSide,
			operationDate: patient.operationDate,
			protocol: patient.protocol,
			protocolShiftWeeks: patient.protocolShiftWeeks,
			precautions: patient.precautions,
			precautionDetails: patient.precautionDetails,
			today: patientToday(patient)
		},
		draft
	};
}

export type BuilderState = ReturnType<typeof builderState>;
