import { describe, expect, it } from 'vitest';
import type { Cue, CueSettings } from './types';
import {
	CaptionWriteError,
	formatTimestamp,
	parseTimestamp,
	parseVtt,
	serializeVtt,
	sortCues
} from './vtt';

const file = (...lines: string[]) => lines.join('\n');

function cuesOf(text: string): Cue[] {
	const result = parseVtt(text);
	if (!result.ok) throw new Error(result.errors.map((e) => e.message).join('\n'));
	return result.cues;
}

function errorsOf(text: string): string[] {
	const result = parseVtt(text);
	if (result.ok) throw new Error('expected the file to be refused');
	return result.errors.map((e) => e.message);
}

describe('timestamps, W3C WebVTT "WebVTT timestamp"', () => {
	it('reads hours-optional timestamps with exactly three fraction digits', () => {
		expect(parseTimestamp('00:01.000')).toBe(1);
		expect(parseTimestamp('01:02.345')).toBe(62.345);
		expect(parseTimestamp('01:00:00.000')).toBe(3600);
		// Hours may have more than two digits (W3C WebVTT timestamp syntax: "two or more digits").
		expect(parseTimestamp('100:00:00.001')).toBe(360000.001);
	});

	it('refuses minutes or seconds above 59 and fractions that are not three digits', () => {
		for (const bad of [
			'00:60.000',
			'60:00.000',
			'00:00:60.000',
			'00:01.00',
			'00:01.0000',
			'00:01,000',
			'1:02.000',
			' 00:01.000'
		]) {
			expect(parseTimestamp(bad), bad).toBeNull();
		}
	});

	it('writes HH:MM:SS.mmm, or drops zero hours for messages', () => {
		expect(formatTimestamp(0)).toBe('00:00:00.000');
		expect(formatTimestamp(62.5)).toBe('00:01:02.500');
		expect(formatTimestamp(3599.9995)).toBe('01:00:00.000');
		expect(formatTimestamp(2.5, { hours: 'auto' })).toBe('00:02.500');
		expect(() => formatTimestamp(-1)).toThrow(RangeError);
	});
});

