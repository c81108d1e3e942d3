/**
 * The submission form as typed, and its one zod schema: every field kept as text (the key points
 * one a line) so a refused submission shows exactly what the clinician entered. The submit page
 * checks a post with it through superforms; parseSubmission turns a draft into checked input.
 */
import { z } from 'zod';
import { LICENCES, type Licence } from './types';

export const MAX_COACHING_CUES = 20;

/** The key points typed one a line, blank lines left out. */
const cueLines = (text: string) =>
	text
		.split(/\r?\n/)
		.map((l) => l.trim())
		.filter(Boolean);

const coachingCueList = z
	.array(z.string().max(300, 'Keep each key point under 300 characters.'))
	.max(MAX_COACHING_CUES, `At most ${MAX_COACHING_CUES} key points.`);

export const submissionForm = z.object({
	title: z
		.string()
		.trim()
		.min(3, 'Give the exercise a title of at least 3 characters.')
		.max(120, 'Keep the title under 120 characters.'),
	description: z.string().trim().max(2000, 'Keep the description under 2,000 characters.'),
	/** One key point (coaching cue) a line; stays text, so a refusal gives the lines back as typed. */
	coachingCues: z.string().superRefine((text, ctx) => {
		const checked = coachingCueList.safeParse(cueLines(text));
		if (checked.success) return;
		// Said once however many lines are too long.
		for (const message of new Set(checked.error.issues.map((i) => i.message))) {
			ctx.addIssue({ code: 'custom', message });
		}
	}),
	safetyNotes: z.string().trim().max(6000, 'Keep the safety notes under 6,000 characters.'),
	consent: z
		.boolean()
		.refine(
			(ticked) => ticked,
			'Confirm that everyone filmed agreed to publication; the library cannot take it otherwise.'
		),
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

export type SubmissionDraft = z.input<typeof submissionForm>;
type CheckedDraft = z.output<typeof submissionForm>;

export interface ParsedSubmission {
	wording: { title: string; description: string; coachingCues: string[]; safetyNotes: string };
	consentConfirmed: true;
	consentDetails: string;
	licence: Licence;
	attribution: string;
	noteToReviewer: string;
}

/** A draft that passed the schema, as the library takes it. */
export function toSubmission(d: CheckedDraft): ParsedSubmission {
	return {
		wording: {
			title: d.title,
			description: d.description,
			coachingCues: cueLines(d.coachingCues),
			safetyNotes: d.safetyNotes
		},
		consentConfirmed: true,
		consentDetails: d.consentDetails,
		licence: d.licence,
		attribution: d.attribution,
		noteToReviewer: d.noteToReviewer
	};
}

export type ParseResult =
	| { ok: true; input: ParsedSubmission }
	| { ok: false; problems: { path: string; message: string }[] };

/** Checks a draft; every problem is named by its field. */
export function parseSubmission(draft: SubmissionDraft): ParseResult {
	const parsed = submissionForm.safeParse(draft);
	if (!parsed.success) {
		return {
			ok: false,
			problems: parsed.error.issues.map((i) => ({
				path: String(i.path[0] ?? ''),
				message: i.message
			}))
		};
	}
	return { ok: true, input: toSubmission(parsed.data) };
}
