import { and, asc, eq, inArray, like, or, sql } from 'drizzle-orm';
import type { ExerciseInput } from '$lib/exercises/schema';
import type { ExerciseStatus, MovementType, Position } from '$lib/exercises/vocabulary';
import { db } from '../db';
import { exercises, programmeItems, recordings, segments, type Exercise } from '../db/schema';
import type { SegmentChoice } from '$lib/exercises/segment-choice';
import type { Principal } from '../auth/principal';
import { findSegment, listReadySegments, segmentUrls, type ReadySegment } from '../segments';

export class ExerciseError extends Error {}

export interface ExerciseFilters {
	search: string;
	status: ExerciseStatus | 'all';
	region: string;
	position: Position | 'all';
	movementType: MovementType | 'all';
	phase: number | null;
	equipment: string;
}

export const NO_FILTERS: ExerciseFilters = {
	search: '',
	status: 'all',
	region: '',
	position: 'all',
	movementType: 'all',
	phase: null,
	equipment: ''
};

/** What a list, a picker and a sheet need to know of an exercise's demonstration. */
export interface SegmentSummary {
	id: string;
	title: string;
	recordingTitle: string;
	durationSeconds: number | null;
	posterUrl: string | null;
	clipUrl: string;
	captionsUrl: string;
	ready: boolean;
	superseded: boolean;
	/** The clip's picture size, so its still and player take its shape. */
	width: number | null;
	height: number | null;
}

export type ExerciseRow = Exercise & { segment: SegmentSummary | null };

function likeText(value: string) {
	const escaped = value.replace(/[\\%_]/g, (c) => `\\${c}`);
	return sql`${`%${escaped}%`} escape '\\'`;
}

function summaries(segmentIds: string[]): Map<string, SegmentSummary> {
	const map = new Map<string, SegmentSummary>();
	if (segmentIds.length === 0) return map;
	const rows = db()
		.select({
			segment: segments,
			recordingTitle: recordings.title,
			width: recordings.width,
			height: recordings.height
		})
		.from(segments)
		.innerJoin(recordings, eq(recordings.id, segments.recordingId))
		.where(inArray(segments.id, [...new Set(segmentIds)]))
		.all();
	for (const { segment: s, recordingTitle, width, height } of rows) {
		const urls = segmentUrls(s.id, s.posterCount);
		map.set(s.id, {
			id: s.id,
			title: s.title,
			recordingTitle,
			durationSeconds: s.clipDurationSeconds ?? s.endSeconds - s.startSeconds,
			posterUrl: urls.posters[0] ?? null,
			clipUrl: urls.clip,
			captionsUrl: urls.captions,
			ready: s.status === 'ready',
			superseded: s.supersededAt !== null,
			width,
			height
		});
	}
	return map;
}

/** Exercises with their demonstration's summary (a null segment when it was removed). */
export function withSegments(rows: Exercise[]): ExerciseRow[] {
	const found = summaries(rows.flatMap((r) => (r.segmentId ? [r.segmentId] : [])));
	return rows.map((r) => ({
		...r,
		segment: r.segmentId ? (found.get(r.segmentId) ?? null) : null
	}));
}

/**
 * The clinic's exercises matching the filters, by title. Search looks in the title, the
 * description and the body region; equipment matches one listed item, ignoring case.
 */
export function listExercises(
	clinicId: string,
	filters: Partial<ExerciseFilters> = {}
): ExerciseRow[] {
	const f = { ...NO_FILTERS, ...filters };
	const search = f.search.trim();
	const equipment = f.equipment.trim().toLowerCase();
	const rows = db()
		.select()
		.from(exercises)
		.where(
			and(
				eq(exercises.clinicId, clinicId),
				f.status === 'all' ? undefined : eq(exercises.status, f.status),
				f.position === 'all' ? undefined : eq(exercises.position, f.position),
				f.movementType === 'all' ? undefined : eq(exercises.movementType, f.movementType),
				f.phase === null ? undefined : eq(exercises.phase, f.phase),
				f.region.trim()
					? sql`lower(${exercises.bodyRegion}) = ${f.region.trim().toLowerCase()}`
					: undefined,
				equipment
					? sql`exists (select 1 from json_each(${exercises.equipment}) where lower(json_each.value) = ${equipment})`
					: undefined,
				search
					? or(
							like(exercises.title, likeText(search)),
							like(exercises.description, likeText(search)),
							like(exercises.bodyRegion, likeText(search))
						)
					: undefined
			)
		)
		.orderBy(asc(sql`lower(${exercises.title})`))
		.all();
	return withSegments(rows);
}

