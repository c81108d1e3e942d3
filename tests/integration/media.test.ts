import { execFile } from 'node:child_process';
import { copyFile, mkdtemp, open, readFile, rm, stat, truncate, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { refusalReason, type DeclaredUpload } from '$lib/media/validate';
import { ffmpegPath, ffprobePath, runFfmpeg } from '$lib/server/media/ffmpeg';
import {
	makePosters,
	PHONE_POSTER,
	makeRendition,
	makeSprite,
	makeWaveform,
	posterFractions
} from '$lib/server/media/outputs';
import { MediaError, probeFile, type ProbeResult } from '$lib/server/media/probe';

/*
 * Real ffmpeg on clips this file makes itself (lavfi test patterns and tones): nothing is read
 * from outside the temp folder.
 */

const run = promisify(execFile);
let dir: string;

const clip = (name: string) => join(dir, name);

/** Makes a fixture with the packaged ffmpeg directly, not through the code under test. */
async function ffmpeg(...args: string[]): Promise<void> {
	await run(ffmpegPath(), ['-hide_banner', '-loglevel', 'error', '-y', ...args]);
}

async function ffprobeCsv(...args: string[]): Promise<string[]> {
	const { stdout } = await run(ffprobePath(), ['-v', 'error', ...args, '-of', 'csv=p=0']);
	// ffprobe's csv with -skip_frame prints trailing commas and blank lines (STACK.md).
	return stdout
		.split(/[\n,]/)
		.map((s) => s.trim())
		.filter((s) => s !== '');
}

/** The types of an MP4's top-level boxes, in file order. */
async function topLevelBoxes(path: string): Promise<string[]> {
	const file = await open(path, 'r');
	try {
		const { size } = await file.stat();
		const types: string[] = [];
		const header = Buffer.alloc(16);
		let offset = 0;
		while (offset + 8 <= size) {
			await file.read(header, 0, 16, offset);
			let boxSize = header.readUInt32BE(0);
			types.push(header.toString('latin1', 4, 8));
			if (boxSize === 1) boxSize = Number(header.readBigUInt64BE(8));
			else if (boxSize === 0) boxSize = size - offset;
			if (boxSize < 8) throw new Error(`bad box size at ${offset}`);
			offset += boxSize;
		}
		return types;
	} finally {
		await file.close();
	}
}

async function declared(path: string, contentType: string): Promise<DeclaredUpload> {
	return { filename: path.split('/').pop()!, contentType, sizeBytes: (await stat(path)).size };
}

/** What an upload handler does: probe, and treat an unreadable file as no probe. */
async function refusalFor(path: string, upload: DeclaredUpload): Promise<string | null> {
	let probe: ProbeResult | null = null;
	try {
		probe = await probeFile(path);
	} catch (error) {
		expect(error).toBeInstanceOf(MediaError);
		expect((error as MediaError).kind).toBe('unreadable');
	}
	return refusalReason(probe, upload);
}

const FRAME = 1 / 30;
const timings: Record<string, number> = {};

beforeAll(async () => {
	dir = await mkdtemp(join(tmpdir(), 'kinelume-media-'));
	const started = performance.now();
	// 6 s landscape demo with a tone that drops out between 2 s and 3 s; no faststart, default
	// keyframe spacing (only the first frame is a keyframe in 6 s), as a camera might write it.
	await ffmpeg(
		'-f',
		'lavfi',
		'-i',
		'testsrc2=size=1280x720:rate=30:duration=6',
		'-f',
		'lavfi',
		'-i',
		'sine=frequency=440:sample_rate=48000:duration=6',
		'-af',
		"volume=enable='between(t,2,3)':volume=0",
		'-c:v',
		'libx264',
		'-preset',
		'ultrafast',
		'-pix_fmt',
		'yuv420p',
		'-c:a',
		'aac',
		'-b:a',
		'96k',
		clip('landscape.mp4')
	);
	// A phone held upright: landscape pixels plus a rotation in the track header. The 2018 ffmpeg
	// drops the rotate tag when encoding, so it is set on a stream copy.
	await ffmpeg(
		'-f',
		'lavfi',
		'-i',
		'testsrc2=size=640x360:rate=30:duration=2',
		'-c:v',
		'libx264',
		'-preset',
		'ultrafast',
		'-pix_fmt',
		'yuv420p',
		clip('flat.mp4')
	);
	await ffmpeg(
		'-i',
		clip('flat.mp4'),
		'-c',
		'copy',
		'-metadata:s:v:0',
		'rotate=90',
		clip('portrait.mp4')
	);
	await ffmpeg(
		'-f',
		'lavfi',
		'-i',
		'testsrc2=size=320x240:rate=25:duration=2',
		'-f',
		'lavfi',
		'-i',
		'sine=frequency=660:sample_rate=48000:duration=2',
		'-c:v',
		'libvpx-vp9',
		'-deadline',
		'realtime',
		'-cpu-used',
		'8',
		'-b:v',
		'300k',
		'-c:a',
		'libopus',
		clip('clip.webm')
	);
	await writeFile(
		clip('notes.mp4'),
		'Warm up for five minutes, then ten slow knee bends.\n'.repeat(40)
	);
	await writeFile(clip('empty.mp4'), '');
	const half = Math.floor((await stat(clip('landscape.mp4'))).size / 2);
	await copyFile(clip('landscape.mp4'), clip('truncated.mp4'));
	await truncate(clip('truncated.mp4'), half);
	await ffmpeg(
		'-i',
		clip('landscape.mp4'),
		'-c',
		'copy',
		'-movflags',
		'+faststart',
		clip('fast.mp4')
	);
	await copyFile(clip('fast.mp4'), clip('fast-truncated.mp4'));
	await truncate(clip('fast-truncated.mp4'), Math.floor((await stat(clip('fast.mp4'))).size / 2));
	timings.fixtures = performance.now() - started;
}, 60_000);

afterAll(async () => {
	if (dir) await rm(dir, { recursive: true, force: true });
	console.info('media timings (ms):', JSON.stringify(timings));
});

describe('probeFile', () => {
	it('reads container, duration, streams and size', async () => {
		const probe = await probeFile(clip('landscape.mp4'));
		expect(probe.formatName).toBe('mov,mp4,m4a,3gp,3g2,mj2');
		expect(probe.durationSeconds).toBeGreaterThan(6 - FRAME);
		expect(probe.durationSeconds).toBeLessThan(6 + 0.1);
		expect(probe.sizeBytes).toBe((await stat(clip('landscape.mp4'))).size);
		expect(probe.bitRate).toBeGreaterThan(0);
		expect(probe.video).toEqual({
			codec: 'h264',
			width: 1280,
			height: 720,
			displayWidth: 1280,
			displayHeight: 720,
			rotation: 0,
			frameRate: 30,
			pixelFormat: 'yuv420p'
		});
		expect(probe.audio).toEqual({ codec: 'aac', sampleRate: 48000, channels: 1 });
	});

	it('reports rotation and the size as displayed', async () => {
		const probe = await probeFile(clip('portrait.mp4'));
		// The track matrix this ffmpeg writes for rotate=90 reads back as a quarter turn either
		// way depending on the reader's version; what matters is that it is a quarter turn.
		expect([90, 270]).toContain(probe.video?.rotation);
		expect(probe.video).toMatchObject({
			width: 640,
			height: 360,
			displayWidth: 360,
			displayHeight: 640
		});
		expect(probe.audio).toBeNull();
	});

	it('reads WebM', async () => {
		const probe = await probeFile(clip('clip.webm'));
		expect(probe.formatName).toBe('matroska,webm');
		expect(probe.video).toMatchObject({ codec: 'vp9', width: 320, height: 240, frameRate: 25 });
		expect(probe.audio).toMatchObject({ codec: 'opus', sampleRate: 48000 });
		expect(probe.durationSeconds).toBeCloseTo(2, 1);
	});

	it('throws a plain MediaError for files that are not media', async () => {
		for (const name of ['notes.mp4', 'empty.mp4', 'truncated.mp4', 'missing.mp4']) {
			const error = await probeFile(clip(name)).catch((e: unknown) => e);
			expect(error, name).toBeInstanceOf(MediaError);
			expect((error as MediaError).kind, name).toBe('unreadable');
			expect((error as MediaError).message).toBe('This file could not be read as a video.');
		}
	});
});

describe('refusal reasons from probe and validate', () => {
	it('accepts the good clips', async () => {
		expect(
			await refusalFor(clip('landscape.mp4'), await declared(clip('landscape.mp4'), 'video/mp4'))
		).toBeNull();
		expect(
			await refusalFor(
				clip('portrait.mp4'),
				await declared(clip('portrait.mp4'), 'video/quicktime')
			)
		).toBeNull();
		expect(
			await refusalFor(clip('clip.webm'), await declared(clip('clip.webm'), 'video/webm'))
		).toBeNull();
	});

	it('refuses a text file named .mp4 and a half-uploaded file as unreadable', async () => {
		for (const name of ['notes.mp4', 'truncated.mp4']) {
			expect(await refusalFor(clip(name), await declared(clip(name), 'video/mp4')), name).toMatch(
				/could not read .* as a video/
			);
		}
	});

	it('refuses an empty file', async () => {
		expect(
			await refusalFor(clip('empty.mp4'), await declared(clip('empty.mp4'), 'video/mp4'))
		).toMatch(/“empty.mp4” is empty/);
	});

	it('refuses a readable file shorter than declared', async () => {
		const upload = {
			...(await declared(clip('fast.mp4'), 'video/mp4')),
			filename: 'fast-truncated.mp4'
		};
		expect(await refusalFor(clip('fast-truncated.mp4'), upload)).toMatch(
			/upload did not finish properly/
		);
	});

	it('refuses WebM contents under an MP4 name', async () => {
		await copyFile(clip('clip.webm'), clip('disguised.mp4'));
		expect(
			await refusalFor(clip('disguised.mp4'), await declared(clip('disguised.mp4'), 'video/mp4'))
		).toMatch(/contents are something else/);
	});

	it('refuses a recording over 60 minutes', async () => {
		// One grey frame a second keeps a 61-minute file tiny and quick to make.
		await ffmpeg(
			'-f',
			'lavfi',
			'-i',
			'color=c=gray:size=64x64:rate=1:duration=3660',
			'-c:v',
			'libx264',
			'-preset',
			'ultrafast',
			clip('long.mp4')
		);
		expect(
			await refusalFor(clip('long.mp4'), await declared(clip('long.mp4'), 'video/mp4'))
		).toMatch(/about 61 minutes long; recordings can be at most 60 minutes/);
	});

	it('refuses a file with sound only', async () => {
		await ffmpeg('-i', clip('landscape.mp4'), '-vn', '-c:a', 'copy', clip('sound-only.mp4'));
		expect(
			await refusalFor(clip('sound-only.mp4'), await declared(clip('sound-only.mp4'), 'video/mp4'))
		).toMatch(/no video track/);
	});
});

describe('makeRendition', () => {
	it('makes a fast-start H.264/AAC MP4 with a keyframe every second', async () => {
		const source = await probeFile(clip('landscape.mp4'));
		const output = clip('out/landscape-rendition.mp4');
		const fractions: number[] = [];
		const started = performance.now();
		await makeRendition(clip('landscape.mp4'), output, {
			durationSeconds: source.durationSeconds,
			frameRate: source.video!.frameRate,
			onProgress: (fraction) => fractions.push(fraction)
		});
		timings.rendition720p6s = performance.now() - started;

		const result = await probeFile(output);
		expect(Math.abs(result.durationSeconds - source.durationSeconds)).toBeLessThanOrEqual(FRAME);
		expect(result.video).toMatchObject({
			codec: 'h264',
			width: 1280,
			height: 720,
			rotation: 0,
			frameRate: 30,
			pixelFormat: 'yuv420p'
		});
		expect(result.audio).toMatchObject({ codec: 'aac', channels: 2 });

		const keyframes = (
			await ffprobeCsv(
				'-select_streams',
				'v:0',
				'-skip_frame',
				'nokey',
				'-show_entries',
				'frame=pts_time',
				output
			)
		).map(Number);
		expect(keyframes.length).toBe(6);
		keyframes.forEach((time, i) => expect(Math.abs(time - i)).toBeLessThanOrEqual(FRAME));

		const boxes = await topLevelBoxes(output);
		expect(boxes).toContain('moov');
		expect(boxes.indexOf('moov')).toBeLessThan(boxes.indexOf('mdat'));

		expect(fractions.length).toBeGreaterThan(0);
		expect(fractions.at(-1)).toBe(1);
		expect([...fractions].sort((a, b) => a - b)).toEqual(fractions);
	});

	it('turns a rotated recording upright and leaves no rotation behind', async () => {
		const output = clip('out/portrait-rendition.mp4');
		await makeRendition(clip('portrait.mp4'), output, { durationSeconds: 2 });
		const result = await probeFile(output);
		expect(result.video).toMatchObject({ width: 360, height: 640, rotation: 0 });
		expect(result.audio).toBeNull();
		expect(Math.abs(result.durationSeconds - 2)).toBeLessThanOrEqual(FRAME);
	});

	it('fits a large portrait picture into 720 × 1280, caps 120 fps at 60, turns WebM into MP4', async () => {
		await ffmpeg(
			'-f',
			'lavfi',
			'-i',
			'testsrc2=size=1080x1920:rate=60:duration=0.5',
			'-c:v',
			'libx264',
			'-preset',
			'ultrafast',
			clip('tall.mp4')
		);
		await makeRendition(clip('tall.mp4'), clip('out/tall.mp4'), { durationSeconds: 0.5 });
		expect((await probeFile(clip('out/tall.mp4'))).video).toMatchObject({
			width: 720,
			height: 1280,
			frameRate: 60
		});

		await ffmpeg(
			'-f',
			'lavfi',
			'-i',
			'testsrc2=size=160x120:rate=120:duration=0.5',
			'-c:v',
			'libx264',
			'-preset',
			'ultrafast',
			clip('fast-motion.mp4')
		);
		await makeRendition(clip('fast-motion.mp4'), clip('out/fast-motion.mp4'), {
			durationSeconds: 0.5
		});
		expect((await probeFile(clip('out/fast-motion.mp4'))).video).toMatchObject({
			width: 160,
			height: 120,
			frameRate: 60
		});

		await makeRendition(clip('clip.webm'), clip('out/webm.mp4'), { durationSeconds: 2 });
		const webm = await probeFile(clip('out/webm.mp4'));
		expect(webm.formatName).toBe('mov,mp4,m4a,3gp,3g2,mj2');
		expect(webm.video).toMatchObject({ codec: 'h264', width: 320, height: 240 });
		expect(webm.audio?.codec).toBe('aac');
	});

	it('is killed when it passes its time limit, and leaves no output', async () => {
		const output = clip('out/timed-out.mp4');
		const started = performance.now();
		const error = await makeRendition(clip('landscape.mp4'), output, {
			durationSeconds: 6,
			frameRate: 30,
			timeoutSeconds: 0.3
		}).catch((e: unknown) => e);
		timings.timeoutStop = performance.now() - started;
		expect(error).toBeInstanceOf(MediaError);
		expect((error as MediaError).kind).toBe('timeout');
		await expect(stat(output)).rejects.toThrow();
	});

	it('stops when its signal is aborted', async () => {
		const controller = new AbortController();
		const output = clip('out/cancelled.mp4');
		setTimeout(() => controller.abort(), 300);
		const error = await makeRendition(clip('landscape.mp4'), output, {
			durationSeconds: 6,
			frameRate: 30,
			signal: controller.signal
		}).catch((e: unknown) => e);
		expect(error).toBeInstanceOf(MediaError);
		expect((error as MediaError).kind).toBe('aborted');
		await expect(stat(output)).rejects.toThrow();

		await expect(
			makeRendition(clip('landscape.mp4'), output, {
				durationSeconds: 6,
				signal: controller.signal
			})
		).rejects.toMatchObject({ kind: 'aborted' });
	});
});

describe('runFfmpeg', () => {
	it('ends the run with the error a progress callback throws', async () => {
		const output = clip('out/callback-error.mp4');
		await expect(
			makeRendition(clip('landscape.mp4'), output, {
				durationSeconds: 6,
				frameRate: 30,
				onProgress: () => {
					throw new Error('progress store is gone');
				}
			})
		).rejects.toThrow('progress store is gone');
		await expect(stat(output)).rejects.toThrow();
	});

	it('refuses network inputs', async () => {
		// A playlist is a local file that points elsewhere: the whitelist must stop it there.
		await writeFile(
			clip('list.m3u8'),
			'#EXTM3U\n#EXT-X-TARGETDURATION:1\n#EXTINF:1,\nhttp://127.0.0.1:9/segment.ts\n#EXT-X-ENDLIST\n'
		);
		const error = await runFfmpeg(['-i', clip('list.m3u8'), '-f', 'null', '-'], {
			timeoutSeconds: 10
		}).catch((e: unknown) => e);
		expect(error).toBeInstanceOf(MediaError);
		expect((error as MediaError).detail).toMatch(/Protocol 'http' not on whitelist 'file,pipe'/);
	});

	it('refuses a URL as input unless the caller names the network whitelist for it', async () => {
		// Only cutSegment passes STORAGE_URL_WHITELIST, for a presigned URL it was given; any other
		// `-i` gets the local one (the cut jobs' reads from storage are tested in segments-confirm).
		const error = await runFfmpeg(['-i', 'http://127.0.0.1:9/rendition.mp4', '-f', 'null', '-'], {
			timeoutSeconds: 10
		}).catch((e: unknown) => e);
		expect(error).toBeInstanceOf(MediaError);
		expect((error as MediaError).detail).toMatch(/Protocol 'http' not on whitelist 'file,pipe'/);
	});
});

describe('makePosters', () => {
	it('takes three stills at 10%, 50% and 90%, at most 1280 wide', async () => {
		expect(posterFractions(3)).toEqual([0.1, 0.5, 0.9]);
		const started = performance.now();
		const paths = await makePosters(clip('landscape.mp4'), clip('out/posters'), {
			durationSeconds: 6
		});
		timings.posters3 = performance.now() - started;
		expect(paths).toEqual([1, 2, 3].map((n) => clip(`out/posters/${n}.jpg`)));
		for (const path of paths) {
			expect((await probeFile(path)).video).toMatchObject({
				codec: 'mjpeg',
				width: 1280,
				height: 720
			});
		}
		const [first, second] = await Promise.all(paths.slice(0, 2).map((p) => readFile(p)));
		expect(first.equals(second)).toBe(false);
	});

	it('fits phone posters in the smallest version’s box, upright or wide, a fraction of the bytes', async () => {
		const wide = await makePosters(clip('landscape.mp4'), clip('out/phone-posters'), {
			durationSeconds: 6,
			count: 1,
			...PHONE_POSTER
		});
		expect((await probeFile(wide[0])).video).toMatchObject({ width: 640, height: 360 });
		// The same moment as a full-size still.
		const [full] = await makePosters(clip('landscape.mp4'), clip('out/full-poster'), {
			durationSeconds: 6,
			count: 1
		});
		expect((await stat(wide[0])).size).toBeLessThan((await stat(full)).size / 2);
		const upright = await makePosters(clip('portrait.mp4'), clip('out/phone-portrait'), {
			durationSeconds: 2,
			count: 1,
			...PHONE_POSTER
		});
		expect((await probeFile(upright[0])).video).toMatchObject({ width: 360, height: 640 });
	});

	it('keeps portrait stills upright', async () => {
		const paths = await makePosters(clip('portrait.mp4'), clip('out/portrait-posters'), {
			durationSeconds: 2,
			count: 1
		});
		expect(paths).toHaveLength(1);
		expect((await probeFile(paths[0])).video).toMatchObject({ width: 360, height: 640 });
	});
});

describe('makeSprite', () => {
	it('lays one tile per second out in a single sheet', async () => {
		const output = clip('out/sprite.jpg');
		const started = performance.now();
		const layout = await makeSprite(clip('landscape.mp4'), output, { durationSeconds: 6 });
		timings.sprite = performance.now() - started;
		expect(layout).toEqual({
			columns: 6,
			rows: 1,
			intervalSeconds: 1,
			tileWidth: 160,
			tileHeight: 90,
			count: 6
		});
		expect((await probeFile(output)).video).toMatchObject({ width: 960, height: 90 });
	});

	it('reads only the keyframes of a rendition and gets the same sheet', async () => {
		// Made by the makeRendition test above: a keyframe every second.
		const rendition = clip('out/landscape-rendition.mp4');
		const started = performance.now();
		const layout = await makeSprite(rendition, clip('out/sprite-keyframes.jpg'), {
			durationSeconds: 6,
			keyframesOnly: true
		});
		timings.spriteKeyframes = performance.now() - started;
		expect(layout).toMatchObject({ columns: 6, rows: 1, count: 6, intervalSeconds: 1 });
	});

	it('wraps into rows and keeps at most about 100 tiles', async () => {
		const layout = await makeSprite(clip('landscape.mp4'), clip('out/sprite-rows.jpg'), {
			durationSeconds: 6,
			intervalSeconds: 0.5,
			tileWidth: 120
		});
		expect(layout).toMatchObject({
			columns: 10,
			rows: 2,
			count: 12,
			tileWidth: 120,
			tileHeight: 68
		});
		expect((await probeFile(clip('out/sprite-rows.jpg'))).video).toMatchObject({
			width: 1200,
			height: 136
		});
	});
});

describe('makeWaveform', () => {
	it('has duration × peaksPerSecond peaks, with the silent second near zero', async () => {
		const started = performance.now();
		const { peaksPerSecond, peaks } = await makeWaveform(clip('landscape.mp4'));
		timings.waveform = performance.now() - started;
		expect(peaksPerSecond).toBe(20);
		expect(Math.abs(peaks.length - 6 * 20)).toBeLessThanOrEqual(2);
		expect(peaks.every((p) => p >= 0 && p <= 1)).toBe(true);
		// lavfi's sine source plays at 1/8 of full scale.
		const loud = [...peaks.slice(2, 38), ...peaks.slice(62, 118)];
		expect(Math.min(...loud)).toBeGreaterThan(0.08);
		expect(Math.max(...loud)).toBeLessThan(0.2);
		expect(Math.max(...peaks.slice(42, 58))).toBeLessThan(0.01);
	});

	it('has no peaks for a recording without sound', async () => {
		expect(await makeWaveform(clip('portrait.mp4'), { peaksPerSecond: 10 })).toEqual({
			peaksPerSecond: 10,
			peaks: []
		});
	});
});
