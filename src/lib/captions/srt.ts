/**
 * SRT import and export. SRT has no formal standard; the conversion follows what REFERENCES.md
 * records as consistent across descriptions: comma decimals become full stops, the numeric index
 * stays as the cue identifier, position coordinates (X1:… Y2:…) are dropped, and <font> tags go.
 */
import { endTimeColumn, formatTimestamp, toMillis } from './timestamp';
import { NAMED_REFERENCES } from './text';
import type { CaptionProblem, Cue } from './types';
import { serializeVtt } from './vtt';

export type SrtParseResult =
	| { ok: true; cues: Cue[]; warnings: CaptionProblem[] }
	| { ok: false; errors: CaptionProblem[] };

// Hours are required in SRT; some tools write a full stop or fewer fraction digits, which we read.
const TIME = String.raw`(\d+):([0-5]\d):([0-5]\d)[,.](\d{1,3})`;
const TIMING = new RegExp(String.raw`^\s*${TIME}\s*-->\s*${TIME}(.*)$`);
const KEPT_TAGS = /^<\/?(i|b|u)>$/i;

const at = (line: number, column: number, words: string): CaptionProblem => ({
	line,
	column,
	message: `Line ${line}, column ${column}: ${words}`
});

function seconds(h: string, m: string, s: string, fraction: string): number {
	return toMillis(
		Number(h) * 3600 + Number(m) * 60 + Number(s) + Number(fraction.padEnd(3, '0')) / 1000
	);
}

/** Rewrites SRT cue text as WebVTT cue text: only <i>, <b>, <u> stay; bare & and < are escaped. */
export function srtTextToVtt(text: string): string {
	return (
		text
			// {\an8}-style overrides only position the text, which WebVTT cues do with settings.
			.replace(/\{\\[^}]*\}/g, '')
			.replace(/<[^<>]*>|&(?:[a-z]+|#\d+|#x[0-9a-f]+);|[<>&]/gi, (token) => {
				if (KEPT_TAGS.test(token)) return token.toLowerCase();
				if (token.startsWith('<') && token.length > 1) return '';
				if (token === '<') return '&lt;';
				if (token === '>') return '&gt;';
				if (token === '&') return '&amp;';
				return token;
			})
	);
}

/** Reads an SRT file's text into cues; every problem carries its line. */
export function parseSrt(input: string): SrtParseResult {
	const text = input.charCodeAt(0) === 0xfeff ? input.slice(1) : input;
	const lines = text.split(/\r\n|\r|\n/);
	if (/^WEBVTT([ \t]|$)/.test(lines[0])) {
		const words = 'this is a WebVTT file, not SRT; import it as WebVTT';
		return { ok: false, errors: [at(1, 1, words)] };
	}
	const cues: Cue[] = [];
	const errors: CaptionProblem[] = [];
	const warnings: CaptionProblem[] = [];
	let i = 0;
	while (i < lines.length) {
		if (lines[i].trim() === '') {
			i++;
			continue;
		}
		const first = i;
		while (i < lines.length && lines[i].trim() !== '') i++;
		const block = lines.slice(first, i);
		const lineNo = (offset: number) => first + offset + 1;
		const hasIndex = /^\s*\d+\s*$/.test(block[0]);
		const timingAt = hasIndex ? 1 : 0;
		const timing = block[timingAt];
		if (!hasIndex && !/-->/.test(block[0])) {
			errors.push(
				at(
					lineNo(0),
					1,
					'this text is not part of any cue: a cue starts with its number and a timing line such as 00:00:01,000 --> 00:00:04,000'
				)
			);
			continue;
		}
		if (timing === undefined) {
			errors.push(
				at(lineNo(0), 1, `cue ${block[0].trim()} has no timing line, so it would be lost`)
			);
			continue;
		}
		const m = TIMING.exec(timing);
		if (!m) {
			const words = `the cue timing "${timing.trim()}" cannot be read; write it like 00:00:01,000 --> 00:00:04,000`;
			errors.push(at(lineNo(timingAt), 1, words));
			continue;
		}
		if (!hasIndex) warnings.push(at(lineNo(0), 1, 'this cue has no number; it is imported anyway'));
		const start = seconds(m[1], m[2], m[3], m[4]);
		const end = seconds(m[5], m[6], m[7], m[8]);
		if (end <= start) {
			const column = endTimeColumn(timing);
			const short = (s: number) => formatTimestamp(s, { hours: 'auto' });
			const relation = end === start ? 'is the same as' : 'is before';
			errors.push(
				at(
					lineNo(timingAt),
					column,
					`the end time ${short(end)} ${relation} the start time ${short(start)}`
				)
			);
			continue;
		}
		if (m[4].length < 3 || m[8].length < 3) {
			warnings.push(
				at(
					lineNo(timingAt),
					1,
					'a time has fewer than three digits of milliseconds; they were read as if padded with zeros'
				)
			);
		}
		// m[9] holds the optional X1:… Y2:… coordinates, which WebVTT cannot express: dropped.
		cues.push({
			id: hasIndex ? block[0].trim() : '',
			start,
			end,
			text: block
				.slice(timingAt + 1)
				.map(srtTextToVtt)
				.join('\n')
		});
	}
	return errors.length > 0 ? { ok: false, errors } : { ok: true, cues, warnings };
}

/** Converts SRT text to a WebVTT file. */
export function srtToVtt(
	input: string
):
	| { ok: true; vtt: string; cues: Cue[]; warnings: CaptionProblem[] }
	| { ok: false; errors: CaptionProblem[] } {
	const parsed = parseSrt(input);
	if (!parsed.ok) return parsed;
	return { ...parsed, vtt: serializeVtt(parsed.cues) };
}

/** Writes SRT: cues numbered from 1 in order, HH:MM:SS,mmm, WebVTT tags other than i/b/u removed. */
export function serializeSrt(cues: readonly Cue[]): string {
	const time = (s: number) => formatTimestamp(s).replace('.', ',');
	return cues
		.map((cue, index) => {
			const text = cue.text
				.replace(/<[^>]*>/g, (tag) => (KEPT_TAGS.test(tag) ? tag : ''))
				.replace(/&([a-z]+);/g, (whole, name: string) => NAMED_REFERENCES[name] ?? whole)
				.split(/\r\n|\r|\n/)
				.filter((line) => line.trim() !== '')
				.join('\n');
			return `${index + 1}\n${time(cue.start)} --> ${time(cue.end)}\n${text}\n`;
		})
		.join('\n');
}
