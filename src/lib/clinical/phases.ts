/**
 * Rehabilitation phase by time after surgery, as a HINT for the clinician. Each table says where
 * its weeks come from; every answer carries that basis and the caution that the surgeon's protocol
 * and the treating clinician decide. Weeks are completed weeks after the operation (see
 * `weeksSince` in ./calendar): a phase "from week 2 to week 6" covers days 14–41.
 */
import { weeksSince, type LocalDate } from './calendar';

/** The phases exercises are marked with, earliest first; protocols use a subset in this order. */
export const PHASES = [
	'protection',
	'early-motion',
	'active-motion',
	'strengthening',
	'return-to-activity'
] as const;

export type Phase = (typeof PHASES)[number];

/** Plain names for the phases. */
export const PHASE_LABELS: Record<Phase, string> = {
	protection: 'Protection',
	'early-motion': 'Early motion',
	'active-motion': 'Active motion',
	strengthening: 'Strengthening',
	'return-to-activity': 'Return to activity'
};

/** Shown with every phase hint and flag. */
export const PHASE_CAUTION =
	"A hint only: the surgeon's protocol and the treating clinician decide when each phase starts, within local regulations.";

export interface ProtocolPhase {
	phase: Phase;
	/** First completed week after surgery in this phase. */
	fromWeek: number;
	/** First completed week after it; null for the last, open-ended phase. */
	untilWeek: number | null;
	/** What the phase is for, in plain words. */
	description: string;
}

export interface ProtocolTable {
	id: ProtocolId;
	name: string;
	/** Where the weeks come from. */
	basis: string;
	/** 'published' when the weeks were read from a source; otherwise 'common practice'. */
	confidence: 'published' | 'common practice';
	/** Which operations the weeks describe, and which they do not. */
	appliesTo: string;
	phases: ProtocolPhase[];
}

export type ProtocolId = 'rotator-cuff-repair' | 'knee-replacement';

/** The phase tables we ship, by id (the id is what `patient.protocol` stores). */
export const PROTOCOLS: Record<ProtocolId, ProtocolTable> = {
	'rotator-cuff-repair': {
		id: 'rotator-cuff-repair',
		name: 'Rotator cuff repair',
		basis:
			'ASSET consensus statement on rehabilitation after arthroscopic rotator cuff repair (Thigpen et al., J Shoulder Elbow Surg 2016;25:521–35): about 2 weeks of strict immobilisation, protected passive motion from about week 2 to 6, then restoring active motion, strengthening from about week 12.',
		confidence: 'published',
		appliesTo:
			'Small and medium tears repaired arthroscopically. Large, massive or revision repairs usually move more slowly, and the surgeon’s timing decides.',
		phases: [
			{
				phase: 'protection',
				fromWeek: 0,
				untilWeek: 2,
				description: 'Strict protection of the repair, the arm kept in its sling.'
			},
			{
				phase: 'early-motion',
				fromWeek: 2,
				untilWeek: 6,
				description:
					'Protected passive motion: the good arm or a helper moves the operated arm while its muscles stay relaxed.'
			},
			{
				phase: 'active-motion',
				fromWeek: 6,
				untilWeek: 12,
				description: "Active motion returns: the arm's own muscles move it, without added load."
			},
			{
				phase: 'strengthening',
				fromWeek: 12,
				untilWeek: null,
				description: 'Strengthening begins and builds.'
			}
		]
	},
	'knee-replacement': {
		id: 'knee-replacement',
		name: 'Knee replacement',
		basis:
			'Common practice, from memory: no published source for these weeks is on our reference list. Check against the surgeon’s protocol before clinical use.',
		confidence: 'common practice',
		appliesTo:
			'A first (primary) total knee replacement without complications. A revision or a complicated recovery follows the surgeon’s timing.',
		phases: [
			{
				phase: 'early-motion',
				fromWeek: 0,
				untilWeek: 2,
				description:
					'Bending and straightening from the first days, tightening the thigh muscle, walking with an aid, easing swelling.'
			},
			{
				phase: 'active-motion',
				fromWeek: 2,
				untilWeek: 6,
				description: 'Active range of motion and walking further, relying less on the walking aid.'
			},
			{
				phase: 'strengthening',
				fromWeek: 6,
				untilWeek: 12,
				description: 'Strengthening and balance.'
			},
			{
				phase: 'return-to-activity',
				fromWeek: 12,
				untilWeek: null,
				description: 'Back to usual activities, as the clinician advises.'
			}
		]
	}
};

/** The protocols in the order a form lists them. */
export const PROTOCOL_IDS: readonly ProtocolId[] = ['rotator-cuff-repair', 'knee-replacement'];

/** The table for a stored protocol id, or null when we have none (free text, or empty). */
export function protocolById(id: string): ProtocolTable | null {
	return Object.hasOwn(PROTOCOLS, id) ? PROTOCOLS[id as ProtocolId] : null;
}

