/**
 * The patient's side of a home programme: today's exercises, one exercise to replay, session
 * logs, safety acknowledgements and the caption look. Every function takes the patient's own
 * record (found from the session, never from a URL), so another patient's ids match nothing.
 */
import { playerVersions } from '$lib/media/ladder';
import { formatDay } from '$lib/format/dates';
import { howToMove, type HowToMove } from '$lib/sessions/how-to-move';
import { and, desc, eq, gte, inArray, isNotNull, lte } from 'drizzle-orm';
import { plainText } from '$lib/captions/text';
import { countsAsSession } from '$lib/clinical/adherence';
import {
	addDays,
	isoWeekStart,
	localDateOf,
	programmeWeek,
	type LocalDate
} from '$lib/clinical/calendar';
import { describeGuideForPatient, guidesOn } from '$lib/clinical/range-guides';
import { describeDosage, dosageForWeek, dosageOf, type Dosage } from '$lib/dosage';
import { effectiveCaptionStyle, type CaptionStyle } from '$lib/sessions/caption-style';
import type { SessionLogData, StoredSessionLog } from '$lib/sessions/log';
import type { TranscriptLine } from '$lib/sessions/replay';
import {
	describeExerciseDays,
	itemDayStatus,
	itemSchedule,
	minutesIntoDay,
	pauseOn,
	summariseDay,
	type DaySummary,
	type ItemDayStatus
} from '$lib/sessions/schedule';
import { db, schema } from '../db';
import type { Patient } from '../db/schema/patients';
import type { Exercise, Programme, ProgrammeItem, SessionLog } from '../db/schema/programmes';
import type { SegmentRow } from '../db/schema/segments';
import { segmentCaptions } from '../segments';
import type { CalendarInput } from './calendar';

/** The patient's current programme: the most recently published one still in force. */
export function currentProgramme(patientId: string): Programme | undefined {
	return db()
		.select()
		.from(schema.programmes)
		.where(
			and(eq(schema.programmes.patientId, patientId), eq(schema.programmes.status, 'published'))
		)
		.orderBy(desc(schema.programmes.publishedAt), desc(schema.programmes.createdAt))
		.get();
}

function pausesOf(programmeId: string) {
	return db()
		.select()
		.from(schema.programmePauses)
		.where(eq(schema.programmePauses.programmeId, programmeId))
		.all();
}

/** The item's dosage on a date: its own dosage risen by its progression to that programme week. */
export function dosageOn(programme: Programme, item: ProgrammeItem, date: LocalDate): Dosage {
	const week = Math.max(1, programmeWeek(programme.startDate, date));
	return dosageForWeek(dosageOf(item), item.progression, week);
}

/** The width and height of a segment's clip: its recording's picture as displayed. */
export function clipShape(segment: Pick<SegmentRow, 'recordingId'>): {
	width: number | null;
	height: number | null;
} {
	return (
		db()
			.select({ width: schema.recordings.width, height: schema.recordings.height })
			.from(schema.recordings)
			.where(eq(schema.recordings.id, segment.recordingId))
			.get() ?? { width: null, height: null }
	);
}

/** The media of a segment, through the segment endpoints (which check the viewer themselves). */
export function segmentMedia(
	segment: Pick<
		SegmentRow,
		'id' | 'posterCount' | 'clipSize' | 'clipVersions' | 'clipDurationSeconds'
	>
) {
	const base = `/api/segments/${segment.id}`;
	const versions = playerVersions(
		`${base}/clip.mp4`,
		{ short: null, size: segment.clipSize },
		segment.clipVersions,
		segment.clipDurationSeconds
	);
	return {
		clip: `${base}/clip.mp4`,
		/** Smallest first (the ladder); one for a clip cut before it. */
		versions,
		/** What a phone keeps for offline replay: the smallest version. */
		offlineClip: versions[0].src,
		captions: `${base}/captions.vtt`,
		transcript: `${base}/transcript.json`,
		poster: segment.posterCount > 0 ? `${base}/poster-0.jpg` : null
	};
}

interface ItemRow {
	item: ProgrammeItem;
	exercise: Exercise;
	segment: SegmentRow | null;
	/** The segment's clip shape, read in the same query (see clipShape); null without one. */
	shape: { width: number; height: number } | null;
}

function itemsOf(programmeId: string): ItemRow[] {
	return db()
		.select({
			item: schema.programmeItems,
			exercise: schema.exercises,
			segment: schema.segments,
			shape: { width: schema.recordings.width, height: schema.recordings.height }
		})
		.from(schema.programmeItems)
		.innerJoin(schema.exercises, eq(schema.exercises.id, schema.programmeItems.exerciseId))
		.leftJoin(schema.segments, eq(schema.segments.id, schema.exercises.segmentId))
		.leftJoin(schema.recordings, eq(schema.recordings.id, schema.segments.recordingId))
		.where(eq(schema.programmeItems.programmeId, programmeId))
		.orderBy(schema.programmeItems.position)
		.all();
}

