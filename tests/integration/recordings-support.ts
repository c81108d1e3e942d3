import { execFile } from 'node:child_process';
import { accessSync, constants } from 'node:fs';
import { createRequire } from 'node:module';
import { promisify } from 'node:util';
import type { Recording } from '../../src/lib/server/db/schema';
import { chooseTool } from '../../src/lib/server/media/tools';

const run = promisify(execFile);
const require = createRequire(import.meta.url);

/**
 * The ffmpeg the app chooses on this machine (FFMPEG_PATH, else Debian's, else the npm build),
 * fixed when this module loads: a test may point FFMPEG_PATH at a wrapper afterwards.
 */
export const FFMPEG = chooseTool('ffmpeg', {
	setting: process.env.FFMPEG_PATH,
	isExecutable: (path) => {
		try {
			accessSync(path, constants.X_OK);
			return true;
		} catch {
			return false;
		}
	},
	bundled: () => (require('@ffmpeg-installer/ffmpeg') as { path: string }).path
}).path;

/** What makeClip's clip is by default, as its recording row says (for makeRecording). */
export const CLIP_FIGURES = {
	durationSeconds: 4,
	width: 320,
	height: 240,
	videoCodec: 'h264',
	audioCodec: 'aac',
	frameRate: 25,
	hasAudio: true
} satisfies Partial<Recording>;

/**
 * Makes an MP4 clip with the chosen ffmpeg (a moving test pattern and a tone), without
 * fast start so the index sits at the end and a truncated copy has none. `heavy` makes it
 * about 10 MB a second.
 */
export async function makeClip(
	path: string,
	{
		seconds = 4,
		size = '320x240',
		rate = 25,
		heavy = false
	}: { seconds?: number; size?: string; rate?: number; heavy?: boolean } = {}
): Promise<void> {
	await run(FFMPEG, [
		'-hide_banner',
		'-loglevel',
		'error',
		'-y',
		'-f',
		'lavfi',
		'-i',
		`testsrc=size=${size}:rate=${rate}:duration=${seconds}`,
		'-f',
		'lavfi',
		'-i',
		`sine=frequency=440:duration=${seconds}`,
		// Lossless noise makes a large file from few seconds, for uploads of several parts.
		...(heavy ? ['-vf', 'noise=alls=60:allf=t', '-qp', '0'] : []),
		'-c:v',
		'libx264',
		'-preset',
		'ultrafast',
		'-pix_fmt',
		'yuv420p',
		'-c:a',
		'aac',
		'-shortest',
		path
	]);
}