/** The body regions and equipment the clinic's exercises use, for filter lists. */
export function exerciseFacets(clinicId: string): { regions: string[]; equipment: string[] } {
	const rows = db()
		.select({ bodyRegion: exercises.bodyRegion, equipment: exercises.equipment })
		.from(exercises)
		.where(eq(exercises.clinicId, clinicId))
		.all();
	const byLower = (values: string[]) => {
		const seen = new Map<string, string>();
		for (const v of values) if (!seen.has(v.toLowerCase())) seen.set(v.toLowerCase(), v);
		return [...seen.values()].sort((a, b) => a.localeCompare(b));
	};
	return {
		regions: byLower(rows.map((r) => r.bodyRegion)),
		equipment: byLower(rows.flatMap((r) => r.equipment))
	};
}

/** One exercise of the clinic, or null (also for another clinic's id). */
export function findExercise(clinicId: string, exerciseId: string): ExerciseRow | null {
	const row = db()
		.select()
		.from(exercises)
		.where(and(eq(exercises.id, exerciseId), eq(exercises.clinicId, clinicId)))
		.get();
	return row ? withSegments([row])[0] : null;
}

/**
 * Segments an exercise may be built on: the clinic's current cut ones, with their posters, plus
 * the exercise's own segment when a newer cut has replaced it (the exercise may keep it).
 */
export function segmentChoices(
	clinicId: string,
	current: SegmentSummary | null = null
): SegmentChoice[] {
	const choices: SegmentChoice[] = listReadySegments(clinicId).map((s: ReadySegment) => {
		const urls = segmentUrls(s.id, s.posterCount);
		return {
			id: s.id,
			title: s.title,
			recordingTitle: s.recordingTitle,
			durationSeconds: s.durationSeconds,
			posterUrl: urls.posters[0] ?? null,
			clipUrl: urls.clip,
			captionsUrl: urls.captions,
			width: s.width,
			height: s.height
		};
	});
	if (current && !choices.some((c) => c.id === current.id)) {
		choices.unshift({
			id: current.id,
			title: current.title,
			recordingTitle: current.recordingTitle,
			durationSeconds: current.durationSeconds,
			posterUrl: current.posterUrl,
			clipUrl: current.clipUrl,
			captionsUrl: current.captionsUrl,
			superseded: true,
			width: current.width,
			height: current.height
		});
	}
	return choices;
}

/**
 * A segment id is acceptable when it is one of the clinic's ready, current segments — or the one
 * the exercise already uses (a later re-cut supersedes it, and the exercise may keep it).
 */
function checkSegment(clinicId: string, segmentId: string | null, current: string | null): void {
	if (!segmentId || segmentId === current) return;
	const segment = findSegment(clinicId, segmentId);
	if (!segment || segment.status !== 'ready' || segment.supersededAt !== null) {
		throw new ExerciseError(
			'That demonstration segment is not available: choose one of your clinic’s cut segments.'
		);
	}
}

function columns(input: ExerciseInput) {
	const { dosage, bounds, ...rest } = input;
	const hasBounds = Object.keys(bounds).length > 0;
	return { ...rest, ...dosage, dosageBounds: hasBounds ? bounds : null };
}

/** Adds an exercise to the clinician's clinic. */
export function createExercise(clinician: Principal, input: ExerciseInput): Exercise {
	checkSegment(clinician.clinicId, input.segmentId, null);
	return db()
		.insert(exercises)
		.values({ ...columns(input), clinicId: clinician.clinicId, createdBy: clinician.id })
		.returning()
		.get();
}

/** Saves an exercise of the clinician's clinic; null when there is no such exercise there. */
export function updateExercise(
	clinician: Principal,
	exerciseId: string,
	input: ExerciseInput
): Exercise | null {
	const existing = findExercise(clinician.clinicId, exerciseId);
	if (!existing) return null;
	checkSegment(clinician.clinicId, input.segmentId, existing.segmentId);
	return (
		db()
			.update(exercises)
			.set({ ...columns(input), updatedAt: new Date() })
			.where(and(eq(exercises.id, exerciseId), eq(exercises.clinicId, clinician.clinicId)))
			.returning()
			.get() ?? null
	);
}

/** Moves an exercise between draft, ready and retired; null when it is not in the clinic. */
export function setExerciseStatus(
	clinician: Principal,
	exerciseId: string,
	status: ExerciseStatus
): Exercise | null {
	const existing = findExercise(clinician.clinicId, exerciseId);
	if (!existing) return null;
	if (status === 'ready' && !existing.segmentId)
		throw new ExerciseError(
			'Choose the demonstration segment before marking the exercise ready: patients replay it.'
		);
	return (
		db()
			.update(exercises)
			.set({ status, updatedAt: new Date() })
			.where(and(eq(exercises.id, exerciseId), eq(exercises.clinicId, clinician.clinicId)))
			.returning()
			.get() ?? null
	);
}

/** How many programmes use the exercise (a retired exercise stays in them). */
export function programmesUsing(exerciseId: string): number {
	return (
		db()
			.select({ n: sql<number>`count(distinct ${programmeItems.programmeId})` })
			.from(programmeItems)
			.where(eq(programmeItems.exerciseId, exerciseId))
			.get()?.n ?? 0
	);
}