export interface TodayItem {
	id: string;
	title: string;
	position: string;
	equipment: string[];
	/** How to move and which side, in plain words. */
	howToMove: HowToMove;
	dosage: Dosage;
	dosageWords: string;
	status: ItemDayStatus;
	/** The days it is for, in words ("every day", "Tuesday and Friday", "any 3 days a week"). */
	days: string;
	/** The clinician's range targets and limits that hold today, in plain words. */
	rangeGuides: string[];
	poster: string | null;
	/** The clip's width and height, so its still is drawn in the clip's own shape. */
	shape: { width: number | null; height: number | null };
	hasVideo: boolean;
}

export interface TodayView {
	today: LocalDate;
	/** Minutes since the patient's local midnight, to say whether the next session is due now. */
	nowMinutes: number;
	timeZone: string;
	programme: {
		id: string;
		title: string;
		note: string;
		startDate: LocalDate;
		endDate: LocalDate | null;
		week: number;
	} | null;
	/** Why no sessions are due today, when none are. */
	restDay: {
		kind: 'not-started' | 'ended' | 'paused';
		reason?: string;
		resumes?: LocalDate;
	} | null;
	items: TodayItem[];
	summary: DaySummary;
	/** The last day of the sling between sessions, while the clinician's sling period lasts. */
	slingUntil: LocalDate | null;
}

/** The sling period's last day while it lasts on `today`; null before none or after it. */
export function slingOn(patient: Patient, today: LocalDate): LocalDate | null {
	return patient.slingUntil && today <= patient.slingUntil ? patient.slingUntil : null;
}

/** An item's range guides that hold today, in the patient's words. */
export function rangeGuideWords(
	patient: Patient,
	item: ProgrammeItem,
	exercise: Pick<Exercise, 'movementType'>,
	today: LocalDate
): string[] {
	return guidesOn(item.rangeGuides, patient.operationDate, today).map((g) =>
		describeGuideForPatient(g, patient.operationDate, (d) => formatDay(d), exercise.movementType)
	);
}

/**
 * The dates of the sessions that count (`countsAsSession`) of each item in today's Monday-first
 * week, up to today: what Today and replay need to say whether today is an exercise day.
 */
function sessionDatesThisWeek(
	patientId: string,
	itemIds: readonly string[],
	today: LocalDate
): Map<string, LocalDate[]> {
	const byItem = new Map<string, LocalDate[]>();
	if (itemIds.length === 0) return byItem;
	const rows = db()
		.select({
			itemId: schema.sessionLogs.programmeItemId,
			localDate: schema.sessionLogs.localDate,
			setsDone: schema.sessionLogs.setsDone
		})
		.from(schema.sessionLogs)
		.where(
			and(
				eq(schema.sessionLogs.patientId, patientId),
				inArray(schema.sessionLogs.programmeItemId, [...itemIds]),
				gte(schema.sessionLogs.localDate, isoWeekStart(today)),
				lte(schema.sessionLogs.localDate, today)
			)
		)
		.all();
	for (const row of rows) {
		if (!countsAsSession(row)) continue;
		const dates = byItem.get(row.itemId) ?? [];
		dates.push(row.localDate);
		byItem.set(row.itemId, dates);
	}
	return byItem;
}

