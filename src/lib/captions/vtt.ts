/**
 * WebVTT import and export. Blocks are collected as the W3C WebVTT parser algorithm says
 * ("collect a WebVTT block"), so cues, REGION blocks and line numbers are known exactly; each timing
 * line and each cue text goes through webvtt-parser, which does the timestamp, settings and tag
 * checks. webvtt-parser's whole-file parse is not used: it sorts cues, skips REGION blocks and
 * never tells which line a cue came from.
 *
 * Two readings of one file:
 * - 'author' (the default, for imports): anything that would lose or garble a cue is an error and
 *   the file is refused; smaller slips are warnings.
 * - 'browser': what a browser's parser keeps, for conformance tests and for previews of files that
 *   an author has not fixed yet; only a missing signature fails.
 */
import pkg from 'webvtt-parser';
import { cueTextProblem, isCueIdentifier, isRegionIdentifier } from './grammar';
import type { LibraryCue } from 'webvtt-parser';
import { endTimeColumn, formatTimestamp, parseTimestamp, toMillis } from './timestamp';
import type { CaptionProblem, Cue, CueSettings, Track } from './types';

export { formatTimestamp, parseTimestamp };

const { WebVTTCueTimingsAndSettingsParser, WebVTTCueTextParser } = pkg;

/** A WebVTT region, as far as Kinelume keeps it. */
export interface Region {
	id: string;
	width: number;
	lines: number;
	regionAnchor: [number, number];
	viewportAnchor: [number, number];
	scroll: '' | 'up';
}

export type VttParseResult =
	| { ok: true; cues: Cue[]; warnings: CaptionProblem[]; regions: Region[] }
	| { ok: false; errors: CaptionProblem[] };

export interface ParseOptions {
	conformance?: 'author' | 'browser';
}

// The parser's default set; WebVTTCueTextParser needs one passed in.
const ENTITIES: Record<string, string> = {
	'&amp': '&',
	'&lt': '<',
	'&gt': '>',
	'&lrm': '\u200e',
	'&rlm': '\u200f',
	'&nbsp': '\u00a0'
};

// Plain words for webvtt-parser's timestamp failures, which otherwise read like parser internals.
const TIMING_REASONS: Record<string, string> = {
	'No timestamp found.': 'a time is missing',
	'Timestamp must start with a character in the range 0-9.': 'a time must start with a digit',
	'No time unit separator found.': 'a colon is missing between minutes and seconds',
	'Must be exactly two digits.': 'minutes and seconds need exactly two digits each',
	'No seconds found or minutes is greater than 59.': 'the seconds are missing',
	'No decimal separator (".") found.':
		'the seconds need a full stop before the milliseconds, not a comma as in SRT',
	'Milliseconds must be given in three digits.': 'the milliseconds need exactly three digits',
	'You cannot have more than 59 minutes.': 'minutes go up to 59',
	'You cannot have more than 59 seconds.': 'seconds go up to 59',
	'No valid timestamp separator found.': 'the arrow "-->" between the two times is missing'
};

const problem = (line: number, column: number, words: string): CaptionProblem => ({
	line,
	column,
	message: `Line ${line}, column ${column}: ${words}`
});

const short = (seconds: number) => formatTimestamp(seconds, { hours: 'auto' });

interface Block {
	kind: 'cue' | 'region' | 'style' | 'other';
	firstLine: number;
	/** Lines of the block that were not a timing line (the cue text for a cue). */
	buffer: string[];
	bufferLine: number;
	/** The identifier line of a cue block, '' when there is none. */
	id: string;
	timingLine: number;
}

