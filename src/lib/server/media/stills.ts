import ffmpeg from 'fluent-ffmpeg';
import { config } from '../config';
import { ffmpegPath, MediaError, PROTOCOL_WHITELIST } from './ffmpeg';
import { withMediaSlot } from './slots';

export interface StillOptions {
	/** A video filter for the picture, e.g. a scale that fits a width. */
	filter: string;
	/** JPEG quality on ffmpeg's 2–31 scale (lower is better). */
	quality?: number;
	signal?: AbortSignal;
	timeoutSeconds?: number;
}

/**
 * Writes one JPEG of the frame at `seconds`. A still is one short run with no progress to read,
 * which fluent-ffmpeg's own options cover — lowered priority, a time limit, the input options —
 * so it builds and runs the command here; the long runs go through runFfmpeg (see ffmpeg.ts).
 */
export function grabStill(
	input: string,
	seconds: number,
	output: string,
	options: StillOptions
): Promise<void> {
	const timeout = options.timeoutSeconds ?? config().MEDIA_JOB_TIMEOUT_SECONDS;
	// A still is an ffmpeg run like any other: it waits for one of the machine's slots.
	return withMediaSlot(() => still(input, seconds, output, options, timeout), {
		signal: options.signal
	});
}

function still(
	input: string,
	seconds: number,
	output: string,
	options: StillOptions,
	timeout: number
): Promise<void> {
	return new Promise((resolve, reject) => {
		if (options.signal?.aborted) {
			reject(new MediaError('Processing was cancelled.', 'aborted'));
			return;
		}
		const command = ffmpeg({ niceness: 10, timeout })
			.setFfmpegPath(ffmpegPath())
			.input(input)
			// Seeking before the input jumps to the keyframe and decodes forward: fast and exact.
			.inputOptions(['-protocol_whitelist', PROTOCOL_WHITELIST, '-ss', seconds.toFixed(3)])
			.outputOptions([
				'-map',
				'0:v:0',
				'-frames:v',
				'1',
				'-vf',
				options.filter,
				'-q:v',
				String(options.quality ?? 3),
				'-f',
				'image2',
				'-update',
				'1'
			])
			.output(output);
		const onAbort = () => command.kill('SIGKILL');
		options.signal?.addEventListener('abort', onAbort, { once: true });
		command
			.on('end', () => {
				options.signal?.removeEventListener('abort', onAbort);
				resolve();
			})
			.on('error', (error: Error, _stdout: string | null, stderr: string | null) => {
				options.signal?.removeEventListener('abort', onAbort);
				if (options.signal?.aborted) {
					reject(new MediaError('Processing was cancelled.', 'aborted'));
				} else if (/SIGKILL/.test(error.message)) {
					reject(
						new MediaError(
							`Taking a still took longer than ${timeout} s and was stopped.`,
							'timeout'
						)
					);
				} else {
					reject(
						new MediaError(
							'No still picture could be taken from this video.',
							'failed',
							stderr?.slice(-2000) ?? error.message
						)
					);
				}
			})
			.run();
	});
}
