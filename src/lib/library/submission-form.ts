/**
 * The submission form as typed: every field kept as text so a refused submission shows exactly
 * what the clinician entered, and the zod schema that turns it into checked input.
 */
import { z } from 'zod';
import { LICENCES, type Licence } from './types';

export interface SubmissionDraft {
	title: string;
	description: string;
	/** One key point (coaching cue) per line. */
	coachingCues: string;
	safetyNotes: string;
	consent: boolean;
	consentDetails: string;
	licence: string;
	attribution: string;
	noteToReviewer: string;
}

export function draftFromForm(form: FormData): SubmissionDraft {
	const text = (name: string) => String(form.get(name) ?? '');
	return {
		title: text('title'),
		description: text('description'),
		coachingCues: text('coachingCues'),
		safetyNotes: text('safetyNotes'),
		consent: form.get('consent') === 'yes',
		consentDetails: text('consentDetails'),
		licence: text('licence'),
		attribution: text('attribution'),
		noteToReviewer: text('noteToReviewer')
	};
}

export const MAX_COACHING_CUES = 20;

const schema = z.object({
	title: z
		.string()
		.trim()
		.min(3, 'Give the exercise a title of at least 3 characters.')
		.max(120, 'Keep the title under 120 characters.'),
	description: z.string().trim().max(2000, 'Keep the description under 2,000 characters.'),
	coachingCues: z
		.array(z.string().max(300, 'Keep each key point under 300 characters.'))
		.max(MAX_COACHING_CUES, `At most ${MAX_COACHING_CUES} key points.`),
	safetyNotes: z.string().trim().max(6000, 'Keep the safety notes under 6,000 characters.'),
	consent: z.literal(true, {
		error:
			'Confirm that everyone filmed agreed to publication; the library cannot take it otherwise.'
	}),
	consentDetails: z
		.string()
		.trim()
		.max(500, 'Keep where the consent is kept under 500 characters.'),
	licence: z.enum(LICENCES, { error: 'Choose a licence for reuse.' }),
	attribution: z
		.string()
		.trim()
		.min(2, 'Give the credit line the public will see (for example your team’s name).')
		.max(200, 'Keep the credit line under 200 characters.'),
	noteToReviewer: z.string().trim().max(2000, 'Keep the note under 2,000 characters.')
});

export interface ParsedSubmission {
	wording: { title: string; description: string; coachingCues: string[]; safetyNotes: string };
	consentConfirmed: true;
	consentDetails: string;
	licence: Licence;
	attribution: string;
	noteToReviewer: string;
}

export type ParseResult =
	| { ok: true; input: ParsedSubmission }
	| { ok: false; problems: { path: string; message: string }[] };

/** Checks a draft; every problem is named by its field. */
export function parseSubmission(draft: SubmissionDraft): ParseResult {
	const parsed = schema.safeParse({
		...draft,
		coachingCues: draft.coachingCues
			.split(/\r?\n/)
			.map((l) => l.trim())
			.filter(Boolean)
	});
	if (!parsed.success) {
		return {
			ok: false,
			problems: parsed.error.issues.map((i) => ({
				path: String(i.path[0] ?? ''),
				message: i.message
			}))
		};
	}
	const d = parsed.data;
	return {
		ok: true,
		input: {
			wording: {
				title: d.title,
				description: d.description,
				coachingCues: d.coachingCues,
				safetyNotes: d.safetyNotes
			},
			consentConfirmed: true,
			consentDetails: d.consentDetails,
			licence: d.licence,
			attribution: d.attribution,
			noteToReviewer: d.noteToReviewer
		}
	};
}