describe('parseVtt on import (author conformance)', () => {
	it('reads cues with ids, text and settings, and strips a UTF-8 BOM', () => {
		const cues = cuesOf(
			'\ufeff' +
				file(
					'WEBVTT',
					'',
					'intro',
					'00:00:01.000 --> 00:00:04.000 align:start line:90%',
					'Lie on your back with both legs straight.',
					'',
					'00:04.500 --> 00:07.000',
					'<i>Slowly</i> slide your heel',
					'toward you.'
				)
		);
		expect(cues).toEqual([
			{
				id: 'intro',
				start: 1,
				end: 4,
				text: 'Lie on your back with both legs straight.',
				settings: { align: 'start', line: 90, snapToLines: false }
			},
			{ id: '', start: 4.5, end: 7, text: '<i>Slowly</i> slide your heel\ntoward you.' }
		]);
	});

	it('accepts a bare WEBVTT as a file with no cues (W3C WebVTT file structure)', () => {
		expect(cuesOf('WEBVTT')).toEqual([]);
		expect(cuesOf('WEBVTT - Knee class, week 1\n\n')).toEqual([]);
	});

	it('refuses a file without the WEBVTT signature, and spots an SRT file', () => {
		expect(errorsOf('1\n00:00:01,000 --> 00:00:02,000\nStand tall.')).toEqual([
			'Line 1, column 1: this looks like an SRT file (it starts with a cue number); import it as SRT, or put WEBVTT and a blank line first'
		]);
		expect(errorsOf('WEBVTTX\n')[0]).toMatch(
			/^Line 1, column 1: the file must start with the word WEBVTT/
		);
		expect(errorsOf('')[0]).toMatch(/the file is empty/);
	});

	it('reports an end time before the start time, with its line and column', () => {
		const text = file(
			'WEBVTT',
			'',
			'00:00.500 --> 00:01.500',
			'Bend your knee.',
			'',
			'NOTE the next cue was typed in a hurry',
			'',
			'00:02.500 --> 00:01.000',
			'Hold for five seconds.'
		);
		expect(errorsOf(text)).toEqual([
			'Line 8, column 15: the end time 00:01.000 is before the start time 00:02.500'
		]);
	});

	it('reports a malformed timestamp, which the parser would silently drop', () => {
		const errors = errorsOf(file('WEBVTT', '', '00:01.000 --> 00:03,000', 'Relax.'));
		expect(errors).toHaveLength(1);
		expect(errors[0]).toMatch(
			/^Line 3, column \d+: the cue timing "00:01.000 --> 00:03,000" cannot be read: the seconds need a full stop/
		);
	});

	it('lists every error at once, in line order', () => {
		const text = file(
			'WEBVTT',
			'',
			'00:01 --> 00:02.000',
			'a',
			'',
			'00:03.000 --> 00:02.000',
			'b',
			'',
			'stray words',
			''
		);
		const result = parseVtt(text);
		expect(result.ok ? [] : result.errors.map((e) => e.line)).toEqual([3, 6, 9]);
	});

	it('refuses text that belongs to no cue', () => {
		expect(
			errorsOf(file('WEBVTT', '', 'Straighten your leg.', '', '00:01.000 --> 00:02.000', 'ok'))
		).toEqual([
			'Line 3, column 1: this text is not part of any cue, because no timing line (such as 00:00:01.000 --> 00:00:04.000) comes before it'
		]);
	});

	it('refuses a NUL character, which no text file has', () => {
		expect(errorsOf('WEBVTT\n\n00:01.000 --> 00:02.000\nA\0B')[0]).toMatch(
			/^Line 4, column 2: the file contains a NUL character/
		);
	});

	it('warns without refusing: unknown tags, disorder, duplicate ids, STYLE blocks', () => {
		const result = parseVtt(
			file(
				'WEBVTT',
				'',
				'STYLE',
				'::cue { color: yellow }',
				'',
				'a',
				'00:05.000 --> 00:06.000',
				'<font color="red">Stop</font> if it hurts.',
				'',
				'a',
				'00:01.000 --> 00:02.000',
				'Breathe out.'
			)
		);
		expect(result.ok).toBe(true);
		if (!result.ok) return;
		const messages = result.warnings.map((w) => w.message);
		expect(messages).toEqual(
			expect.arrayContaining([
				expect.stringMatching(/^Line 3, column 1: the STYLE block is not kept/),
				expect.stringMatching(/^Line 8, column \d+: this tag is not a WebVTT tag/),
				expect.stringMatching(/^Line 10, column 1: the cue identifier "a" is used twice/),
				expect.stringMatching(
					/^Line 11, column 1: this cue starts at 00:01.000, before the cue above it/
				)
			])
		);
		// File order is kept for the studio; the checks flag the disorder.
		expect(result.cues.map((c) => c.start)).toEqual([5, 1]);
		expect(sortCues(result.cues).map((c) => c.start)).toEqual([1, 5]);
	});

	it('skips only a setting with no value, as W3C WebVTT "parse the WebVTT cue settings" says (webvtt-parser stops there)', () => {
		const result = parseVtt('WEBVTT\n\n00:01.000 --> 00:02.000 size: align:start\nStand tall.');
		expect(result.ok && result.cues[0].settings).toEqual({ align: 'start' });
		expect(result.ok && result.warnings.map((w) => w.message)).toEqual([
			'Line 3, column 25: the cue setting "size:" has no value and is ignored'
		]);
	});

	it('in browser conformance keeps what a browser keeps', () => {
		const result = parseVtt(
			'WEBVTT\n\n00:02.000 --> 00:01.000\nkept\n\n00:1.000 --> 00:02.000\ndropped',
			{
				conformance: 'browser'
			}
		);
		expect(result.ok && result.cues.map((c) => c.text)).toEqual(['kept']);
		expect(result.ok && result.warnings.length).toBe(2);
	});
});

