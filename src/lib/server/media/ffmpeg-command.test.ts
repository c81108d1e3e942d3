import { describe, expect, it } from 'vitest';
import { commandArguments, ffmpegCommand } from './ffmpeg';

describe('commands written with the fluent-ffmpeg builder', () => {
	it('stand for the arguments runFfmpeg runs, inputs first, each value one argument', () => {
		const command = ffmpegCommand('/work/in put.mp4')
			.seekInput('1.500')
			.videoFilters('scale=min(640\\,iw):-2')
			.outputOptions(['-map', '0:v:0', '-frames:v', '1'])
			.format('image2')
			.output('/work/out.jpg');
		expect(commandArguments(command)).toEqual([
			'-ss',
			'1.500',
			'-i',
			'/work/in put.mp4',
			'-y',
			'-filter:v',
			'scale=min(640\\,iw):-2',
			'-map',
			'0:v:0',
			'-frames:v',
			'1',
			'-f',
			'image2',
			'/work/out.jpg'
		]);
	});
});
