/**
 * A patient's follow-up figures from their programmes, session logs and range-of-motion readings:
 * adherence over the last 7 and 28 days, the last session, the pain trend, time since the
 * operation with the phase hint, and the flags the caseload shows. Pure: the server loads the
 * records, this decides what they say. Every figure comes with the sentence that gives its basis.
 */
import {
	adherenceToDate,
	combinedAdherence,
	countsAsSession,
	type AdherenceWindow,
	type Schedule
} from '../clinical/adherence';
import {
	addDays,
	isoWeekStart,
	localDateOf,
	weekdayOf,
	weeksSince,
	type LocalDate,
	type Weekday
} from '../clinical/calendar';
import type { RangeGuide } from '../clinical/range-guides';
import { painAlerts, painTrend, PAIN_BASIS, type PainTrend } from '../clinical/pain';
import { phaseOnDate, type PhaseHint } from '../clinical/phases';
import type { NormSourceId, Sex } from '../clinical/rom';
import { romLosses, romRows, type RomReading, type RomRow } from './rom-table';
import {
	adherenceSentence,
	formatDateRange,
	painAlertSentence,
	painSentence,
	weekAfterSentence
} from './words';

export interface FigureItem {
	id: string;
	exerciseTitle: string;
	sessionsPerDay: number;
	daysPerWeek: number;
	/** The weekdays the clinician chose; null for any `daysPerWeek` days of each week. */
	weekdays: Weekday[] | null;
	rangeGuides: RangeGuide[];
}

export interface FigureProgramme {
	id: string;
	title: string;
	status: 'draft' | 'published' | 'ended';
	startDate: LocalDate;
	/** The last day sessions are due (for an ended programme, the day it ended); null while it runs on. */
	endDate: LocalDate | null;
	items: FigureItem[];
	pauses: { fromDate: LocalDate; toDate: LocalDate }[];
}

export interface FigureLog {
	id: string;
	programmeItemId: string;
	exerciseTitle: string;
	doneAt: Date;
	localDate: LocalDate;
	setsDone: number;
	repsDone: number;
	pain: number;
	/** "Sharp or new pain" ticked. */
	sharpPain: boolean;
	note: string;
}

export interface FigureInput {
	timeZone: string;
	operationDate: LocalDate | null;
	protocol: string;
	/** Weeks the surgeon's timing runs behind (+) or ahead of (−) the protocol table. */
	protocolShiftWeeks: number;
	affectedSide: string;
	birthYear: number | null;
	sex: Sex | null;
	programmes: FigureProgramme[];
	logs: FigureLog[];
	rom: RomReading[];
}

export const FLAG_KINDS = ['pain-severe', 'pain-rise', 'no-sessions', 'rom-loss'] as const;
export type FlagKind = (typeof FLAG_KINDS)[number];

export const FLAG_LABELS: Record<FlagKind, string> = {
	'pain-severe': 'Severe or sharp pain',
	'pain-rise': 'Pain rising',
	'no-sessions': 'No sessions logged',
	'rom-loss': 'Range of motion lost'
};

export interface Flag {
	kind: FlagKind;
	label: string;
	/** The numbers behind the flag and the rule it follows, in a sentence. */
	detail: string;
}

export interface AdherenceFigure extends AdherenceWindow {
	text: string;
}

export const ADHERENCE_BASIS =
	'Sessions done ÷ sessions prescribed, on the patient’s own calendar days: each exercise’s sessions a day on the weekdays chosen, or on any N days of each Monday-to-Sunday week, leaving out paused days. A session counts when at least one set was done. Each day counts at most what was prescribed; a week’s days count as missed only once they can no longer be done; today counts only the sessions already logged.';

export const ADHERENCE_CAUTION =
	'A count of logs, not of exercise done well: talk it through with the patient before changing the programme.';

export interface PatientFigures {
	/** The patient's own date now. */
	today: LocalDate;
	/** Whether any programme has been published (sessions can be prescribed). */
	prescribed: boolean;
	adherence7: AdherenceFigure | null;
	adherence28: AdherenceFigure | null;
	lastSession: FigureLog | null;
	pain: (PainTrend & { text: string }) | null;
	sinceOperation: { days: number; weeks: number; text: string } | null;
	phase: PhaseHint | null;
	rom: RomRow[];
	flags: Flag[];
}

/** The programmes whose sessions count: published ones, and ended ones up to their last day. */
function prescribedProgrammes(input: FigureInput): FigureProgramme[] {
	return input.programmes.filter((p) => p.status === 'published' || p.status === 'ended');
}

/** One schedule per exercise, each with the dates its sessions were logged. */
export function schedulesOf(
	input: FigureInput
): { schedule: Schedule; loggedDates: LocalDate[]; item: FigureItem }[] {
	const datesByItem = new Map<string, LocalDate[]>();
	for (const log of input.logs) {
		if (!countsAsSession(log)) continue;
		const list = datesByItem.get(log.programmeItemId) ?? [];
		list.push(log.localDate);
		datesByItem.set(log.programmeItemId, list);
	}
	return prescribedProgrammes(input).flatMap((programme) =>
		programme.items.map((item) => ({
			item,
			loggedDates: datesByItem.get(item.id) ?? [],
			schedule: {
				startDate: programme.startDate,
				endDate: programme.endDate,
				sessionsPerDay: item.sessionsPerDay,
				daysPerWeek: item.daysPerWeek,
				weekdays: item.weekdays,
				pauses: programme.pauses.map((p) => ({ from: p.fromDate, to: p.toDate }))
			}
		}))
	);
}

function withText(window: AdherenceWindow): AdherenceFigure {
	return { ...window, text: adherenceSentence(window) };
}

