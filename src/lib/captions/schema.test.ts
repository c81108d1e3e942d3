import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { cueSchema, cuesSchema } from './schema';
import { parseVtt, serializeVtt } from './vtt';
import type { Cue } from './types';

const cue = (over: Partial<Record<keyof Cue, unknown>> & { settings?: unknown } = {}) => ({
	id: '',
	start: 1,
	end: 2,
	text: 'Slide your heel',
	...over
});

describe('cueSchema refuses what a WebVTT file cannot hold in the field', () => {
	// W3C WebVTT §4.1/§4.3: identifiers hold no line terminator and no "-->"; region identifiers
	// no whitespace either. Each case here would otherwise break out of its field in the file.
	const refused: [string, ReturnType<typeof cue>][] = [
		[
			'a region with a newline (the smuggled-cue case)',
			cue({ settings: { region: 'r\n\n00:00:02.600 --> 00:00:05.500\nSMUGGLED' } })
		],
		['a region with a space', cue({ settings: { region: 'a b' } })],
		['a region with "-->"', cue({ settings: { region: 'a-->b' } })],
		['a region of 600 characters', cue({ settings: { region: 'r'.repeat(600) } })],
		['an id with a newline', cue({ id: 'one\ntwo' })],
		['an id with a carriage return', cue({ id: 'one\rtwo' })],
		['an id with "-->"', cue({ id: '1 --> 2' })],
		['an id of 600 characters', cue({ id: 'x'.repeat(600) })],
		['words with "-->"', cue({ text: 'a --> b' })],
		['words with a control character', cue({ text: 'a\u0007b' })],
		['a line number that is not whole', cue({ settings: { line: 1.5 } })],
		['a line percentage over 100', cue({ settings: { line: 150, snapToLines: false } })],
		['a position over 100', cue({ settings: { position: 101 } })],
		['an unknown setting', cue({ settings: { colour: 'red' } })],
		['a negative time', cue({ start: -1 })],
		['a time past 99:59:59.999', cue({ end: 360_000 })]
	];
	for (const [name, input] of refused) {
		it(`refuses ${name}`, () => {
			expect(cueSchema.safeParse(input).success).toBe(false);
		});
	}

	it('tidies what it can without changing meaning: blank lines, CRLF, millisecond times', () => {
		const parsed = cueSchema.parse(cue({ text: 'Slide\r\n\r\nyour heel\n', start: 1.00049 }));
		expect(parsed.text).toBe('Slide\nyour heel');
		expect(parsed.start).toBe(1);
	});

	it('checks a region name, then leaves it out: no REGION block is kept to declare it', () => {
		expect(
			cueSchema.parse(cue({ settings: { region: 'lower', align: 'start' } })).settings
		).toEqual({
			align: 'start'
		});
	});
});

// The property the issue asks for: any cue list the save API accepts survives writing it as
// WebVTT and reading it back (W3C WebVTT parser rules, through our parseVtt).
const text = fc
	.array(fc.stringMatching(/^[A-Za-z0-9 ,.'?!é→<>&;:/-]{1,30}$/), { minLength: 1, maxLength: 3 })
	.map((lines) => lines.join('\n'));
const anyCue = fc.record(
	{
		id: fc.oneof(fc.constant(''), fc.string({ maxLength: 12 })),
		start: fc.double({ min: 0, max: 5000, noNaN: true }),
		duration: fc.double({ min: 0.001, max: 30, noNaN: true }),
		text,
		settings: fc.record(
			{
				vertical: fc.constantFrom('rl', 'lr'),
				line: fc.integer({ min: -20, max: 20 }),
				snapToLines: fc.boolean(),
				lineAlign: fc.constantFrom('start', 'center', 'end'),
				position: fc.double({ min: 0, max: 100, noNaN: true }),
				positionAlign: fc.constantFrom('line-left', 'center', 'line-right'),
				size: fc.double({ min: 0, max: 100, noNaN: true }),
				align: fc.constantFrom('start', 'center', 'end', 'left', 'right'),
				region: fc.string({ maxLength: 10 })
			},
			{ requiredKeys: [] }
		)
	},
	{ requiredKeys: ['id', 'start', 'duration', 'text'] }
);

describe('what the save API accepts, a WebVTT file gives back', () => {
	it('holds for any accepted cue list', () => {
		fc.assert(
			fc.property(fc.array(anyCue, { maxLength: 6 }), (raw) => {
				const input = raw.map(({ duration, ...c }) => ({ ...c, end: c.start + duration }));
				const accepted = cuesSchema.safeParse(input);
				fc.pre(accepted.success);
				const cues = accepted.data!;
				const read = parseVtt(serializeVtt(cues));
				expect(read.ok).toBe(true);
				if (!read.ok) return;
				const byStart = (list: Cue[]) =>
					[...list].sort((a, b) => a.start - b.start || b.end - a.end);
				expect(byStart(read.cues)).toEqual(byStart(cues));
			}),
			{ numRuns: 400 }
		);
	});
});
