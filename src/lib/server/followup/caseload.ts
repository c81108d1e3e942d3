import type { PainTrend } from '$lib/clinical/pain';
import {
	FLAG_KINDS,
	patientFigures,
	type AdherenceFigure,
	type Flag,
	type FlagKind
} from '$lib/followup/figures';
import { painNotComparedBasis } from '$lib/followup/words';
import type { Patient } from '../db/schema/patients';
import { clinicPatients, figureInput, loadRecords } from './records';

export const CASELOAD_SORTS = [
	'name',
	'adherence7',
	'adherence28',
	'last-session',
	'pain',
	'week'
] as const;
export type CaseloadSort = (typeof CASELOAD_SORTS)[number];

export const CASELOAD_FILTERS = ['all', 'flagged', ...FLAG_KINDS, 'no-flags'] as const;
export type CaseloadFilter = (typeof CASELOAD_FILTERS)[number];

export interface CaseloadQuery {
	sort: CaseloadSort;
	dir: 'asc' | 'desc';
	flag: CaseloadFilter;
	/** Part of a name; case does not matter. */
	q: string;
	/** Only the patients the caller looks after. */
	mine: boolean;
	page: number;
	pageSize: number;
}

export interface CaseloadRow {
	id: string;
	fullName: string;
	condition: string;
	affectedSide: Patient['affectedSide'];
	today: string;
	prescribed: boolean;
	adherence7: AdherenceFigure | null;
	adherence28: AdherenceFigure | null;
	lastSession: { localDate: string; doneAt: Date; pain: number; exerciseTitle: string } | null;
	pain:
		| (Pick<PainTrend, 'baseline' | 'baselineKind' | 'recent' | 'change' | 'flagged'> & {
				text: string;
				/** Why it is not compared yet, in a few words; null once it is. */
				notCompared: string | null;
		  })
		| null;
	operationDate: string | null;
	sinceOperation: { days: number; weeks: number; text: string } | null;
	phase: { label: string; protocolName: string; caution: string } | null;
	flags: Flag[];
}

export interface Caseload {
	rows: CaseloadRow[];
	total: number;
	page: number;
	pageCount: number;
	/** Patients in the caller's view (before the flag filter and the search) with each flag. */
	counts: Record<CaseloadFilter, number>;
}

function matchesFlag(row: CaseloadRow, flag: CaseloadFilter): boolean {
	if (flag === 'all') return true;
	if (flag === 'flagged') return row.flags.length > 0;
	if (flag === 'no-flags') return row.flags.length === 0;
	return row.flags.some((f) => f.kind === (flag as FlagKind));
}

/** The value a column sorts by; null sorts last whichever the direction. */
function sortValue(row: CaseloadRow, sort: CaseloadSort): number | string | null {
	switch (sort) {
		case 'name':
			return row.fullName.toLocaleLowerCase('en-GB');
		case 'adherence7':
			return row.adherence7?.ratio ?? null;
		case 'adherence28':
			return row.adherence28?.ratio ?? null;
		case 'last-session':
			return row.lastSession?.doneAt.getTime() ?? null;
		case 'pain':
			// Flagged first when descending, then by the size of the change.
			if (!row.pain) return null;
			return (row.pain.flagged ? 1000 : 0) + (row.pain.change ?? -100);
		case 'week':
			return row.sinceOperation?.days ?? null;
	}
}

function compareRows(a: CaseloadRow, b: CaseloadRow, sort: CaseloadSort, dir: 'asc' | 'desc') {
	const x = sortValue(a, sort);
	const y = sortValue(b, sort);
	if (x === null || y === null) {
		if (x !== y) return x === null ? 1 : -1;
	} else if (x !== y) {
		const order = x < y ? -1 : 1;
		return dir === 'asc' ? order : -order;
	}
	return a.fullName.localeCompare(b.fullName, 'en-GB') || a.id.localeCompare(b.id);
}

/**
 * The caller's caseload: every patient of their clinic (or only their own), each with the
 * follow-up figures, then filtered, sorted and cut into pages. Another clinic's patient never
 * enters: the patients are read by clinic first, and every record after that by the same clinic.
 */
export function listCaseload(
	caller: { id: string; clinicId: string },
	query: CaseloadQuery,
	now = new Date()
): Caseload {
	const patients = clinicPatients(caller.clinicId, query.mine ? caller.id : undefined);
	// All logs, not only the last 28 days: the pain baseline is each patient's first week.
	const records = loadRecords(caller.clinicId, patients);
	const all: CaseloadRow[] = patients.map((patient) => {
		const input = figureInput(records.get(patient.id)!);
		const f = patientFigures(input, now);
		return {
			id: patient.id,
			fullName: patient.fullName,
			condition: patient.condition,
			affectedSide: patient.affectedSide,
			today: f.today,
			prescribed: f.prescribed,
			adherence7: f.adherence7,
			adherence28: f.adherence28,
			lastSession: f.lastSession
				? {
						localDate: f.lastSession.localDate,
						doneAt: f.lastSession.doneAt,
						pain: f.lastSession.pain,
						exerciseTitle: f.lastSession.exerciseTitle
					}
				: null,
			pain: f.pain
				? {
						baseline: f.pain.baseline,
						baselineKind: f.pain.baselineKind,
						recent: f.pain.recent,
						change: f.pain.change,
						flagged: f.pain.flagged,
						text: f.pain.text,
						notCompared: f.pain.change === null ? painNotComparedBasis(f.pain) : null
					}
				: null,
			operationDate: patient.operationDate,
			sinceOperation: f.sinceOperation,
			phase: f.phase
				? { label: f.phase.label, protocolName: f.phase.protocolName, caution: f.phase.caution }
				: null,
			flags: f.flags
		};
	});

	const counts = Object.fromEntries(
		CASELOAD_FILTERS.map((flag) => [flag, all.filter((r) => matchesFlag(r, flag)).length])
	) as Record<CaseloadFilter, number>;

	const needle = query.q.trim().toLocaleLowerCase('en-GB');
	const filtered = all
		.filter((r) => matchesFlag(r, query.flag))
		.filter((r) => !needle || r.fullName.toLocaleLowerCase('en-GB').includes(needle))
		.sort((a, b) => compareRows(a, b, query.sort, query.dir));
	const pageCount = Math.max(1, Math.ceil(filtered.length / query.pageSize));
	const page = Math.min(Math.max(1, query.page), pageCount);
	return {
		rows: filtered.slice((page - 1) * query.pageSize, page * query.pageSize),
		total: filtered.length,
		page,
		pageCount,
		counts
	};
}