/** Everything the caseload and the patient page say about one patient, as of `now`. */
export function patientFigures(
	input: FigureInput,
	now: Date,
	options: { normSource?: NormSourceId } = {}
): PatientFigures {
	const today = localDateOf(now, input.timeZone);
	const schedules = schedulesOf(input);
	const prescribed = schedules.length > 0;
	const adherence7 = prescribed ? withText(adherenceToDate(schedules, today, 7)) : null;
	const adherence28 = prescribed ? withText(adherenceToDate(schedules, today, 28)) : null;

	const logs = input.logs.filter((l) => l.localDate <= today);
	// A log of no sets keeps its pain score but is not a session (countsAsSession).
	const sessions = logs.filter(countsAsSession);
	const lastSession = sessions.reduce<FigureLog | null>(
		(last, log) => (!last || log.doneAt.getTime() > last.doneAt.getTime() ? log : last),
		null
	);
	// The last 7 days against the 7 before and the best 7 so far (painTrend).
	const painEntries = logs.map((l) => ({ date: l.localDate, score: l.pain, sharp: l.sharpPain }));
	const trend = logs.length > 0 ? painTrend(painEntries, today) : null;
	const pain = trend ? { ...trend, text: painSentence(trend) } : null;

	const since = input.operationDate ? weeksSince(input.operationDate, today) : null;
	const sinceOperation =
		since && input.operationDate
			? {
					days: since.days,
					weeks: since.weeks,
					text: weekAfterSentence(input.operationDate, today)
				}
			: null;
	const phase =
		input.operationDate && input.protocol
			? phaseOnDate(input.protocol, input.operationDate, today, input.protocolShiftWeeks)
			: null;

	const rom = romRows(input.rom, {
		source: options.normSource ?? 'aaos',
		affectedSide: input.affectedSide,
		birthYear: input.birthYear,
		sex: input.sex,
		operationDate: input.operationDate,
		rangeGuides: prescribedProgrammes(input).flatMap((p) =>
			p.items.flatMap((i) =>
				i.rangeGuides.map((guide) => ({ guide, from: p.startDate, to: p.endDate }))
			)
		)
	});

	const flags: Flag[] = [];
	// A severe score or "sharp or new pain" in the last 7 days, whatever the trend says.
	const alerts = painAlerts(painEntries, today);
	if (alerts.length > 0) {
		flags.push({
			kind: 'pain-severe',
			label: FLAG_LABELS['pain-severe'],
			detail: painAlertSentence(alerts)
		});
	}
	if (pain?.flagged) {
		flags.push({ kind: 'pain-rise', label: FLAG_LABELS['pain-rise'], detail: pain.text });
	}
	if (prescribed) {
		// Seven whole days before today with sessions due and not one logged, nor any today.
		const fullDays = combinedAdherence(schedules, addDays(today, -1), 7);
		const loggedToday = sessions.some((l) => l.localDate === today);
		if (fullDays.prescribed > 0 && fullDays.counted + fullDays.extra === 0 && !loggedToday) {
			flags.push({
				kind: 'no-sessions',
				label: FLAG_LABELS['no-sessions'],
				detail: `None of the ${fullDays.prescribed} sessions prescribed over ${formatDateRange(fullDays.from, fullDays.to)} was logged.`
			});
		}
	}
	for (const loss of romLosses(rom)) {
		flags.push({
			kind: 'rom-loss',
			label: FLAG_LABELS['rom-loss'],
			detail: `${loss.motionLabel}, ${loss.side} (${loss.mode}): ${loss.change!.text}`
		});
	}

	return {
		today,
		prescribed,
		adherence7,
		adherence28,
		lastSession,
		pain,
		sinceOperation,
		phase,
		rom,
		flags
	};
}

/** Adherence for each calendar week (Monday to Sunday) from the first programme's week to this one. */
export function weeklyAdherence(
	input: FigureInput,
	now: Date,
	maxWeeks = 26
): { weekStart: LocalDate; weekEnd: LocalDate; window: AdherenceFigure }[] {
	const today = localDateOf(now, input.timeZone);
	const schedules = schedulesOf(input);
	if (schedules.length === 0) return [];
	const firstStart = schedules.map((s) => s.schedule.startDate).sort()[0];
	if (firstStart > today) return [];
	const weeks: { weekStart: LocalDate; weekEnd: LocalDate; window: AdherenceFigure }[] = [];
	const thisWeek = isoWeekStart(today);
	let start = isoWeekStart(firstStart);
	const earliest = addDays(thisWeek, -7 * (maxWeeks - 1));
	if (start < earliest) start = earliest;
	for (; start <= thisWeek; start = addDays(start, 7)) {
		const end = addDays(start, 6);
		const window =
			start === thisWeek
				? adherenceToDate(schedules, today, weekdayOf(today))
				: combinedAdherence(schedules, end, 7);
		weeks.push({ weekStart: start, weekEnd: end <= today ? end : today, window: withText(window) });
	}
	return weeks;
}

/** Average pain of each day with logs, oldest first, with the number of scores behind it. */
export function dailyPain(
	input: FigureInput
): { date: LocalDate; average: number; highest: number; count: number }[] {
	const byDay = new Map<LocalDate, number[]>();
	for (const log of input.logs) {
		const list = byDay.get(log.localDate) ?? [];
		list.push(log.pain);
		byDay.set(log.localDate, list);
	}
	return [...byDay.entries()]
		.sort(([a], [b]) => (a < b ? -1 : 1))
		.map(([date, scores]) => ({
			date,
			average: scores.reduce((a, b) => a + b, 0) / scores.length,
			highest: Math.max(...scores),
			count: scores.length
		}));
}

export { PAIN_BASIS };