/** Where a patient is in a protocol, with the table's basis and the caution. */
export interface PhaseHint {
	protocolId: ProtocolId;
	protocolName: string;
	weeksAfter: number;
	/**
	 * Weeks the surgeon's timing runs behind (+) or ahead of (−) the table: the phase is looked
	 * up at `weeksAfter − shiftWeeks`, and the table's weeks read that much later.
	 */
	shiftWeeks: number;
	appliesTo: string;
	phase: Phase;
	label: string;
	description: string;
	fromWeek: number;
	untilWeek: number | null;
	/** The next phase and the week it starts, or null in the last phase. */
	next: { phase: Phase; label: string; fromWeek: number } | null;
	basis: string;
	confidence: ProtocolTable['confidence'];
	caution: string;
}

/** The most weeks a surgeon's timing may be set apart from a table, either way. */
export const MAX_SHIFT_WEEKS = 12;

/**
 * The suggested phase `weeksAfter` completed weeks after surgery; null for an unknown protocol or
 * before surgery. `shiftWeeks` moves the table by the surgeon's timing (+2: every phase starts two
 * weeks later than the table says), so a slower protocol does not flag every exercise. The weeks
 * in the answer (`fromWeek`, `untilWeek`, `next.fromWeek`) are the patient's, shift included.
 */
export function phaseForWeek(
	protocolId: string,
	weeksAfter: number,
	shiftWeeks = 0
): PhaseHint | null {
	const table = protocolById(protocolId);
	if (!table || weeksAfter < 0 || !Number.isFinite(weeksAfter)) return null;
	const tableWeek = Math.max(0, weeksAfter - shiftWeeks);
	const shifted = (week: number) => Math.max(0, week + shiftWeeks);
	const index = table.phases.findIndex(
		(p) => tableWeek >= p.fromWeek && (p.untilWeek === null || tableWeek < p.untilWeek)
	);
	if (index === -1) return null;
	const row = table.phases[index];
	const following = table.phases[index + 1];
	return {
		protocolId: table.id,
		protocolName: table.name,
		weeksAfter,
		shiftWeeks,
		appliesTo: table.appliesTo,
		phase: row.phase,
		label: PHASE_LABELS[row.phase],
		description: row.description,
		fromWeek: index === 0 ? row.fromWeek : shifted(row.fromWeek),
		untilWeek: row.untilWeek === null ? null : shifted(row.untilWeek),
		next: following
			? {
					phase: following.phase,
					label: PHASE_LABELS[following.phase],
					fromWeek: shifted(following.fromWeek)
				}
			: null,
		basis: table.basis,
		confidence: table.confidence,
		caution: PHASE_CAUTION
	};
}

/** The suggested phase on a local date, from the operation date (see `weeksSince`). */
export function phaseOnDate(
	protocolId: string,
	operationDate: LocalDate,
	date: LocalDate,
	shiftWeeks = 0
): PhaseHint | null {
	return phaseForWeek(protocolId, weeksSince(operationDate, date).weeks, shiftWeeks);
}

/** An exercise marked for a later phase than the weeks after surgery suggest. */
export interface PhaseFlag {
	exercisePhase: Phase;
	suggested: PhaseHint;
	message: string;
	caution: string;
}

const order = (phase: Phase) => PHASES.indexOf(phase);

/**
 * Flags an exercise whose phase comes after the suggested one; null when it is the same or
 * earlier, when the exercise has no phase, or when there is no hint (unknown protocol, before surgery).
 */
export function laterPhaseFlag(
	exercisePhase: Phase | null | undefined,
	suggested: PhaseHint | null
): PhaseFlag | null {
	if (!exercisePhase || !suggested || order(exercisePhase) <= order(suggested.phase)) return null;
	const table = PROTOCOLS[suggested.protocolId];
	const row = table.phases.find((p) => p.phase === exercisePhase);
	const timing =
		suggested.shiftWeeks === 0
			? ''
			: ` (moved ${Math.abs(suggested.shiftWeeks)} ${Math.abs(suggested.shiftWeeks) === 1 ? 'week' : 'weeks'} ${suggested.shiftWeeks > 0 ? 'later' : 'earlier'} for the surgeon’s timing)`;
	const when = `At week ${suggested.weeksAfter} after surgery the ${table.name.toLowerCase()} table${timing} suggests ${suggested.label.toLowerCase()}`;
	const message = row
		? `This exercise is marked ${PHASE_LABELS[exercisePhase].toLowerCase()}, which the table starts at week ${Math.max(0, row.fromWeek + suggested.shiftWeeks)}. ${when}.`
		: `This exercise is marked ${PHASE_LABELS[exercisePhase].toLowerCase()}, a phase the table does not reach. ${when}.`;
	return { exercisePhase, suggested, message, caution: PHASE_CAUTION };
}
