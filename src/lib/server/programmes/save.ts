import { programmeSaveSchema, problemsOf } from '$lib/programmes/schema';
import { draftToInput, type ProgrammeDraft } from '$lib/programmes/builder';
import type { Principal } from '../auth/principal';
import { ProgrammeError, saveProgramme, type ProgrammeView } from './index';

export type SaveOutcome =
	| { ok: true; view: ProgrammeView }
	| { ok: false; status: number; message: string; problems: { path: string; message: string }[] };

/**
 * Checks a builder draft with the same schema the browser used and saves it. Every refusal comes
 * back as sentences (never thrown), so the caller can answer with the clinician's edits intact.
 */
export function saveDraft(
	clinician: Principal,
	programmeId: string,
	draft: ProgrammeDraft | unknown,
	asInput = false
): SaveOutcome {
	const parsed = programmeSaveSchema.safeParse(
		asInput ? draft : draftToInput(draft as ProgrammeDraft)
	);
	if (!parsed.success) {
		const problems = problemsOf(parsed.error);
		return {
			ok: false,
			status: 400,
			message: 'The programme was not saved: fix what is listed, nothing you typed is lost.',
			problems
		};
	}
	try {
		return { ok: true, view: saveProgramme(clinician, programmeId, parsed.data) };
	} catch (e) {
		if (e instanceof ProgrammeError)
			return { ok: false, status: e.status, message: e.message, problems: [] };
		throw e;
	}
}
