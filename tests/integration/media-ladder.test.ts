import { execFile } from 'node:child_process';
import { mkdtemp, open, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { LADDER, planVersions } from '$lib/media/ladder';
import { cutSegment } from '$lib/server/media/cut';
import { ffmpegPath, ffprobePath } from '$lib/server/media/ffmpeg';
import { makeRendition, versionPath } from '$lib/server/media/outputs';
import { probeFile } from '$lib/server/media/probe';

/*
 * The bitrate ladder on real ffmpeg, with sources this file makes (lavfi patterns with noise, so
 * that an uncapped encoder would spend far more than any cap): every version is made, fits its
 * box without enlarging, stays within its cap, starts playing before it has downloaded (index
 * first) and has its keyframes at the same seconds as the others.
 */

const run = promisify(execFile);
let dir: string;
const at = (name: string) => join(dir, name);
const SECONDS = 10;

async function ffmpeg(...args: string[]): Promise<void> {
	await run(ffmpegPath(), ['-hide_banner', '-loglevel', 'error', '-y', ...args]);
}

async function ffprobeCsv(...args: string[]): Promise<string[]> {
	const { stdout } = await run(ffprobePath(), ['-v', 'error', ...args, '-of', 'csv=p=0']);
	return stdout
		.split(/[\n,]/)
		.map((s) => s.trim())
		.filter((s) => s !== '');
}

/** The video stream's own bitrate as ffprobe reports it, kbit/s. */
async function videoKbps(path: string): Promise<number> {
	const [rate] = await ffprobeCsv(
		'-select_streams',
		'v:0',
		'-show_entries',
		'stream=bit_rate',
		path
	);
	return Number(rate) / 1000;
}

async function keyframeTimes(path: string): Promise<number[]> {
	return (
		await ffprobeCsv(
			'-select_streams',
			'v:0',
			'-skip_frame',
			'nokey',
			'-show_entries',
			'frame=pts_time',
			path
		)
	).map(Number);
}

/** True when the MP4's index (moov) comes before its media data (mdat): fast start. */
async function fastStart(path: string): Promise<boolean> {
	const file = await open(path, 'r');
	try {
		const { size } = await file.stat();
		const header = Buffer.alloc(16);
		for (let offset = 0; offset + 8 <= size; ) {
			await file.read(header, 0, 16, offset);
			const type = header.toString('latin1', 4, 8);
			if (type === 'moov') return true;
			if (type === 'mdat') return false;
			let boxSize = header.readUInt32BE(0);
			if (boxSize === 1) boxSize = Number(header.readBigUInt64BE(8));
			offset += boxSize;
		}
		return false;
	} finally {
		await file.close();
	}
}

/**
 * VBV arithmetic: with a buffer of twice the cap, the encoder may spend up to the cap plus most
 * of a full buffer over a clip, so over 10 s the average can reach about 1.2 × the cap. Without a
 * cap these sources come out several times over it.
 */
const SLACK = 1.25;

async function expectVersion(path: string, width: number, height: number, capKbps: number) {
	const probe = await probeFile(path);
	expect(probe.video).toMatchObject({ codec: 'h264', width, height });
	expect(probe.audio).toMatchObject({ codec: 'aac' });
	expect(Math.abs(probe.durationSeconds - SECONDS)).toBeLessThanOrEqual(0.05);
	expect(await videoKbps(path)).toBeLessThanOrEqual(capKbps * SLACK);
	expect(await fastStart(path)).toBe(true);
	const keys = await keyframeTimes(path);
	expect(keys).toHaveLength(SECONDS);
	keys.forEach((time, i) => expect(Math.abs(time - i)).toBeLessThanOrEqual(1 / 30));
}

beforeAll(async () => {
	dir = await mkdtemp(join(tmpdir(), 'kinelume-ladder-'));
	for (const [name, size] of [
		['hd.mp4', '1920x1080'],
		['small.mp4', '640x360']
	]) {
		await ffmpeg(
			...['-f', 'lavfi', '-i', `testsrc2=size=${size}:rate=30:duration=${SECONDS}`],
			...['-f', 'lavfi', '-i', `sine=frequency=440:sample_rate=48000:duration=${SECONDS}`],
			...['-vf', 'noise=alls=40:allf=t', '-c:v', 'libx264', '-preset', 'ultrafast', '-crf', '8'],
			...['-pix_fmt', 'yuv420p', '-c:a', 'aac', at(name)]
		);
	}
}, 120_000);

afterAll(async () => {
	await rm(dir, { recursive: true, force: true });
});

describe('the ladder of a rendition', () => {
	it('makes 360p, 540p and 720p in one run, each capped, fast-start and keyframed alike', async () => {
		const output = at('out/rendition.mp4');
		const { smaller } = await makeRendition(at('hd.mp4'), output, {
			durationSeconds: SECONDS,
			frameRate: 30,
			versions: planVersions(1920, 1080)
		});
		expect(smaller).toEqual([
			{ short: 360, path: versionPath(output, 360) },
			{ short: 540, path: versionPath(output, 540) }
		]);
		const [low, middle, top] = LADDER;
		await expectVersion(smaller[0].path, 640, 360, low.videoKbps);
		await expectVersion(smaller[1].path, 960, 540, middle.videoKbps);
		await expectVersion(output, 1280, 720, top.videoKbps);
	}, 180_000);

	it('never enlarges: a 360p source gets one version at its own size', async () => {
		const output = at('out/small-rendition.mp4');
		const { smaller } = await makeRendition(at('small.mp4'), output, {
			durationSeconds: SECONDS,
			frameRate: 30,
			versions: planVersions(640, 360)
		});
		expect(smaller).toEqual([]);
		await expectVersion(output, 640, 360, LADDER[0].videoKbps);
	}, 120_000);
});

describe('the ladder of a segment cut', () => {
	it('cuts every version to the same length from the rendition', async () => {
		const source = at('out/rendition.mp4');
		const output = at('out/segment.mp4');
		// 10 s cut from a 10 s rendition: each version's length is checked by cutSegment itself.
		const { durationSeconds, smaller } = await cutSegment(source, output, {
			start: 0,
			end: SECONDS,
			versions: planVersions(1280, 720)
		});
		expect(Math.abs(durationSeconds - SECONDS)).toBeLessThanOrEqual(0.05);
		expect(smaller.map((v) => v.short)).toEqual([360, 540]);
		await expectVersion(smaller[0].path, 640, 360, LADDER[0].videoKbps);
		await expectVersion(smaller[1].path, 960, 540, LADDER[1].videoKbps);
		await expectVersion(output, 1280, 720, LADDER[2].videoKbps);
	}, 180_000);
});
