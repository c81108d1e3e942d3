/**
 * A patient's clinical details as a clinician enters them (on the invitation form and the details
 * page): checked at the edge, kept as typed when refused.
 */
import { DEFAULT_TIME_ZONE } from '$lib/format/instants';
import { z } from 'zod';
import { isLocalDate, isTimeZone } from '$lib/clinical/calendar';
import { MAX_SHIFT_WEEKS } from '$lib/clinical/phases';
import {
	detailOf,
	normaliseFreeText,
	precautionDetailsSchema,
	resolvePrecaution,
	type PrecautionDetail
} from '$lib/clinical/precautions';
import { parseUntil, untilText } from '$lib/clinical/until';
import {
	PATIENT_SIDES,
	PRECAUTIONS,
	PRECAUTIONS_WITH_DEGREES,
	PROTOCOL_IDS_LIST,
	SEXES,
	type PrecautionId
} from './vocabulary';

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
	/** Each ticked precaution's end as typed ("6" for week 6, or a date), by id. */
	precautionUntil: Record<string, string>;
	/** Degrees for the precautions that take them, by id. */
	precautionDegrees: Record<string, string>;
	/** Weeks the surgeon's timing runs later (+) or earlier (−) than the table, as typed. */
	protocolShiftWeeks: string;
	/** The sling's last day between sessions, 'YYYY-MM-DD' or empty. */
	slingUntil: string;
	birthYear: string;
	sex: string;
	timeZone: string;
}

/** A birth year a person under care can have, checked against the year it is entered in. */
const birthYearSchema = z
	.string()
	.trim()
	.transform((y, ctx) => {
		if (y === '') return null;
		const year = Number(y);
		const now = new Date().getUTCFullYear();
		if (!/^\d{4}$/.test(y) || year < now - 120 || year > now) {
			ctx.addIssue({
				code: 'custom',
				message: `Write the birth year as four digits between ${now - 120} and ${now}, or leave it empty.`
			});
			return z.NEVER;
		}
		return year;
	});

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
	precautionDetails: precautionDetailsSchema,
	protocolShiftWeeks: z
		.string()
		.trim()
		.transform((w) => {
			const typed = w.replace('−', '-');
			if (typed === '') return 0;
			// Whole weeks in digits only ("0x0c" and "1e1" are not weeks).
			return /^[-+]?\d{1,2}$/.test(typed) ? Number(typed) : NaN;
		})
		.pipe(
			z
				.number({ error: 'Write the surgeon’s timing as a whole number of weeks, e.g. 2 or -1.' })
				.int('Write the surgeon’s timing as a whole number of weeks, e.g. 2 or -1.')
				.min(
					-MAX_SHIFT_WEEKS,
					`Keep the surgeon’s timing within ${MAX_SHIFT_WEEKS} weeks either way.`
				)
				.max(
					MAX_SHIFT_WEEKS,
					`Keep the surgeon’s timing within ${MAX_SHIFT_WEEKS} weeks either way.`
				)
		),
	slingUntil: z
		.string()
		.trim()
		.refine(
			(d) => d === '' || isLocalDate(d),
			'Write the last day of the sling as a real date, e.g. 2026-12-14, or leave it empty.'
		)
		.transform((d) => (d === '' ? null : d)),
	birthYear: birthYearSchema,
	sex: z
		.enum(['', ...SEXES], 'Choose female, male or not recorded.')
		.transform((s) => (s === '' ? null : s)),
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

/**
 * Each precaution once: free text that names a vocabulary precaution (its id or label) becomes
 * that id, so a precaution ticked and typed is stored once and its end applies to it.
 */
function distinctPrecautions(list: readonly string[]): string[] {
	const seen = new Set<string>();
	const out: string[] = [];
	for (const raw of list) {
		const resolved = resolvePrecaution(raw);
		const stored = resolved.kind === 'known' ? resolved.id : resolved.text;
		const key = resolved.kind === 'known' ? resolved.id : normaliseFreeText(resolved.text);
		if (stored === '' || seen.has(key)) continue;
		seen.add(key);
		out.push(stored);
	}
	return out;
}