/** Everything the Today page shows, for the patient's calendar day at `now`. */
export function todayFor(patient: Patient, now: number = Date.now()): TodayView {
	const today = localDateOf(now, patient.timeZone);
	const nowMinutes = minutesIntoDay(now, patient.timeZone);
	const programme = currentProgramme(patient.id);
	const empty: DaySummary = { done: 0, due: 0, next: null };
	if (!programme) {
		return {
			today,
			nowMinutes,
			timeZone: patient.timeZone,
			programme: null,
			restDay: null,
			items: [],
			summary: empty,
			slingUntil: slingOn(patient, today)
		};
	}
	const pauses = pausesOf(programme.id);
	const pause = pauseOn({ pauses }, today);
	const restDay: TodayView['restDay'] =
		today < programme.startDate
			? { kind: 'not-started' }
			: programme.endDate && today > programme.endDate
				? { kind: 'ended' }
				: pause
					? { kind: 'paused', reason: pause.reason, resumes: addDays(pause.toDate, 1) }
					: null;

	const rows = itemsOf(programme.id);
	const sessionDates = sessionDatesThisWeek(
		patient.id,
		rows.map((r) => r.item.id),
		today
	);

	const days = { startDate: programme.startDate, endDate: programme.endDate, pauses };
	const items: TodayItem[] = rows.map(({ item, exercise, segment, shape }) => {
		const dosage = dosageOn(programme, item, today);
		const schedule = itemSchedule(days, dosage, item.weekdays);
		const status = itemDayStatus(schedule, today, sessionDates.get(item.id) ?? []);
		const ready = segment?.status === 'ready';
		return {
			id: item.id,
			title: exercise.title,
			position: exercise.position,
			equipment: exercise.equipment,
			howToMove: howToMove({ ...exercise, affectedSide: patient.affectedSide }),
			dosage,
			dosageWords: describeDosage(dosage, item.weekdays),
			status,
			days: describeExerciseDays(schedule),
			rangeGuides: rangeGuideWords(patient, item, exercise, today),
			poster: ready && segment ? segmentMedia(segment).poster : null,
			shape: shape ?? { width: null, height: null },
			hasVideo: ready
		};
	});

	return {
		today,
		nowMinutes,
		timeZone: patient.timeZone,
		programme: {
			id: programme.id,
			title: programme.title,
			note: programme.note,
			startDate: programme.startDate,
			endDate: programme.endDate,
			week: Math.max(1, programmeWeek(programme.startDate, today))
		},
		restDay,
		items,
		summary: restDay ? empty : summariseDay(items.map((i) => i.status)),
		slingUntil: slingOn(patient, today)
	};
}

export interface ReplayItem {
	programme: Programme;
	item: ProgrammeItem;
	exercise: Exercise;
	segment: SegmentRow | null;
}

/**
 * One exercise of the patient's published programme, by programme item id; undefined for any
 * other id (another patient's item, a draft or ended programme's), which the routes answer 404.
 */
export function findReplayItem(patientId: string, itemId: string): ReplayItem | undefined {
	const row = db()
		.select({
			programme: schema.programmes,
			item: schema.programmeItems,
			exercise: schema.exercises,
			segment: schema.segments
		})
		.from(schema.programmeItems)
		.innerJoin(schema.programmes, eq(schema.programmes.id, schema.programmeItems.programmeId))
		.innerJoin(schema.exercises, eq(schema.exercises.id, schema.programmeItems.exerciseId))
		.leftJoin(schema.segments, eq(schema.segments.id, schema.exercises.segmentId))
		.where(
			and(
				eq(schema.programmeItems.id, itemId),
				eq(schema.programmes.patientId, patientId),
				eq(schema.programmes.status, 'published')
			)
		)
		.get();
	return row ?? undefined;
}

/**
 * The segment's captions as transcript lines of plain words (tags dropped, never rendered as
 * HTML): the recording's current track, as the `<track>` shows it.
 */
export function transcriptLines(segment: SegmentRow | null): TranscriptLine[] {
	if (!segment) return [];
	return segmentCaptions(segment).cues.map((cue) => ({
		id: cue.id,
		start: cue.start,
		end: cue.end,
		text: plainText(cue.text)
	}));
}

/** Where one exercise of the patient stands today, and the days it is for, in words. */
export function itemToday(
	patientId: string,
	programme: Programme,
	item: ProgrammeItem,
	today: LocalDate
): { status: ItemDayStatus; days: string } {
	const days = {
		startDate: programme.startDate,
		endDate: programme.endDate,
		pauses: pausesOf(programme.id)
	};
	const schedule = itemSchedule(days, dosageOn(programme, item, today), item.weekdays);
	const dates = sessionDatesThisWeek(patientId, [item.id], today).get(item.id) ?? [];
	return {
		status: itemDayStatus(schedule, today, dates),
		days: describeExerciseDays(schedule)
	};
}

// ---- Safety acknowledgement -------------------------------------------------------------

export function hasAcknowledged(patientId: string, exerciseId: string): boolean {
	return !!db()
		.select({ at: schema.safetyAcknowledgements.acknowledgedAt })
		.from(schema.safetyAcknowledgements)
		.where(
			and(
				eq(schema.safetyAcknowledgements.patientId, patientId),
				eq(schema.safetyAcknowledgements.exerciseId, exerciseId)
			)
		)
		.get();
}

/** Records that the patient read an exercise's safety notes; a second time changes nothing. */
export function acknowledgeSafety(patientId: string, exerciseId: string): void {
	db()
		.insert(schema.safetyAcknowledgements)
		.values({ patientId, exerciseId })
		.onConflictDoNothing()
		.run();
}

// ---- Session logs ----------------------------------------------------------------------

