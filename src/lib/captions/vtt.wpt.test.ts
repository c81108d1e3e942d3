/**
 * Conformance: every case converted from web-platform-tests webvtt/parsing/file-parsing
 * (copied into tests/data/webvtt-wpt from the team's shared test data, 3-Clause BSD), run through Kinelume's own decodeCaptionFile and
 * parseVtt. The upstream tests read a browser's TextTrack, so cues are compared in text track cue
 * order and through the TextTrackCue defaults that the data's README lists.
 */
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { decodeCaptionFile } from './decode';
import type { Cue } from './types';
import { parseVtt, sortCues, type Region } from './vtt';

// A copy kept in the repository, so the conformance cases run on any clean clone.
const DATA = fileURLToPath(new URL('../../../tests/data/webvtt-wpt/', import.meta.url));

interface ExpectedCue {
	index: number;
	asserted_fields: string[];
	js_expressions?: Record<string, string>;
	[field: string]: unknown;
}

interface WptCase {
	name: string;
	source: string;
	vtt_base64: string;
	vtt_byte_length: number;
	expect_error: boolean;
	expected_cue_count: number | null;
	cues: ExpectedCue[];
	test_defects?: string[];
	other_assertions?: unknown;
}

const cases: WptCase[] = readdirSync(DATA)
	.filter((f) => f.endsWith('.json'))
	.sort()
	.map((f) => JSON.parse(readFileSync(join(DATA, f), 'utf8')) as WptCase);

/**
 * Where Kinelume's parser needs more than webvtt-parser gives, or reads a field another way. Every
 * case is run; these notes say why its checks look the way they do.
 */
const MAPPED: Record<string, string> = {
	'regions-id':
		'webvtt-parser does not parse REGION blocks (it reports them as stray cue identifiers); vtt.ts collects them per W3C WebVTT "collect WebVTT region settings" and exposes `regions`. A cue stores its region identifier, so region.lines is looked up in `regions` by that identifier.',
	'settings-region':
		'webvtt-parser rejects the cue setting `region` as "Invalid setting"; vtt.ts reads it per "parse the WebVTT cue settings" (last declared region with that identifier, or none). Region identity ("the same object") is compared by region identifier: equal labels must give equal identifiers, different labels different ones.',
	'regions-old':
		'The old "Region:" header lines are ignored (they sit in the header block of "collect a WebVTT block"), so the cues have no region: `settings.region` is absent, read as null.',
	'settings-align':
		'webvtt-parser calls align "alignment"; vtt.ts maps it to settings.align, absent meaning the TextTrackCue default "center". Cues 8 and 9 hold "align:" with no value: webvtt-parser stops reading settings there, the spec skips just that setting, so vtt.ts blanks it first (nothing valid follows it here, so both readings agree).',
	'settings-multiple':
		'webvtt-parser names line/position/vertical linePosition/textPosition/direction ("horizontal" for none); vtt.ts maps them to settings.line/position/vertical with defaults "auto"/"auto"/"".',
	'settings-size':
		'size is read by webvtt-parser; absent settings.size means the default 100. "size:" with no value is blanked by vtt.ts (see settings-align).',
	'settings-vertical':
		'webvtt-parser says direction "horizontal" for no vertical setting; vtt.ts leaves settings.vertical absent, read as "". "vertical:" and "vertical: rl" hold an empty value, blanked by vtt.ts (see settings-align).'
};

/**
 * Files a browser accepts but Kinelume's import (conformance 'author') refuses, because cues would
 * be lost or have impossible times. The browser reading is checked against upstream; the refusal
 * is checked here with the lines it names.
 */
const REFUSED_ON_IMPORT: Record<string, { lines: number[]; reason: string }> = {
	arrows: {
		lines: [3, 6, 9, 12, 15, 21, 23, 25, 27],
		reason: 'lines with "-->" that are not cue timings: each would silently lose a cue'
	},
	'timings-negative': {
		lines: [3, 6, 9, 12],
		reason: 'cues whose end is not after their start (the spec says authors must not write them)'
	},
	'timings-too-short': {
		lines: Array.from({ length: 30 }, (_, k) => 6 + 3 * k),
		reason: 'malformed timestamps, which drop the cue'
	}
};

/** Upstream assertions that contradict themselves (recorded in the data's test_defects). */
const KNOWN_DEFECTS: Record<string, string> = {
	'regions-id':
		'Upstream asserts region1.lines equal to 2, then 1, 3 and 4; only the first can hold. The data keeps only cues[0].region.lines == 2, which is checked; the other three are not checks of anything.'
};

