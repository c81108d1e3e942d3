import './env';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it, vi } from 'vitest';

const dir = mkdtempSync(join(tmpdir(), 'kinelume-words-'));

async function listsFrom(content: string) {
	const path = join(dir, `${crypto.randomUUID()}.json`);
	writeFileSync(path, content);
	process.env.SEGMENT_WORD_LISTS_FILE = path;
	try {
		// A fresh config module, so it reads the variable set just now.
		vi.resetModules();
		const { configuredWordLists } = await import('../../src/lib/server/segments/word-lists');
		return configuredWordLists();
	} finally {
		delete process.env.SEGMENT_WORD_LISTS_FILE;
	}
}

describe('segment word lists from SEGMENT_WORD_LISTS_FILE', () => {
	it('reads extra lists per language', async () => {
		expect(
			await listsFrom('{"en": {"announcing": ["up next"]}, "fr": {"ordinals": ["onzième"]}}')
		).toEqual({ en: { announcing: ['up next'] }, fr: { ordinals: ['onzième'] } });
	});

	it('refuses a file of the wrong shape with a sentence naming the file and the place', async () => {
		await expect(listsFrom('{"english": {"announcing": ["x"]}}')).rejects.toThrow(
			/SEGMENT_WORD_LISTS_FILE .*english/
		);
		await expect(listsFrom('{"en": {"openers": ["x"]}}')).rejects.toThrow(
			/SEGMENT_WORD_LISTS_FILE/
		);
		await expect(listsFrom('not json')).rejects.toThrow(/could not be read as JSON/);
	});
});
