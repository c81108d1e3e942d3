/**
 * The shape of a drafting vocabulary: the phrases, numbers and cautions that `draftExercise` looks
 * for, per language. The English one is data (./en.json); a clinic's own words are a partial file of
 * the same shape, added with `mergeVocabulary`. Types come from these schemas, never written twice.
 *
 * Phrases are templates (see ../patterns.ts): plain words, `(a|b)` for one of, `[a|b]` for an
 * optional one of, `…` for up to four words in between, and `{placeholders}` where a context
 * allows them.
 */
import { z } from 'zod';
import { DOSAGE_FIELDS, type DosageField } from '$lib/dosage/types';
import { EXERCISE_SIDES, MOVEMENT_TYPES, POSITIONS } from '$lib/exercises/vocabulary';
import { templateProblem, type TemplateContext } from '../patterns';

const word = z.string().trim().min(1).max(80);
const words = z.array(word).max(500);

function template(context: TemplateContext) {
	return z
		.string()
		.trim()
		.min(1)
		.max(300)
		.superRefine((text, ctx) => {
			const problem = templateProblem(text, context);
			if (problem) ctx.addIssue({ code: 'custom', message: `"${text}": ${problem}` });
		});
}
const templates = (context: TemplateContext = 'plain') => z.array(template(context)).max(500);

const count = z.number().int().min(0).max(1000);
const dosageField = z.custom<DosageField>(
	(value) => typeof value === 'string' && (DOSAGE_FIELDS as readonly string[]).includes(value),
	`must be one of ${DOSAGE_FIELDS.join(', ')}`
);

const vagueAmount = z
	.object({ phrase: word, min: count, max: count })
	.strict()
	.refine((v) => v.min < v.max, 'min must be below max');

/** A phrase that means one dosage value on its own ("every day" is 7 days a week). */
const fixedDosagePhrase = z
	.object({
		phrase: template('plain'),
		field: dosageField,
		value: count.optional(),
		min: count.optional(),
		max: count.optional()
	})
	.strict()
	.refine(
		(p) =>
			p.value !== undefined
				? p.min === undefined && p.max === undefined
				: p.min !== undefined && p.max !== undefined && p.min < p.max,
		'give either a value or a min below a max'
	);

const vocabularyShape = {
	/** Number words and their values ("twelve": 12, "twice": 2). */
	numbers: z.record(word, count),
	/** Words that count exercises ("first"), besides numbers. */
	ordinals: words,
	/** Amounts that are not one number; the clinician picks within the range. */
	vagueAmounts: z.array(vagueAmount).max(100),
	/** Words before an amount that do not change it ("about ten"). */
	approximators: words,
	/** Words between the ends of a range ("eight to ten"); a dash always works. */
	rangeJoiners: words,
	/** Time units in seconds ("minute": 60). */
	timeUnits: z.record(word, z.number().positive().max(3600)),
	/** Whole phrases that are a duration ("half a minute": 30). */
	durationPhrases: z.record(word, z.number().int().positive().max(3600)),
	/** Words that, shortly before a phrase in the same clause, mean it is not so ("don't"). */
	negators: words,
	/** Words just before a position that offer it as an alternative ("… or sitting"). */
	alternativeLeadIns: words,
	/** Words that make a whole sentence an option or a later progression, not this exercise. */
	alternativeMarkers: templates(),

	/** Phrases after which the exercise is named ("the next exercise is"). */
	titleAnnouncing: templates('title'),
	/** Words skipped before a name ("the", "called"). */
	titleSkipWords: words,
	/** Words that end a name when they follow it ("… which", "… lying"). */
	titleStopWords: words,
	/** Words that show the text after an announcing phrase is not a name ("it", "your"). */
	titleRejectWords: words,
	titleMaxWords: z.number().int().min(1).max(12),

	position: z.partialRecord(z.enum(POSITIONS), templates()),
	/** Equipment labels (EQUIPMENT_SUGGESTIONS where one fits) and the words for each. */
	equipment: z.record(word, templates()),
	/** Phrases that name how the movement is made; preferred over the general ones. */
	movementSpecific: z.partialRecord(z.enum(MOVEMENT_TYPES), templates()),
	/** Phrases that only suggest a movement type ("lift your leg"). */
	movementGeneral: z.partialRecord(z.enum(MOVEMENT_TYPES), templates()),
	side: z.partialRecord(z.enum(EXERCISE_SIDES), templates()),

	/** The nouns for each body region label (BODY_REGIONS where one fits). */
	bodyRegionWords: z.record(word, words),
	/** Where a region noun counts as the exercise's region; `{region}` stands for the noun. */
	bodyRegionContexts: templates('region'),
	/** Phrases that name a region without one of its nouns ("single leg balance"). */
	bodyRegionPhrases: z.record(word, templates()),

	/** Dosage templates, most specific first; `{field}` placeholders take the said amount. */
	dosage: templates('dosage'),
	dosageFixed: z.array(fixedDosagePhrase).max(200),

	/** Phrases that make the clause they are in a safety note. */
	cautions: templates(),
	/** Words that start a new clause inside a sentence; a leading comma makes it required. */
	clauseBreaks: words,
	/** Words dropped from the start of a safety note ("and", "remember"). */
	leadingFillers: words,
	/** A note longer than this is cut down to the captions that hold its caution. */
	maxNoteWords: z.number().int().min(5).max(60)
};

export const draftVocabularySchema = z.object(vocabularyShape).strict();
/** A clinic's additions for one language: any part of a vocabulary. */
export const draftVocabularyExtraSchema = z.object(vocabularyShape).partial().strict();
/** Additions keyed by primary language subtag ("en"), as a clinic's words file holds them. */
export const vocabularyExtrasSchema = z.record(
	z.string().regex(/^[a-z]{2,3}$/, 'keys must be primary language subtags such as "en"'),
	draftVocabularyExtraSchema
);

export type DraftVocabulary = z.infer<typeof draftVocabularySchema>;
export type DraftVocabularyExtra = z.infer<typeof draftVocabularyExtraSchema>;
export type VocabularyExtrasByLanguage = z.infer<typeof vocabularyExtrasSchema>;