/** Reads a WebVTT file's text (BOM allowed). */
export function parseVtt(input: string, options: ParseOptions = {}): VttParseResult {
	const strict = (options.conformance ?? 'author') === 'author';
	const errors: CaptionProblem[] = [];
	const warnings: CaptionProblem[] = [];
	const complain = (p: CaptionProblem, fatal: boolean) =>
		(fatal && strict ? errors : warnings).push(p);

	const text = input.charCodeAt(0) === 0xfeff ? input.slice(1) : input;
	const lines = text.split(/\r\n|\r|\n/);
	if (strict) {
		const at = lines.findIndex((l) => l.includes('\0'));
		if (at >= 0) {
			const words =
				'the file contains a NUL character, which no caption file has; it may be a binary file';
			return { ok: false, errors: [problem(at + 1, lines[at].indexOf('\0') + 1, words)] };
		}
	}
	// The spec's parser turns NUL into U+FFFD rather than failing.
	for (let i = 0; i < lines.length; i++) lines[i] = lines[i].replace(/\0/g, '\ufffd');

	if (!/^WEBVTT([ \t]|$)/.test(lines[0])) {
		const srtLike = /^\d+$/.test(lines[0].trim()) && /-->/.test(lines[1] ?? '');
		const words =
			text.trim() === ''
				? 'the file is empty; a WebVTT file starts with the word WEBVTT'
				: srtLike
					? 'this looks like an SRT file (it starts with a cue number); import it as SRT, or put WEBVTT and a blank line first'
					: 'the file must start with the word WEBVTT on its first line';
		return { ok: false, errors: [problem(1, 1, words)] };
	}

	const cues: Cue[] = [];
	const cueLines: number[] = [];
	const regions: Region[] = [];
	let i = 1;
	let seenCue = false;
	if (i < lines.length && lines[i] !== '') {
		const header = collectBlock(lines, i, true, seenCue);
		const words =
			header.next === i
				? 'leave a blank line between WEBVTT and the first cue'
				: 'the lines between WEBVTT and the first blank line are ignored; leave a blank line after WEBVTT';
		complain(problem(i + 1, 1, words), false);
		i = header.next;
	}

	while (i < lines.length) {
		while (i < lines.length && lines[i] === '') i++;
		if (i >= lines.length) break;
		const { block, next } = collectBlock(lines, i, false, seenCue);
		i = next;
		if (block.kind === 'region') {
			const region = readRegion(block.buffer);
			const kept = regions.filter((r) => r.id !== region.id);
			regions.length = 0;
			regions.push(...kept, region);
			continue;
		}
		if (block.kind === 'style') {
			const words =
				'the STYLE block is not kept: Kinelume shows captions in each viewer’s chosen style';
			complain(problem(block.firstLine, 1, words), false);
			continue;
		}
		if (block.kind === 'other') {
			reportStrayBlock(lines, block, complain, cues.length > 0);
			continue;
		}
		const timingLine = lines[block.timingLine - 1];
		const cue = readCue(timingLine, block, cues.at(-1)?.start ?? 0, regions, complain);
		if (!cue) continue;
		seenCue = true;
		checkCueText(cue, block.bufferLine, complain);
		cues.push(cue);
		cueLines.push(block.timingLine);
	}

	const ids = new Set<string>();
	cues.forEach((cue, index) => {
		if (cue.id === '') return;
		if (ids.has(cue.id)) {
			const words = `the cue identifier "${cue.id}" is used twice; identifiers must be unique`;
			complain(problem(cueLines[index] - 1, 1, words), false);
		}
		ids.add(cue.id);
	});

	if (errors.length > 0) return { ok: false, errors: sortProblems(errors) };
	return { ok: true, cues, warnings: sortProblems(warnings), regions };
}

function sortProblems(list: CaptionProblem[]): CaptionProblem[] {
	return [...list].sort((a, b) => a.line - b.line || a.column - b.column);
}

/** W3C WebVTT "collect a WebVTT block"; `firstLine` and the line fields are 1-based. */
function collectBlock(lines: string[], start: number, inHeader: boolean, seenCue: boolean) {
	const block: Block = {
		kind: 'other',
		firstLine: start + 1,
		buffer: [],
		bufferLine: start + 1,
		id: '',
		timingLine: 0
	};
	let lineCount = 0;
	let i = start;
	let previous = start;
	let seenArrow = false;
	while (i < lines.length) {
		const line = lines[i];
		lineCount++;
		i++;
		if (line.includes('-->')) {
			if (!inHeader && (lineCount === 1 || (lineCount === 2 && !seenArrow))) {
				seenArrow = true;
				previous = i;
				block.kind = 'cue';
				block.timingLine = i;
				block.id = block.buffer.join('\n');
				block.buffer = [];
				block.bufferLine = i + 1;
			} else {
				i = previous;
				break;
			}
		} else if (line === '') {
			break;
		} else {
			if (!inHeader && lineCount === 2 && !seenCue && block.kind === 'other') {
				const first = block.buffer[0] ?? '';
				if (/^STYLE[ \t]*$/.test(first)) block.kind = 'style';
				else if (/^REGION[ \t]*$/.test(first)) block.kind = 'region';
				if (block.kind !== 'other') {
					block.buffer = [];
					block.bufferLine = i;
				}
			}
			block.buffer.push(line);
			previous = i;
		}
	}
	return { block, next: i };
}

