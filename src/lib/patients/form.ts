/**
 * A patient's clinical details as a clinician enters them (on the invitation form and the details
 * page): checked at the edge, kept as typed when refused.
 */
import { DEFAULT_TIME_ZONE } from '$lib/format/instants';
import { z } from 'zod';
import { isLocalDate, isTimeZone } from '$lib/clinical/calendar';
import { PRECAUTIONS, PROTOCOL_IDS_LIST, type PrecautionId } from './vocabulary';

export const PATIENT_SIDES = ['left', 'right', 'both', 'not applicable'] as const;

export interface PatientDetailsDraft {
	fullName: string;
	affectedSide: string;
	condition: string;
	operationDate: string;
	protocol: string;
	/** Vocabulary precautions ticked, by id. */
	precautions: string[];
	/** Free-text precautions, one a line or comma-separated. */
	otherPrecautions: string;
	timeZone: string;
}

export const detailsSchema = z.object({
	fullName: z
		.string()
		.trim()
		.min(1, "Enter the patient's name.")
		.max(120, 'Keep the name under 120 characters.'),
	affectedSide: z.enum(PATIENT_SIDES, 'Choose the affected side.'),
	condition: z.string().trim().max(200, 'Keep the condition under 200 characters.'),
	operationDate: z
		.string()
		.trim()
		.refine(
			(d) => d === '' || isLocalDate(d),
			'Write the operation or injury date as a real date, e.g. 2026-11-10.'
		)
		.transform((d) => (d === '' ? null : d)),
	protocol: z
		.string()
		.refine(
			(p) => p === '' || (PROTOCOL_IDS_LIST as readonly string[]).includes(p),
			'Choose a protocol from the list, or none.'
		),
	precautions: z
		.array(z.string().trim().min(1).max(160, 'Keep each precaution under 160 characters.'))
		.max(20, 'Keep to 20 precautions or fewer.'),
	timeZone: z
		.string()
		.trim()
		.refine(isTimeZone, 'Choose a time zone from the list, e.g. Europe/London.')
});

export type PatientDetails = z.infer<typeof detailsSchema>;

/** "a, b\nc" → ["a", "b", "c"], trimmed, without repeats. */
function splitLines(text: string): string[] {
	const seen = new Set<string>();
	return text
		.split(/[\n,]/)
		.map((t) => t.trim().replace(/\s+/g, ' '))
		.filter((t) => t && !seen.has(t.toLowerCase()) && seen.add(t.toLowerCase()));
}

const known = new Set(Object.keys(PRECAUTIONS));

/** The details part of a submitted form. */
export function detailsDraftFromForm(form: FormData): PatientDetailsDraft {
	const get = (name: string) => {
		const v = form.get(name);
		return typeof v === 'string' ? v : '';
	};
	return {
		fullName: get('fullName'),
		affectedSide: get('affectedSide'),
		condition: get('condition'),
		operationDate: get('operationDate'),
		protocol: get('protocol'),
		precautions: form
			.getAll('precaution')
			.map(String)
			.filter((p) => known.has(p)),
		otherPrecautions: get('otherPrecautions'),
		timeZone: get('timeZone') || DEFAULT_TIME_ZONE
	};
}

/** The form filled from stored details (precautions split into ticked ones and free text). */
export function detailsDraftFrom(p: {
	fullName: string;
	affectedSide: string;
	condition: string;
	operationDate: string | null;
	protocol: string;
	precautions: string[];
	timeZone: string;
}): PatientDetailsDraft {
	return {
		fullName: p.fullName,
		affectedSide: p.affectedSide,
		condition: p.condition,
		operationDate: p.operationDate ?? '',
		protocol: p.protocol,
		precautions: p.precautions.filter((x) => known.has(x)),
		otherPrecautions: p.precautions.filter((x) => !known.has(x)).join('\n'),
		timeZone: p.timeZone
	};
}

/** A new patient's form; the time zone starts as the clinic's. */
export function emptyDetailsDraft(timeZone = DEFAULT_TIME_ZONE): PatientDetailsDraft {
	return {
		fullName: '',
		affectedSide: 'not applicable',
		condition: '',
		operationDate: '',
		protocol: '',
		precautions: [],
		otherPrecautions: '',
		timeZone
	};
}

/** Checks a draft; the first problem's sentence on refusal. */
export function parseDetails(
	draft: PatientDetailsDraft
): { ok: true; details: PatientDetails } | { ok: false; message: string; path: string } {
	const result = detailsSchema.safeParse({
		...draft,
		precautions: [
			...draft.precautions.map((p) => p as PrecautionId),
			...splitLines(draft.otherPrecautions)
		]
	});
	if (result.success) return { ok: true, details: result.data };
	const issue = result.error.issues[0];
	return { ok: false, message: issue.message, path: issue.path.join('.') };
}