export class SessionLogError extends Error {
	constructor(
		readonly status: 404 | 422,
		message: string
	) {
		super(message);
	}
}

/** How far ahead of the server a device's clock may run before a log's time is refused. */
const FUTURE_ALLOWANCE_MS = 24 * 3_600_000;

function stored(row: SessionLog): StoredSessionLog {
	return {
		id: row.id,
		clientId: row.clientId,
		programmeItemId: row.programmeItemId,
		doneAt: row.doneAt.toISOString(),
		localDate: row.localDate,
		setsDone: row.setsDone,
		repsDone: row.repsDone,
		pain: row.pain,
		sharpPain: row.sharpPain,
		note: row.note
	};
}

/**
 * Stores one session log for the patient, once per device-made clientId: sending the same log
 * again returns the stored one with `created: false`. The item must be in one of the patient's
 * programmes that was published (an ended one too — a log made offline before it ended is kept).
 * The calendar day is the patient's own, from `doneAt` in their time zone.
 */
export function recordSession(
	patient: Patient,
	input: SessionLogData,
	now: number = Date.now()
): { log: StoredSessionLog; created: boolean } {
	const store = db();
	return store.transaction(
		(tx) => {
			const existing = tx
				.select()
				.from(schema.sessionLogs)
				.where(
					and(
						eq(schema.sessionLogs.patientId, patient.id),
						eq(schema.sessionLogs.clientId, input.clientId)
					)
				)
				.get();
			if (existing) return { log: stored(existing), created: false };

			const item = tx
				.select({ id: schema.programmeItems.id, segmentId: schema.exercises.segmentId })
				.from(schema.programmeItems)
				.innerJoin(schema.programmes, eq(schema.programmes.id, schema.programmeItems.programmeId))
				.innerJoin(schema.exercises, eq(schema.exercises.id, schema.programmeItems.exerciseId))
				.where(
					and(
						eq(schema.programmeItems.id, input.programmeItemId),
						eq(schema.programmes.patientId, patient.id),
						isNotNull(schema.programmes.publishedAt)
					)
				)
				.get();
			if (!item) throw new SessionLogError(404, 'That exercise is not in your programme.');

			// Which captions the replay showed: the segment's, which follow the recording's track.
			const segment = item.segmentId
				? tx.select().from(schema.segments).where(eq(schema.segments.id, item.segmentId)).get()
				: undefined;
			const shown = segment ? segmentCaptions(segment) : null;

			const doneAt = new Date(input.doneAt);
			if (doneAt.getTime() > now + FUTURE_ALLOWANCE_MS) {
				throw new SessionLogError(
					422,
					"The session's time is in the future. Please check the date and time on your device."
				);
			}
			const row = tx
				.insert(schema.sessionLogs)
				.values({
					clinicId: patient.clinicId,
					patientId: patient.id,
					programmeItemId: input.programmeItemId,
					clientId: input.clientId,
					doneAt,
					localDate: localDateOf(doneAt, patient.timeZone),
					setsDone: input.setsDone,
					repsDone: input.repsDone,
					pain: input.pain,
					sharpPain: input.sharpPain,
					note: input.note,
					captionsTrackId: shown?.trackId ?? null,
					captionsVersion: shown?.trackId ? shown.version : null
				})
				.returning()
				.get();
			return { log: stored(row), created: true };
		},
		{ behavior: 'immediate' }
	);
}

// ---- Caption style ----------------------------------------------------------------------

export function captionStyleOf(patient: Patient): CaptionStyle {
	return effectiveCaptionStyle(patient.captionStyle);
}

/** Saves the patient's caption look; the caller has validated it (contrast included). */
export function saveCaptionStyle(patientId: string, style: CaptionStyle): void {
	db()
		.update(schema.patients)
		.set({ captionStyle: style })
		.where(eq(schema.patients.id, patientId))
		.run();
}

// ---- Calendar reminders -----------------------------------------------------------------

/** What the reminders file is made from, or null when the patient has no programme. */
export function calendarInputFor(
	patient: Patient,
	origin: string,
	now: number = Date.now()
): CalendarInput | null {
	const programme = currentProgramme(patient.id);
	if (!programme) return null;
	return {
		programmeId: programme.id,
		title: programme.title,
		timeZone: patient.timeZone,
		startDate: programme.startDate,
		endDate: programme.endDate,
		pauses: pausesOf(programme.id),
		today: localDateOf(now, patient.timeZone),
		origin,
		items: itemsOf(programme.id).map(({ item, exercise }) => ({
			title: exercise.title,
			dosage: dosageOf(item),
			progression: item.progression,
			weekdays: item.weekdays
		}))
	};
}