type Complain = (p: CaptionProblem, fatal: boolean) => void;

function reportStrayBlock(lines: string[], block: Block, complain: Complain, afterCue: boolean) {
	const first = lines[block.firstLine - 1];
	if (/^NOTE([ \t]|$)/.test(first)) return;
	if (/^(STYLE|REGION)[ \t]*$/.test(first)) {
		const words = afterCue
			? `a ${first.trim()} block after the first cue is ignored`
			: `the ${first.trim()} block is empty and is ignored`;
		complain(problem(block.firstLine, 1, words), false);
		return;
	}
	const words =
		'this text is not part of any cue, because no timing line (such as 00:00:01.000 --> 00:00:04.000) comes before it';
	complain(problem(block.firstLine, 1, words), true);
}

function libraryCue(): LibraryCue {
	return {
		id: '',
		startTime: 0,
		endTime: 0,
		direction: 'horizontal',
		snapToLines: true,
		linePosition: 'auto',
		lineAlign: 'start',
		textPosition: 'auto',
		positionAlign: 'auto',
		size: 100,
		alignment: 'center',
		text: ''
	};
}

interface MaskedLine {
	masked: string;
	regions: { value: string; column: number }[];
	empty: { name: string; column: number }[];
}

/**
 * Blanks, in the settings part of a timing line, what webvtt-parser reads against W3C WebVTT
 * ("parse the WebVTT cue settings"):
 * the region setting, which it does not know, and settings with no value, at which it stops
 * reading the rest (the spec skips just that one). Blanking with spaces keeps its columns true.
 */
function maskSettings(line: string): MaskedLine {
	const result: MaskedLine = { masked: line, regions: [], empty: [] };
	const arrow = line.indexOf('-->');
	if (arrow < 0) return result;
	const end = /^[ \t\f]*[^ \t\f]*/.exec(line.slice(arrow + 3))![0].length + arrow + 3;
	const settings = line.slice(end).replace(/[^ \t\f]+/g, (token, offset: number) => {
		const colon = token.indexOf(':');
		const column = end + offset + 1;
		if (colon > 0 && token.slice(0, colon) === 'region') {
			result.regions.push({ value: token.slice(colon + 1), column });
		} else if (colon > 0 && colon === token.length - 1) {
			result.empty.push({ name: token.slice(0, colon), column });
		} else return token;
		return ' '.repeat(token.length);
	});
	result.masked = line.slice(0, end) + settings;
	return result;
}

function readCue(
	line: string,
	block: Block,
	previousStart: number,
	regions: Region[],
	complain: Complain
): Cue | null {
	const lineNo = block.timingLine;
	const { masked, regions: regionSettings, empty } = maskSettings(line);
	const reported: { message: string; column: number }[] = [];
	const lib = libraryCue();
	const parsed = new WebVTTCueTimingsAndSettingsParser(masked, (message, column) =>
		reported.push({ message, column })
	).parse(lib, previousStart);

	if (!parsed) {
		const last = reported.at(-1);
		const reason = (last && TIMING_REASONS[last.message]) ?? 'it is not a cue timing line';
		complain(
			problem(
				lineNo,
				last?.column ?? 1,
				`the cue timing "${line.trim()}" cannot be read: ${reason}. This cue would be lost; write times like 00:01.000 or 00:00:01.000`
			),
			true
		);
		return null;
	}

	for (const { message, column } of reported) {
		if (message === 'End timestamp is not greater than start timestamp.') {
			const endColumn = endTimeColumn(line);
			const relation = lib.endTime === lib.startTime ? 'is the same as' : 'is before';
			const words = `the end time ${short(lib.endTime)} ${relation} the start time ${short(lib.startTime)}`;
			complain(problem(lineNo, endColumn, words), true);
		} else if (message.startsWith('Start timestamp is not greater')) {
			const words = `this cue starts at ${short(lib.startTime)}, before the cue above it (${short(previousStart)}); cues must be listed in time order`;
			complain(problem(lineNo, 1, words), false);
		} else if (message.includes('separated')) {
			complain(problem(lineNo, column, 'put a space on each side of "-->"'), false);
		} else {
			const reason = message.replace(/\.$/, '').replace(/^./, (c) => c.toLowerCase());
			complain(problem(lineNo, column, `a cue setting is ignored: ${reason}`), false);
		}
	}

	for (const { name, column } of empty) {
		complain(
			problem(lineNo, column, `the cue setting "${name}:" has no value and is ignored`),
			false
		);
	}
	// "parse the WebVTT cue settings": an empty value is skipped; otherwise the last region with that identifier, or none.
	let regionId: string | undefined;
	for (const { value, column } of regionSettings) {
		if (value === '') continue;
		regionId = regions.findLast((r) => r.id === value)?.id;
		if (regionId === undefined) {
			const words = `the region "${value}" is not declared in a REGION block, so the cue is shown outside any region`;
			complain(problem(lineNo, column, words), false);
		}
	}
	const settings = settingsOf(lib, regionId);
	return {
		id: block.id,
		start: toMillis(lib.startTime),
		end: toMillis(lib.endTime),
		text: block.buffer.join('\n'),
		...(settings ? { settings } : {})
	};
}