describe('serializeVtt', () => {
	it('writes a valid file with HH:MM:SS.mmm, ids and settings', () => {
		const vtt = serializeVtt({
			kind: 'captions',
			language: 'en-GB',
			label: 'English',
			cues: [
				{
					id: 'c1',
					start: 1,
					end: 3.25,
					text: 'Lie on your back.',
					settings: { align: 'start', line: 0 }
				},
				{ id: '', start: 3600.5, end: 3602, text: '<b>Stop</b> if it hurts.' }
			]
		});
		expect(vtt).toBe(
			file(
				'WEBVTT',
				'',
				'c1',
				'00:00:01.000 --> 00:00:03.250 line:0 align:start',
				'Lie on your back.',
				'',
				'01:00:00.500 --> 01:00:02.000',
				'<b>Stop</b> if it hurts.',
				''
			)
		);
	});

	it('writes regions back, so region settings survive a round trip (W3C WebVTT regions)', () => {
		const text = file(
			'WEBVTT',
			'',
			'REGION',
			'id:coach width:40% lines:3 regionanchor:0%,100% viewportanchor:10%,90% scroll:up',
			'',
			'00:01.000 --> 00:03.000 region:coach align:left',
			'Shift your weight onto the left leg.'
		);
		const first = parseVtt(text);
		if (!first.ok) throw new Error('refused');
		expect(first.regions).toEqual([
			{
				id: 'coach',
				width: 40,
				lines: 3,
				regionAnchor: [0, 100],
				viewportAnchor: [10, 90],
				scroll: 'up'
			}
		]);
		const again = parseVtt(serializeVtt(first.cues, { regions: first.regions }));
		expect(again).toEqual(first);
	});

	it('refuses, rather than rewrites, a field the file cannot hold (W3C WebVTT §4.1)', () => {
		const write = (cue: Partial<Cue>) => () =>
			serializeVtt([{ id: '', start: 0, end: 1, text: 'Heel slides', ...cue }]);
		expect(write({ id: 'x-->y' })).toThrow(CaptionWriteError);
		expect(write({ id: 'one\ntwo' })).toThrow(CaptionWriteError);
		expect(write({ text: 'Heel --> toe' })).toThrow(CaptionWriteError);
		expect(write({ text: 'Heel\n\nwalk' })).toThrow(CaptionWriteError);
		expect(write({ settings: { region: 'r\n\n00:00:02.600 --> 00:00:05.500\nSMUGGLED' } })).toThrow(
			CaptionWriteError
		);
		expect(write({ settings: { region: 'lower' } })).not.toThrow();
	});

	it('round-trips: parse(serialize(cues)) gives the cues back (seeded random property)', () => {
		let seed = 20261201;
		const random = () => (seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31;
		const pick = <T>(list: readonly T[]): T => list[Math.floor(random() * list.length)];
		const phrases = [
			'Lie on your back',
			'with both legs straight.',
			'<i>Slowly</i>',
			'bend the knee',
			'<v Coach>Hold it</v>',
			'and relax &amp; breathe',
			'Stand on one leg.'
		];
		const settingsChoices: (CueSettings | undefined)[] = [
			undefined,
			{ align: 'start' },
			{ line: 2 },
			{ line: 85, snapToLines: false, lineAlign: 'end' },
			{ position: 30, positionAlign: 'line-left', size: 50 },
			{ vertical: 'rl' }
		];
		for (let run = 0; run < 200; run++) {
			let t = 0;
			const cues: Cue[] = Array.from({ length: 1 + Math.floor(random() * 6) }, (_, i) => {
				const start = (t += Math.round(random() * 5000) / 1000);
				const end = (t += 0.001 + Math.round(random() * 7000) / 1000);
				const text = Array.from({ length: 1 + Math.floor(random() * 3) }, () => pick(phrases)).join(
					pick([' ', '\n'])
				);
				const settings = pick(settingsChoices);
				const id = pick(['', `cue-${i}`, `${i + 1}`, 'knee bend ' + i]);
				return {
					id,
					start: Math.round(start * 1000) / 1000,
					end: Math.round(end * 1000) / 1000,
					text,
					...(settings ? { settings } : {})
				};
			});
			expect(cuesOf(serializeVtt(cues))).toEqual(cues);
		}
	});
});
