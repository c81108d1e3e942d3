import { readFileSync } from 'node:fs';
import { z } from 'zod';
import type { WordListsByLanguage } from '$lib/captions/suggest';
import { config } from '../config';

const words = z.array(z.string().trim().min(1).max(80)).max(500).optional();
const fileSchema = z.record(
	z.string().regex(/^[a-z]{2,3}$/, 'keys must be primary language subtags such as "en"'),
	z.object({ announcing: words, ordinals: words, filler: words }).strict()
);

let cached: { path: string; lists: WordListsByLanguage } | null = null;

/**
 * The extra word lists named by SEGMENT_WORD_LISTS_FILE (none when it is empty), read once. A file
 * that cannot be read or does not have the expected shape throws a sentence naming the file.
 */
export function configuredWordLists(): WordListsByLanguage {
	const path = config().SEGMENT_WORD_LISTS_FILE;
	if (!path) return {};
	if (cached?.path === path) return cached.lists;
	let parsed: unknown;
	try {
		parsed = JSON.parse(readFileSync(path, 'utf8'));
	} catch (error) {
		throw new Error(
			`SEGMENT_WORD_LISTS_FILE ${path} could not be read as JSON: ${(error as Error).message}`
		);
	}
	const result = fileSchema.safeParse(parsed);
	if (!result.success) {
		const issue = result.error.issues[0];
		throw new Error(
			`SEGMENT_WORD_LISTS_FILE ${path}: ${issue.path.join('.') || 'the file'} ${issue.message}`
		);
	}
	cached = { path, lists: result.data };
	return result.data;
}