function settingsOf(lib: LibraryCue, region: string | undefined): CueSettings | undefined {
	const s: CueSettings = {};
	if (lib.direction !== 'horizontal') s.vertical = lib.direction;
	if (lib.linePosition !== 'auto') {
		s.line = lib.linePosition;
		if (!lib.snapToLines) s.snapToLines = false;
	}
	if (lib.lineAlign !== 'start') s.lineAlign = lib.lineAlign;
	if (lib.textPosition !== 'auto') s.position = lib.textPosition;
	if (lib.positionAlign !== 'auto') s.positionAlign = lib.positionAlign;
	if (lib.size !== 100) s.size = lib.size;
	if (lib.alignment !== 'center') s.align = lib.alignment;
	// End of "parse the WebVTT cue settings": a positioned, sized or vertical cue leaves its region.
	if (region !== undefined && s.line === undefined && s.size === undefined && !s.vertical) {
		s.region = region;
	}
	return Object.keys(s).length > 0 ? s : undefined;
}

function checkCueText({ text, start, end }: Cue, firstLine: number, complain: Complain) {
	const at = (offset: number) => {
		const before = text.slice(0, Math.max(0, offset - 1));
		const lineOffset = before.split('\n').length - 1;
		return { line: firstLine + lineOffset, column: offset - before.lastIndexOf('\n') - 1 };
	};
	new WebVTTCueTextParser(
		text,
		(message, column) => {
			const { line, column: col } = at(column);
			complain(problem(line, Math.max(1, col), cueTextWords(message)), false);
		},
		'',
		ENTITIES
	).parse(start, end);
}

function cueTextWords(message: string): string {
	switch (message) {
		case 'Incorrect start tag.':
			return 'this tag is not a WebVTT tag and is ignored (WebVTT knows c, i, b, u, ruby, rt, v and lang)';
		case 'Incorrect end tag.':
			return 'this closing tag does not match the tag that is open';
		case 'Required end tag missing.':
			return 'a tag opened in this cue is never closed';
		case 'Incorrect escape.':
			return 'an "&" that does not start a character reference; write &amp; for a plain ampersand';
		default:
			return `in the cue text: ${message.replace(/\.$/, '').toLowerCase()}`;
	}
}

function readRegion(buffer: string[]): Region {
	const region: Region = {
		id: '',
		width: 100,
		lines: 3,
		regionAnchor: [0, 100],
		viewportAnchor: [0, 100],
		scroll: ''
	};
	const percent = (v: string) => (/^\d+(\.\d+)?%$/.test(v) ? Number(v.slice(0, -1)) : null);
	const pair = (v: string): [number, number] | null => {
		const [x, y, extra] = v.split(',').map(percent);
		return x !== null && y !== null && x !== undefined && y !== undefined && extra === undefined
			? [x, y]
			: null;
	};
	// W3C WebVTT "collect WebVTT region settings": split on ASCII whitespace, each name:value once read.
	for (const setting of buffer.join('\n').split(/[ \t\n\f\r]+/)) {
		const colon = setting.indexOf(':');
		if (colon <= 0 || colon === setting.length - 1) continue;
		const name = setting.slice(0, colon);
		const value = setting.slice(colon + 1);
		if (name === 'id' && !value.includes('-->')) region.id = value;
		else if (name === 'width' && percent(value) !== null) region.width = percent(value)!;
		else if (name === 'lines' && /^\d+$/.test(value)) region.lines = Number(value);
		else if (name === 'regionanchor' && pair(value)) region.regionAnchor = pair(value)!;
		else if (name === 'viewportanchor' && pair(value)) region.viewportAnchor = pair(value)!;
		else if (name === 'scroll' && value === 'up') region.scroll = 'up';
	}
	return region;
}