const JS_EXPRESSIONS: Record<string, unknown> = {
	'Number.MAX_VALUE': Number.MAX_VALUE,
	Infinity: Infinity,
	'-Infinity': -Infinity
};

function valueOf(cue: Cue, field: string, regions: Region[]): unknown {
	const s = cue.settings ?? {};
	switch (field) {
		case 'id':
			return cue.id;
		case 'text':
			return cue.text;
		case 'startTime':
			return cue.start;
		case 'endTime':
			return cue.end;
		case 'vertical':
			return s.vertical ?? '';
		case 'snapToLines':
			return s.snapToLines ?? true;
		case 'line':
			return s.line ?? 'auto';
		case 'lineAlign':
			return s.lineAlign ?? 'start';
		case 'position':
			return s.position ?? 'auto';
		case 'positionAlign':
			return s.positionAlign ?? 'auto';
		case 'size':
			return s.size ?? 100;
		case 'align':
			return s.align ?? 'center';
		case 'region.lines':
			return regions.findLast((r) => r.id === s.region)?.lines;
		default:
			throw new Error(`No mapping for asserted field ${field}`);
	}
}

describe('web-platform-tests webvtt/parsing/file-parsing, through parseVtt', () => {
	it('finds the converted cases', () => {
		expect(cases.length).toBeGreaterThanOrEqual(14);
	});

	for (const c of cases) {
		it(`${c.name} (${c.source})`, () => {
			const bytes = Uint8Array.from(Buffer.from(c.vtt_base64, 'base64'));
			expect(bytes.length).toBe(c.vtt_byte_length);
			const decoded = decodeCaptionFile(bytes);
			if (!decoded.ok) throw new Error(decoded.message);
			const result = parseVtt(decoded.text, { conformance: 'browser' });
			// web-platform-tests webvtt/parsing/file-parsing: expect_error is a whole-file rejection.
			expect(result.ok).toBe(!c.expect_error);
			if (!result.ok) return;
			const cues = sortCues(result.cues);
			if (c.expected_cue_count !== null) expect(cues).toHaveLength(c.expected_cue_count);

			const regionOfLabel = new Map<string, string | undefined>();
			for (const want of c.cues) {
				const cue = cues[want.index];
				for (const field of want.asserted_fields) {
					const where = `${c.name}, cue ${want.index}, ${field}`;
					if (field === 'region') {
						const expected = want.region as { identity?: string } | null;
						const actual = cue.settings?.region;
						if (expected === null) {
							expect(actual, where).toBeUndefined();
							continue;
						}
						expect(actual, where).toBeDefined();
						const label = expected.identity ?? JSON.stringify(expected);
						if (regionOfLabel.has(label)) expect(actual, where).toBe(regionOfLabel.get(label));
						else {
							expect([...regionOfLabel.values()], where).not.toContain(actual);
							regionOfLabel.set(label, actual);
						}
						continue;
					}
					const expression = want.js_expressions?.[field];
					const path = field.split('.');
					const expected =
						expression !== undefined
							? JS_EXPRESSIONS[expression]
							: path.reduce<unknown>((v, k) => (v as Record<string, unknown>)?.[k], want);
					expect(expected, `${where}: expected value`).toBeDefined();
					expect(valueOf(cue, field, result.regions), where).toEqual(expected);
				}
			}

			expect(c.test_defects?.length ?? 0, `${c.name}: unrecorded upstream defect`).toBe(
				KNOWN_DEFECTS[c.name] ? c.test_defects!.length : 0
			);
			// Page-level assertions (stylesheets) are not about cues; no case here has any.
			expect(c.other_assertions ?? null).toBeNull();

			const refused = REFUSED_ON_IMPORT[c.name];
			const authored = parseVtt(decoded.text);
			if (refused) {
				expect(authored.ok, `${c.name}: ${refused.reason}`).toBe(false);
				if (!authored.ok) expect(authored.errors.map((e) => e.line)).toEqual(refused.lines);
			} else {
				expect(authored.ok, `${c.name}: Kinelume's import accepts what the browser accepts`).toBe(
					true
				);
			}
		});
	}

	it('documents every mapping for a case that exists', () => {
		const names = new Set(cases.map((c) => c.name));
		for (const name of [
			...Object.keys(MAPPED),
			...Object.keys(REFUSED_ON_IMPORT),
			...Object.keys(KNOWN_DEFECTS)
		]) {
			expect(names.has(name), name).toBe(true);
		}
	});
});