/** A draft from the form's fields, however they arrived: by name, and the ticked precautions. */
function draftFromFields(
	get: (name: string) => string,
	ticked: readonly string[]
): PatientDetailsDraft {
	return {
		fullName: get('fullName'),
		affectedSide: get('affectedSide'),
		condition: get('condition'),
		operationDate: get('operationDate'),
		protocol: get('protocol'),
		precautions: ticked.filter((p) => known.has(p)),
		otherPrecautions: get('otherPrecautions'),
		precautionUntil: Object.fromEntries(
			[...known].map((id) => [id, get(untilName(id))]).filter(([, v]) => v !== '')
		),
		precautionDegrees: Object.fromEntries(
			PRECAUTIONS_WITH_DEGREES.map((id) => [id, get(degreesName(id))]).filter(([, v]) => v !== '')
		),
		protocolShiftWeeks: get('protocolShiftWeeks'),
		slingUntil: get('slingUntil'),
		birthYear: get('birthYear'),
		sex: get('sex'),
		timeZone: get('timeZone') || DEFAULT_TIME_ZONE
	};
}

/** The details part of a submitted form. */
export function detailsDraftFromForm(form: FormData): PatientDetailsDraft {
	return draftFromFields((name) => {
		const v = form.get(name);
		return typeof v === 'string' ? v : '';
	}, form.getAll('precaution').map(String));
}

/** The form filled from stored details (precautions split into ticked ones and free text). */
export function detailsDraftFrom(p: PatientDetails): PatientDetailsDraft {
	const ticked = p.precautions.filter((x) => known.has(x));
	return {
		fullName: p.fullName,
		affectedSide: p.affectedSide,
		condition: p.condition,
		operationDate: p.operationDate ?? '',
		protocol: p.protocol,
		precautions: ticked,
		otherPrecautions: p.precautions.filter((x) => !known.has(x)).join('\n'),
		precautionUntil: Object.fromEntries(
			ticked
				.map((id) => [id, untilText(detailOf(p.precautionDetails, id))])
				.filter(([, v]) => v !== '')
		),
		precautionDegrees: Object.fromEntries(
			ticked.flatMap((id) => {
				const degrees = detailOf(p.precautionDetails, id).degrees;
				return degrees === null ? [] : [[id, String(degrees)]];
			})
		),
		protocolShiftWeeks: p.protocolShiftWeeks === 0 ? '' : String(p.protocolShiftWeeks),
		slingUntil: p.slingUntil ?? '',
		birthYear: p.birthYear === null ? '' : String(p.birthYear),
		sex: p.sex ?? '',
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
		precautionUntil: {},
		precautionDegrees: {},
		protocolShiftWeeks: '',
		slingUntil: '',
		birthYear: '',
		sex: '',
		timeZone
	};
}

/** A refused detail: its sentence, and the form field it is about. */
export interface DetailProblem {
	path: string;
	message: string;
}

/**
 * The ends and degrees of the ticked precautions, read from what was typed; each refusal names
 * the precaution. Details of unticked precautions are dropped.
 */
function precautionDetailsFrom(draft: PatientDetailsDraft): {
	details: Record<string, PrecautionDetail>;
	problems: DetailProblem[];
} {
	const details: Record<string, PrecautionDetail> = {};
	const problems: DetailProblem[] = [];
	for (const id of draft.precautions) {
		const label = PRECAUTIONS[id as PrecautionId];
		const until = parseUntil(draft.precautionUntil[id] ?? '');
		if (!until.ok) problems.push({ message: `${label}: ${until.message}`, path: untilName(id) });
		const degreesText = (draft.precautionDegrees[id] ?? '').trim();
		let degrees: number | null = null;
		if (degreesText !== '') {
			degrees = /^\d{1,3}$/.test(degreesText) ? Number(degreesText) : NaN;
			if (!Number.isInteger(degrees) || degrees < 0 || degrees > 180) {
				problems.push({
					message: `${label}: give whole degrees from 0 to 180, e.g. 20.`,
					path: degreesName(id)
				});
				continue;
			}
		}
		if (!until.ok) continue;
		if (until.until.untilWeek !== null || until.until.untilDate !== null || degrees !== null) {
			details[id] = { ...until.until, degrees };
		}
	}
	return { details, problems };
}

