import { execFile } from 'node:child_process';
import { readFile } from 'node:fs/promises';
import { promisify } from 'node:util';
import { FFMPEG } from '../integration/recordings-support';

const run = promisify(execFile);
// The ffmpeg the app chooses (Debian's when installed), as in the integration tests.
const ffmpeg = FFMPEG;

/** An upright 8-second test clip (180 × 320, as phones record by default) written to `path`. */
export async function makeUprightClip(path: string): Promise<Buffer> {
	await run(ffmpeg, [
		...['-hide_banner', '-loglevel', 'error', '-y'],
		...['-f', 'lavfi', '-i', 'testsrc=size=180x320:rate=12'],
		...['-t', '8', '-c:v', 'libx264', '-pix_fmt', 'yuv420p', '-g', '12'],
		...['-movflags', '+faststart', path]
	]);
	return readFile(path);
}
