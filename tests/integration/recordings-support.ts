import { execFile } from 'node:child_process';
import { promisify } from 'node:util';
import ffmpegInstaller from '@ffmpeg-installer/ffmpeg';

const run = promisify(execFile);

/**
 * Makes an MP4 clip with the packaged ffmpeg binary (a moving test pattern and a tone), without
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
	await run(ffmpegInstaller.path, [
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