/** Sorts as a browser's TextTrack lists cues: start ascending, end descending, then file order. */
export function sortCues(cues: readonly Cue[]): Cue[] {
	return [...cues].sort((a, b) => a.start - b.start || b.end - a.end);
}

export interface SerializeOptions {
	/** Text after "WEBVTT" on the first line; a line break in it is dropped. */
	title?: string;
	regions?: Region[];
}

/** A field the writer cannot put into a WebVTT file without changing what the file says. */
export class CaptionWriteError extends Error {}

/**
 * Writes WebVTT with HH:MM:SS.mmm times, cue identifiers and settings. A field that the file
 * cannot hold as it is (grammar.ts: a line break or "-->" in an identifier, a region name with
 * whitespace, words with an empty line) is refused with CaptionWriteError rather than rewritten,
 * so nothing stored can be served as something else; cues that passed the save schema
 * (schema.ts) always write.
 */
export function serializeVtt(
	input: Track | readonly Cue[],
	options: SerializeOptions = {}
): string {
	const cues = 'cues' in input ? input.cues : input;
	const title = options.title?.replace(/[\r\n]+/g, ' ').trim();
	const parts = [title ? `WEBVTT ${title}` : 'WEBVTT', ''];
	for (const region of options.regions ?? []) {
		if (!isRegionIdentifier(region.id))
			throw new CaptionWriteError(`A region name cannot be written: ${JSON.stringify(region.id)}`);
		const anchor = ([x, y]: [number, number]) => `${x}%,${y}%`;
		parts.push(
			'REGION',
			`id:${region.id} width:${region.width}% lines:${region.lines} regionanchor:${anchor(region.regionAnchor)} viewportanchor:${anchor(region.viewportAnchor)}${region.scroll ? ' scroll:up' : ''}`,
			''
		);
	}
	cues.forEach((cue, index) => {
		const where = `Cue ${index + 1}`;
		if (cue.id !== '' && !isCueIdentifier(cue.id))
			throw new CaptionWriteError(
				`${where}: its name cannot be written: ${JSON.stringify(cue.id)}`
			);
		if (cue.settings?.region !== undefined && !isRegionIdentifier(cue.settings.region))
			throw new CaptionWriteError(`${where}: its region name cannot be written`);
		const textProblem = cueTextProblem(cue.text);
		if (textProblem) throw new CaptionWriteError(`${where}: the ${textProblem}`);
		if (cue.id !== '') parts.push(cue.id);
		parts.push(
			`${formatTimestamp(cue.start)} --> ${formatTimestamp(cue.end)}${settingsText(cue.settings)}`
		);
		if (cue.text !== '') parts.push(cue.text);
		parts.push('');
	});
	return parts.join('\n');
}

function settingsText(s: CueSettings | undefined): string {
	if (!s) return '';
	const out: string[] = [];
	if (s.vertical) out.push(`vertical:${s.vertical}`);
	if (s.line !== undefined) {
		const align = s.lineAlign && s.lineAlign !== 'start' ? `,${s.lineAlign}` : '';
		out.push(`line:${s.line}${s.snapToLines === false ? '%' : ''}${align}`);
	}
	if (s.position !== undefined) {
		const align = s.positionAlign ? `,${s.positionAlign}` : '';
		out.push(`position:${s.position}%${align}`);
	}
	if (s.size !== undefined) out.push(`size:${s.size}%`);
	if (s.align) out.push(`align:${s.align}`);
	if (s.region) out.push(`region:${s.region}`);
	return out.length ? ' ' + out.join(' ') : '';
}

/**
 * The cues exactly as a browser will read them from the file we serve for `cues`: written, then
 * read back. Review checks, the patient-data detector and the transcript look at this, so they
 * judge what will be shown, not a stored copy that could say something else. Throws
 * CaptionWriteError for cues that cannot be served at all.
 */
export function cuesAsServed(cues: readonly Cue[]): Cue[] {
	const read = parseVtt(serializeVtt(cues), { conformance: 'browser' });
	return read.ok ? read.cues : [];
}
