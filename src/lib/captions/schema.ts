import { z } from 'zod';
import {
	cueTextProblem,
	isCueIdentifier,
	isRegionIdentifier,
	MAX_CUE_SECONDS,
	tidyCueText
} from './grammar';
import type { Cue, CueSettings } from './types';

/**
 * The one schema for cues that are stored: the save API, import and restore all pass through it,
 * so whatever is stored can be written to a WebVTT file and read back unchanged (the property
 * test beside it). Each field is checked against the WebVTT grammar (grammar.ts).
 */

/** The largest track we accept: far above a long narrated recording's few hundred cues. */
export const MAX_CUES = 10_000;

/** Percentages are kept to a thousandth, so they print as plain decimals ("0.001", never "1e-7"). */
const percent = z
	.number()
	.finite()
	.min(0)
	.max(100)
	.transform((n) => Math.round(n * 1000) / 1000);

const settingsSchema = z
	.object({
		vertical: z.enum(['rl', 'lr']).optional(),
		line: z.number().finite().min(-1000).max(1000).optional(),
		snapToLines: z.boolean().optional(),
		lineAlign: z.enum(['start', 'center', 'end']).optional(),
		position: percent.optional(),
		positionAlign: z.enum(['line-left', 'center', 'line-right']).optional(),
		size: percent.optional(),
		align: z.enum(['start', 'center', 'end', 'left', 'right']).optional(),
		region: z
			.string()
			.max(100, 'A region name can be at most 100 characters.')
			.refine(isRegionIdentifier, 'A region name cannot hold spaces, line breaks or “-->”.')
			.optional()
	})
	.strict()
	.superRefine((s, ctx) => {
		if (s.line === undefined) return;
		if (s.snapToLines === false) {
			if (s.line < 0 || s.line > 100)
				ctx.addIssue({
					code: 'custom',
					path: ['line'],
					message: 'A line as a percentage is 0–100.'
				});
		} else if (!Number.isInteger(s.line)) {
			ctx.addIssue({ code: 'custom', path: ['line'], message: 'A line number is a whole number.' });
		}
	})
	.transform((s): CueSettings | undefined => {
		// A line as a percentage prints like the other percentages ("0.001", never "1e-7").
		if (s.line !== undefined && s.snapToLines === false) s.line = Math.round(s.line * 1000) / 1000;
		// Kinelume keeps no REGION blocks with a track, so a region name would point at nothing
		// in the file we serve; it is checked above, then not kept.
		const settings: CueSettings = { ...s };
		delete settings.region;
		if (settings.line !== undefined && settings.snapToLines !== false) delete settings.snapToLines;
		if (settings.line === undefined) {
			delete settings.snapToLines;
			delete settings.lineAlign;
		}
		if (settings.position === undefined) delete settings.positionAlign;
		// The defaults say nothing; a file read back leaves them out too.
		if (settings.lineAlign === 'start') delete settings.lineAlign;
		if (settings.size === 100) delete settings.size;
		if (settings.align === 'center') delete settings.align;
		return Object.keys(settings).length > 0 ? settings : undefined;
	});

const seconds = z
	.number()
	.finite()
	.min(0)
	.max(MAX_CUE_SECONDS, 'A cue time can be at most 99:59:59.999.')
	.transform((n) => Math.round(n * 1000) / 1000);

export const cueSchema = z
	.object({
		id: z
			.string()
			.max(500, 'A cue name can be at most 500 characters.')
			.refine(
				(id) => id === '' || isCueIdentifier(id),
				'A cue name cannot hold line breaks or “-->”.'
			),
		start: seconds,
		end: seconds,
		text: z
			.string()
			.max(5000, 'A cue can hold at most 5,000 characters.')
			.transform(tidyCueText)
			.superRefine((text, ctx) => {
				const problem = cueTextProblem(text);
				if (problem) ctx.addIssue({ code: 'custom', message: `The ${problem}.` });
			}),
		settings: settingsSchema.optional()
	})
	.transform((c): Cue => {
		const { settings, ...rest } = c;
		return settings ? { ...rest, settings } : rest;
	});

export const cuesSchema = z
	.array(cueSchema)
	.max(MAX_CUES, `A track can hold at most ${MAX_CUES} cues.`);

/** "Cue 3: A cue name cannot hold line breaks or “-->”." — the first problem, for a person. */
export function cueProblemSentence(error: z.ZodError): string {
	const issue = error.issues[0];
	const index = typeof issue?.path[0] === 'number' ? issue.path[0] : null;
	return index === null
		? (issue?.message ?? 'The cues are not valid.')
		: `Cue ${index + 1}: ${issue.message}`;
}
