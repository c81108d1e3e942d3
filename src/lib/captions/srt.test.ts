import { describe, expect, it } from 'vitest';
import { parseSrt, serializeSrt, srtToVtt } from './srt';
import { parseVtt } from './vtt';

// SRT has no formal standard; REFERENCES.md "SRT to WebVTT" (secondary, consistent across
// descriptions) gives the conversion rules these tests check.
const SRT = [
	'1',
	'00:00:01,000 --> 00:00:04,200 X1:100 X2:600 Y1:50 Y2:100',
	'Lie on your back with both legs straight.',
	'',
	'2',
	'00:00:04,500 --> 00:00:07,000',
	'<font color="#ffff00">Tighten</font> the muscle on top of your thigh',
	'and <i>press</i> the knee down.',
	''
].join('\r\n');

describe('parseSrt', () => {
	it('reads comma decimals, keeps the index as id, drops coordinates and <font>, handles CRLF', () => {
		const result = parseSrt('\ufeff' + SRT);
		expect(result).toEqual({
			ok: true,
			warnings: [],
			cues: [
				{ id: '1', start: 1, end: 4.2, text: 'Lie on your back with both legs straight.' },
				{
					id: '2',
					start: 4.5,
					end: 7,
					text: 'Tighten the muscle on top of your thigh\nand <i>press</i> the knee down.'
				}
			]
		});
	});

	it('sends a WebVTT file to the WebVTT importer', () => {
		expect(parseSrt('WEBVTT\n\n00:01.000 --> 00:02.000\nRelax.')).toEqual({
			ok: false,
			errors: [
				{
					line: 1,
					column: 1,
					message: 'Line 1, column 1: this is a WebVTT file, not SRT; import it as WebVTT'
				}
			]
		});
	});

	it('escapes characters WebVTT would read as markup', () => {
		const result = parseSrt('1\n00:00:01,000 --> 00:00:02,000\nHeel & toe < 5 times {\\an8}\n');
		expect(result.ok && result.cues[0].text).toBe('Heel &amp; toe &lt; 5 times ');
	});

	it('names the line of each problem', () => {
		const result = parseSrt(
			[
				'1',
				'00:00:01.000 --> 00:00:02,000',
				'ok',
				'',
				'2',
				'00:00:05,000 -> 00:00:06,000',
				'bad',
				'',
				'3',
				'00:00:09,000 --> 00:00:08,000',
				'backwards',
				'',
				'stray'
			].join('\n')
		);
		expect(result.ok ? [] : result.errors.map((e) => e.message)).toEqual([
			'Line 6, column 1: the cue timing "00:00:05,000 -> 00:00:06,000" cannot be read; write it like 00:00:01,000 --> 00:00:04,000',
			'Line 10, column 18: the end time 00:08.000 is before the start time 00:09.000',
			'Line 13, column 1: this text is not part of any cue: a cue starts with its number and a timing line such as 00:00:01,000 --> 00:00:04,000'
		]);
	});
});

describe('srtToVtt', () => {
	it('writes a WEBVTT line and a blank line first, with full-stop times', () => {
		const result = srtToVtt(SRT);
		expect(result.ok && result.vtt.split('\n').slice(0, 5)).toEqual([
			'WEBVTT',
			'',
			'1',
			'00:00:01.000 --> 00:00:04.200',
			'Lie on your back with both legs straight.'
		]);
		const back = result.ok ? parseVtt(result.vtt) : null;
		expect(back?.ok && back.cues).toEqual(result.ok && result.cues);
	});
});

describe('serializeSrt', () => {
	it('numbers cues from 1 with comma times and keeps only i, b and u', () => {
		const srt = serializeSrt([
			{ id: 'intro', start: 0.5, end: 2, text: '<v Coach><b>Stand</b> tall</v> &amp; breathe' },
			{ id: '', start: 3661.25, end: 3662, text: '<c.note>Hold</c>' }
		]);
		expect(srt).toBe(
			'1\n00:00:00,500 --> 00:00:02,000\n<b>Stand</b> tall & breathe\n\n2\n01:01:01,250 --> 01:01:02,000\nHold\n'
		);
		expect(parseSrt(srt).ok).toBe(true);
	});
});
