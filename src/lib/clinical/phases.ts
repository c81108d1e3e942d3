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

/** The suggested phase `weeksAfter` completed weeks after surgery; null for an unknown protocol or before surgery. */
export function phaseForWeek(protocolId: string, weeksAfter: number): PhaseHint | null {
	const table = protocolById(protocolId);
	if (!table || weeksAfter < 0 || !Number.isFinite(weeksAfter)) return null;
	const index = table.phases.findIndex(
		(p) => weeksAfter >= p.fromWeek && (p.untilWeek === null || weeksAfter < p.untilWeek)
	);
	if (index === -1) return null;
	const row = table.phases[index];
	const following = table.phases[index + 1];
	return {
		protocolId: table.id,
		protocolName: table.name,
		weeksAfter,
		phase: row.phase,
		label: PHASE_LABELS[row.phase],
		description: row.description,
		fromWeek: row.fromWeek,
		untilWeek: row.untilWeek,
		next: following
			? {
					phase: following.phase,
					label: PHASE_LABELS[following.phase],
					fromWeek: following.fromWeek
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
	date: LocalDate
): PhaseHint | null {
	return phaseForWeek(protocolId, weeksSince(operationDate, date).weeks);
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
	const when = `At week ${suggested.weeksAfter} after surgery the ${table.name.toLowerCase()} table suggests ${suggested.label.toLowerCase()}`;
	const message = row
		? `This exercise is marked ${PHASE_LABELS[exercisePhase].toLowerCase()}, which the table starts at week ${row.fromWeek}. ${when}.`
		: `This exercise is marked ${PHASE_LABELS[exercisePhase].toLowerCase()}, a phase the table does not reach. ${when}.`;
	return { exercisePhase, suggested, message, caution: PHASE_CAUTION };
}
