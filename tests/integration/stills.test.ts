import './env';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ffmpegPath, MediaError } from '../../src/lib/server/media/ffmpeg';
import { probeFile } from '../../src/lib/server/media/probe';
import { grabStill } from '../../src/lib/server/media/stills';

const dir = mkdtempSync(join(tmpdir(), 'kinelume-stills-'));
const clip = join(dir, 'clip.mp4');
execFileSync(ffmpegPath(), [
	'-y',
	'-loglevel',
	'error',
	'-f',
	'lavfi',
	'-i',
	'testsrc2=size=640x360:rate=25',
	'-t',
	'3',
	'-pix_fmt',
	'yuv420p',
	clip
]);

describe('grabStill (through the runner)', () => {
	it('writes a JPEG of the asked size from the middle of a clip', async () => {
		const out = join(dir, 'middle.jpg');
		await grabStill(clip, 1.5, out, { filter: 'scale=320:-2' });
		// JPEG files start with the SOI marker FF D8 (ITU-T T.81).
		expect([...readFileSync(out).subarray(0, 2)]).toEqual([0xff, 0xd8]);
		const probe = await probeFile(out);
		expect(probe.video).toMatchObject({ width: 320, height: 180 });
	});

	it('refuses at once when already cancelled', async () => {
		const controller = new AbortController();
		controller.abort();
		const attempt = grabStill(clip, 1, join(dir, 'never.jpg'), {
			filter: 'null',
			signal: controller.signal
		});
		await expect(attempt).rejects.toBeInstanceOf(MediaError);
		await expect(attempt).rejects.toMatchObject({ kind: 'aborted' });
	});

	it('reports a file that is not a video in plain words', async () => {
		const notVideo = join(dir, 'notes.mp4');
		execFileSync('sh', ['-c', `echo "not a video" > ${notVideo}`]);
		await expect(
			grabStill(notVideo, 0, join(dir, 'x.jpg'), { filter: 'null' })
		).rejects.toMatchObject({
			kind: 'failed',
			message: 'No still picture could be taken from this video.'
		});
	});
});
