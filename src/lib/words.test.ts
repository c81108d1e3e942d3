import { readdirSync, readFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
	COLLECTION_STATUS,
	ENTRY_STATUS,
	EXERCISE_STATUS,
	INVITATION_STATUS,
	PATIENT_STATUS,
	PROGRAMME_STATUS,
	RECORDING_STATUS,
	SEGMENT_STATUS,
	SUBMISSION_STATUS,
	TERMS
} from './words';

const SRC = join(import.meta.dirname, '..');

/** Every source file whose words reach a screen or an e-mail (tests and scripts left out). */
function sources(dir: string): string[] {
	return readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
		const path = join(dir, entry.name);
		if (entry.isDirectory()) return entry.name === 'scripts' ? [] : sources(path);
		if (/\.test\.ts$|\.d\.ts$|words\.ts$/.test(entry.name)) return [];
		return /\.(svelte|ts)$/.test(entry.name) ? [path] : [];
	});
}

/** The file without its comments, which may name old words to explain a change. */
function withoutComments(text: string): string {
	return text
		.replace(/<!--[\s\S]*?-->/g, '')
		.replace(/\/\*[\s\S]*?\*\//g, '')
		.replace(/(^|[\s;{}(])\/\/.*$/gm, '$1');
}

const escape = (text: string) => text.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
const capitalised = (text: string) => text.charAt(0).toUpperCase() + text.slice(1);

describe('one word per idea', () => {
	const files = sources(SRC).map((path) => ({
		path: relative(SRC, path),
		text: withoutComments(readFileSync(path, 'utf8'))
	}));

	it.each(TERMS.map((t) => [t.word, t] as const))(
		'“%s” is the only word for its idea',
		(_, term) => {
			const found: string[] = [];
			for (const old of term.not) {
				const forms = [...new Set([old, capitalised(old)])].map(escape).join('|');
				const pattern = term.whole
					? new RegExp(`[>'"\`](?:${forms})[<'"\`:]`)
					: new RegExp(`(?<![\\w-])(?:${forms})(?![\\w-])`);
				for (const file of files) if (pattern.test(file.text)) found.push(`${old} in ${file.path}`);
			}
			expect(found).toEqual([]);
		}
	);

	it('draws the same state word with the same badge on every screen', () => {
		const maps = {
			COLLECTION_STATUS,
			ENTRY_STATUS,
			EXERCISE_STATUS,
			INVITATION_STATUS,
			PATIENT_STATUS,
			PROGRAMME_STATUS,
			RECORDING_STATUS,
			SEGMENT_STATUS,
			SUBMISSION_STATUS
		};
		const tones = new Map<string, Set<string>>();
		for (const map of Object.values(maps)) {
			for (const { label, tone } of Object.values(map) as { label: string; tone: string }[]) {
				tones.set(label, (tones.get(label) ?? new Set()).add(tone));
			}
		}
		const mixed = [...tones].filter(([, set]) => set.size > 1).map(([label]) => label);
		expect(mixed).toEqual([]);
		expect(PROGRAMME_STATUS.draft.tone).toBe(COLLECTION_STATUS.draft.tone);
		expect(PROGRAMME_STATUS.ended.tone).toBe(EXERCISE_STATUS.retired.tone);
	});

	it('names an invitation’s state the same in the clinic’s list and a patient’s', () => {
		for (const state of ['pending', 'expired', 'revoked', 'accepted'] as const) {
			expect(PATIENT_STATUS[state]).toEqual(INVITATION_STATUS[state]);
		}
	});
});
