import { MediaError, runFfmpeg, STORAGE_URL_WHITELIST, type RunOptions } from '../media/ffmpeg';

/**
 * The first audio track of `input` (a local file, or a presigned URL of our own storage) as a
 * small file for speech: mono, 16 kHz, MP3 at 32 kbit/s, about 14 MB an hour — under the 25 MB
 * a request to the hosted transcription API may carry for recordings up to about 100 minutes.
 * Returns false, writing nothing, when the input has no sound.
 */
export async function extractSpeechAudio(
	input: string,
	output: string,
	options: Pick<RunOptions, 'signal' | 'timeoutSeconds'> = {}
): Promise<boolean> {
	try {
		await runFfmpeg(
			[
				'-y',
				...(/^https?:\/\//.test(input) ? ['-protocol_whitelist', STORAGE_URL_WHITELIST] : []),
				'-i',
				input,
				'-map',
				'0:a:0',
				'-vn',
				'-sn',
				'-dn',
				'-ac',
				'1',
				'-ar',
				'16000',
				'-c:a',
				'libmp3lame',
				'-b:a',
				'32k',
				output
			],
			options
		);
		return true;
	} catch (error) {
		if (error instanceof MediaError && /matches no streams/.test(error.detail)) return false;
		throw error;
	}
}
