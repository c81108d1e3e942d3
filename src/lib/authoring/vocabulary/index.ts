/**
 * The built-in drafting vocabularies (one per primary language subtag) and the way a clinic's
 * own words are added to them, mirroring the segment word lists (src/lib/captions/suggest.ts).
 */
import en from './en.json';
import {
	draftVocabularySchema,
	type DraftVocabulary,
	type DraftVocabularyExtra,
	type VocabularyExtrasByLanguage
} from './schema';

export * from './schema';

function builtIn(language: string, data: unknown): DraftVocabulary {
	const result = draftVocabularySchema.safeParse(data);
	if (!result.success) {
		const issue = result.error.issues[0];
		throw new Error(
			`The built-in "${language}" drafting vocabulary is not valid: ${issue.path.join('.') || 'the file'} ${issue.message}`
		);
	}
	return result.data;
}

export const englishVocabulary: DraftVocabulary = builtIn('en', en);

/** Vocabularies keyed by primary language subtag ("en"). */
export const builtInVocabularies: Readonly<Record<string, DraftVocabulary>> = {
	en: englishVocabulary
};

const union = (base: readonly string[], added: readonly string[] = []) => [
	...new Set([...base, ...added.map((w) => w.trim()).filter(Boolean)])
];

/** The keys of a record whose keys are known to be K (Object.keys only promises strings). */
const keysOf = <K extends string>(record: Partial<Record<K, unknown>>) =>
	Object.keys(record) as K[];

function unionRecord<K extends string>(
	base: Partial<Record<K, string[]>>,
	added: Partial<Record<K, string[]>> = {}
): Record<K, string[]> {
	const out = {} as Record<K, string[]>;
	for (const key of new Set([...keysOf(base), ...keysOf(added)])) {
		out[key] = union(base[key] ?? [], added[key]);
	}
	return out;
}

/**
 * A vocabulary with a clinic's words added: lists gain the new phrases (never losing built-in
 * ones), numbers and units gain or redefine entries, a vague amount with the same phrase takes the
 * clinic's range, and the title length limit and note length take the clinic's value when given.
 */
export function mergeVocabulary(
	base: DraftVocabulary,
	extra: DraftVocabularyExtra
): DraftVocabulary {
	const vague = new Map(base.vagueAmounts.map((v) => [v.phrase, v]));
	for (const v of extra.vagueAmounts ?? []) vague.set(v.phrase, v);
	return {
		numbers: { ...base.numbers, ...extra.numbers },
		ordinals: union(base.ordinals, extra.ordinals),
		vagueAmounts: [...vague.values()],
		approximators: union(base.approximators, extra.approximators),
		rangeJoiners: union(base.rangeJoiners, extra.rangeJoiners),
		timeUnits: { ...base.timeUnits, ...extra.timeUnits },
		durationPhrases: { ...base.durationPhrases, ...extra.durationPhrases },
		negators: union(base.negators, extra.negators),
		alternativeLeadIns: union(base.alternativeLeadIns, extra.alternativeLeadIns),
		alternativeMarkers: union(base.alternativeMarkers, extra.alternativeMarkers),
		titleAnnouncing: union(base.titleAnnouncing, extra.titleAnnouncing),
		titleSkipWords: union(base.titleSkipWords, extra.titleSkipWords),
		titleStopWords: union(base.titleStopWords, extra.titleStopWords),
		titleRejectWords: union(base.titleRejectWords, extra.titleRejectWords),
		titleMaxWords: extra.titleMaxWords ?? base.titleMaxWords,
		position: unionRecord(base.position, extra.position),
		equipment: unionRecord(base.equipment, extra.equipment),
		movementSpecific: unionRecord(base.movementSpecific, extra.movementSpecific),
		movementGeneral: unionRecord(base.movementGeneral, extra.movementGeneral),
		side: unionRecord(base.side, extra.side),
		bodyRegionWords: unionRecord(base.bodyRegionWords, extra.bodyRegionWords),
		bodyRegionContexts: union(base.bodyRegionContexts, extra.bodyRegionContexts),
		bodyRegionPhrases: unionRecord(base.bodyRegionPhrases, extra.bodyRegionPhrases),
		dosage: union(base.dosage, extra.dosage),
		dosageFixed: [...base.dosageFixed, ...(extra.dosageFixed ?? [])],
		cautions: union(base.cautions, extra.cautions),
		clauseBreaks: union(base.clauseBreaks, extra.clauseBreaks),
		leadingFillers: union(base.leadingFillers, extra.leadingFillers),
		maxNoteWords: extra.maxNoteWords ?? base.maxNoteWords
	};
}

/**
 * The vocabulary for a cue language: the built-in one of its primary subtag (English when there
 * is none) with any extra words given for that subtag added to it.
 */
export function vocabularyFor(
	language: string,
	extras: VocabularyExtrasByLanguage = {}
): DraftVocabulary {
	const primary = language.trim().toLowerCase().split(/[-_]/)[0] || 'en';
	const base = builtInVocabularies[primary] ?? englishVocabulary;
	const extra = extras[primary];
	return extra ? mergeVocabulary(base, extra) : base;
}
