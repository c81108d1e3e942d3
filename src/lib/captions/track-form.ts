import { z } from 'zod';
import { canonicalLanguage, notALanguageTag, TRACK_KINDS } from './types';

/**
 * A track's language as typed into a form: a BCP 47 tag of at most 35 characters, trimmed. A
 * blank is let through for the form to refuse or fill in.
 */
export const languageTag = z
	.string()
	.trim()
	.max(35, 'Keep the language tag to 35 characters, such as en-GB.')
	.refine((tag) => tag === '' || canonicalLanguage(tag) !== null, {
		error: (issue) => notALanguageTag(String(issue.input))
	});

/** A new caption track as a clinician describes it: its kind, language and the name viewers see. */
export const trackDetails = z.object({
	kind: z.enum(TRACK_KINDS, 'Choose one of the kinds listed.'),
	language: languageTag.min(1, 'Give the language as a tag, such as en-GB.'),
	label: z.string().trim().max(100, 'Keep the name to 100 characters.')
});

/** A caption file chosen for import; what is inside is read on the server (readCaptionFile). */
export const captionFile = z.instanceof(File, { error: 'Choose a .vtt or .srt file to import.' });