/** Checks a draft: the details, or every problem on the field it belongs to. */
export function checkDetails(
	draft: PatientDetailsDraft
): { ok: true; details: PatientDetails } | { ok: false; problems: DetailProblem[] } {
	const { details, problems } = precautionDetailsFrom(draft);
	const result = detailsSchema.safeParse({
		...draft,
		precautions: distinctPrecautions([
			...draft.precautions.map((p) => p as PrecautionId),
			...splitLines(draft.otherPrecautions)
		]),
		precautionDetails: details
	});
	if (!result.success) {
		for (const issue of result.error.issues) {
			problems.push({ message: issue.message, path: issue.path.join('.') });
		}
	}
	if (problems.length > 0 || !result.success) return { ok: false, problems };
	return { ok: true, details: result.data };
}

/** Checks a draft; the first problem's sentence on refusal. */
export function parseDetails(
	draft: PatientDetailsDraft
): { ok: true; details: PatientDetails } | { ok: false; message: string; path: string } {
	const checked = checkDetails(draft);
	return checked.ok ? checked : { ok: false, ...checked.problems[0] };
}

const untilName = (id: string) => `precaution-until-${id}` as const;
const degreesName = (id: string) => `precaution-degrees-${id}` as const;

type TextField = {
	[K in keyof PatientDetailsDraft]: PatientDetailsDraft[K] extends string ? K : never;
}[keyof PatientDetailsDraft];
type DegreesId = (typeof PRECAUTIONS_WITH_DEGREES)[number];

const blankDraft = emptyDetailsDraft();
const textField = (name: string) =>
	typeof blankDraft[name as keyof PatientDetailsDraft] === 'string';

/**
 * The details form as it is posted (superforms' schema): every field as typed, the ticks as
 * `precaution`, and each precaution's end and degrees under its own name. A draft's fields, so
 * the shape is written once (PatientDetailsDraft); the checks are the stored details' own, in
 * `withDetailChecks`.
 */
export const detailsFormFields = z.object({
	...(Object.fromEntries(
		Object.keys(blankDraft)
			.filter(textField)
			.map((name) => [name, z.string()])
	) as Record<TextField, z.ZodString>),
	precaution: z.array(z.string()),
	...(Object.fromEntries([...known].map((id) => [untilName(id), z.string()])) as Record<
		`precaution-until-${PrecautionId}`,
		z.ZodString
	>),
	...(Object.fromEntries(
		PRECAUTIONS_WITH_DEGREES.map((id) => [degreesName(id), z.string()])
	) as Record<`precaution-degrees-${DegreesId}`, z.ZodString>)
});

export type DetailsForm = z.infer<typeof detailsFormFields>;

/** The form's fields from a draft (the stored details, or a new patient's). */
export function detailsFormOf(draft: PatientDetailsDraft): DetailsForm {
	const { precautions, precautionUntil, precautionDegrees, ...text } = draft;
	return {
		...text,
		precaution: precautions,
		...Object.fromEntries([...known].map((id) => [untilName(id), precautionUntil[id] ?? ''])),
		...Object.fromEntries(
			PRECAUTIONS_WITH_DEGREES.map((id) => [degreesName(id), precautionDegrees[id] ?? ''])
		)
	} as DetailsForm;
}

/** The draft the form's fields hold. */
export function draftOfDetailsForm(form: DetailsForm): PatientDetailsDraft {
	const fields = form as unknown as Record<string, unknown>;
	return draftFromFields((name) => {
		const value = fields[name];
		return typeof value === 'string' ? value : '';
	}, form.precaution);
}

/** The form field a problem of the stored details belongs to. */
function fieldOf(path: string): string {
	// The stored list joins the ticks and the free text; only the free text can be refused.
	if (path.startsWith('precautions')) return 'otherPrecautions';
	return path.startsWith('precautionDetails') ? '' : path;
}

/**
 * The stored details' checks on the form's fields, every problem on its own field, even when
 * another field of the schema (the invitation's e-mail address) is wrong too.
 */
export function withDetailChecks<S extends z.ZodType<DetailsForm>>(schema: S): S {
	return schema.superRefine(
		(form, ctx) => {
			const checked = checkDetails(draftOfDetailsForm(form));
			if (checked.ok) return;
			for (const problem of checked.problems) {
				const path = fieldOf(problem.path);
				ctx.addIssue({ code: 'custom', message: problem.message, path: path ? [path] : [] });
			}
		},
		{ when: (payload) => detailsFormFields.safeParse(payload.value).success }
	);
}
