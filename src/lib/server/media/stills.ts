import { ffmpegCommand, MediaError, runCommand } from './ffmpeg';

export interface StillOptions {
	/** A video filter for the picture, e.g. a scale that fits a width. */
	filter: string;
	/** JPEG quality on ffmpeg's 2–31 scale (lower is better). */
	quality?: number;
	signal?: AbortSignal;
	timeoutSeconds?: number;
}

/**
 * Writes one JPEG of the frame at `seconds`, through the same runner (and machine slots) as
 * every other ffmpeg run; a failure to read the video is said in words fit for the poster step.
 */
export async function grabStill(
	input: string,
	seconds: number,
	output: string,
	options: StillOptions
): Promise<void> {
	try {
		await runCommand(
			ffmpegCommand(input)
				// Seeking before the input jumps to the keyframe and decodes forward: fast and exact.
				.seekInput(seconds.toFixed(3))
				.videoFilters(options.filter)
				.outputOptions(['-map', '0:v:0', '-frames:v', '1', '-q:v', String(options.quality ?? 3)])
				// One picture, written over any earlier one.
				.outputOptions(['-update', '1'])
				.format('image2')
				.output(output),
			{ signal: options.signal, timeoutSeconds: options.timeoutSeconds }
		);
	} catch (error) {
		if (error instanceof MediaError && error.kind === 'failed') {
			throw new MediaError(
				'No still picture could be taken from this video.',
				'failed',
				error.detail
			);
		}
		throw error;
	}
}
