import { fakesDirectory } from './env';
import { chmod, mkdtemp, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { describe, expect, it, vi } from 'vitest';

/*
 * Which ffmpeg runs, on this machine: the choice itself is tested in src/lib/server/media/tools.test.ts;
 * here the runner's wiring (settings, the version line) and the admin-only health report.
 */

type HealthGet = (typeof import('../../src/routes/api/health/+server'))['GET'];

/** Calls the health endpoint as `role` (or signed out). */
async function health(GET: HealthGet, role: string | null): Promise<Record<string, unknown>> {
	const event = { locals: { user: role ? { role } : null } } as unknown as Parameters<HealthGet>[0];
	const response = await GET(event);
	return (await response.json()) as Record<string, unknown>;
}

/** Runs `fn` with one tool setting changed, then puts it back. */
async function withSetting<T>(
	name: 'FFMPEG_PATH' | 'FFPROBE_PATH',
	value: string,
	fn: () => Promise<T>
): Promise<T> {
	const saved = process.env[name];
	process.env[name] = value;
	try {
		return await fn();
	} finally {
		if (saved === undefined) delete process.env[name];
		else process.env[name] = saved;
	}
}

/** A fresh copy of the runner, so it reads the settings (and chooses) again. */
async function freshRunner() {
	vi.resetModules();
	return import('$lib/server/media/ffmpeg');
}

describe('the media tools this process runs', () => {
	it('reports the chosen ffmpeg and ffprobe with their version lines', async () => {
		const runner = await freshRunner();
		const ffmpeg = await runner.mediaToolReport('ffmpeg');
		expect(ffmpeg).toMatchObject({ ok: true, path: runner.ffmpegPath() });
		expect(ffmpeg.detail).toMatch(/^ffmpeg version \S+/);
		expect(ffmpeg.detail).not.toContain('Copyright');
		const ffprobe = await runner.mediaToolReport('ffprobe');
		expect(ffprobe).toMatchObject({ ok: true, path: runner.ffprobePath() });
		expect(ffprobe.detail).toMatch(/^ffprobe version \S+/);
	});

	it('runs FFMPEG_PATH when it is set, and says so', async () => {
		const dir = await mkdtemp(join(fakesDirectory, 'tools-'));
		const fake = join(dir, 'ffmpeg');
		await writeFile(
			fake,
			'#!/bin/sh\necho "ffmpeg version 9.9-kinelume-test Copyright (c) nobody"\n'
		);
		await chmod(fake, 0o755);
		const report = await withSetting('FFMPEG_PATH', fake, async () =>
			(await freshRunner()).mediaToolReport('ffmpeg')
		);
		expect(report).toEqual({
			ok: true,
			path: fake,
			source: 'setting',
			detail: 'ffmpeg version 9.9-kinelume-test'
		});
	});

	it('says in words when the set tool cannot be run, instead of running another', async () => {
		const dir = await mkdtemp(join(fakesDirectory, 'tools-'));
		const notRunnable = join(dir, 'ffprobe');
		await writeFile(notRunnable, 'not a program');
		await chmod(notRunnable, 0o644);
		const report = await withSetting('FFPROBE_PATH', notRunnable, async () =>
			(await freshRunner()).mediaToolReport('ffprobe')
		);
		expect(report.ok).toBe(false);
		expect(report.detail).toContain(`${notRunnable} cannot be run by this user`);
		expect(report.detail).toContain('FFPROBE_PATH');
	});
});

describe('/api/health', () => {
	it('tells the public only up or down, and an admin which ffmpeg runs', async () => {
		vi.resetModules();
		const { GET } = await import('../../src/routes/api/health/+server');
		const { ffmpegPath, ffprobePath } = await import('$lib/server/media/ffmpeg');
		expect(await health(GET, null)).toEqual({ status: 'ok' });
		expect(await health(GET, 'clinician')).toEqual({ status: 'ok' });
		const admin = await health(GET, 'admin');
		expect(admin.ffmpeg).toMatchObject({ ok: true, path: ffmpegPath() });
		expect(admin.ffprobe).toMatchObject({ ok: true, path: ffprobePath() });
		expect(['setting', 'system', 'bundled']).toContain((admin.ffmpeg as { source: string }).source);
	});
});

describe('runFfmpeg with an input', () => {
	const frame = Buffer.alloc(16 * 16 * 4, 128);
	/** `count` grey 16 × 16 RGBA frames; throws instead of drawing frame `failAt`. */
	async function* frames(count: number, failAt = -1) {
		for (let i = 0; i < count; i++) {
			if (i === failAt) throw new Error('the drawing failed');
			yield frame;
		}
	}
	// framemd5 prints one line per frame it read, after its # header lines.
	const args = ['-f', 'rawvideo', '-pix_fmt', 'rgba', '-s', '16x16', '-r', '10', '-i', 'pipe:0'];
	const md5 = [...args, '-f', 'framemd5', '-'];

	it('feeds every frame to ffmpeg through stdin', async () => {
		const { runFfmpeg } = await freshRunner();
		const { stdout } = await runFfmpeg(md5, { input: frames(5), slot: false });
		const lines = stdout.split('\n').filter((line) => line !== '' && !line.startsWith('#'));
		expect(lines).toHaveLength(5);
	});

	it('stops the run with the input’s own error when the input throws', async () => {
		const { runFfmpeg } = await freshRunner();
		await expect(runFfmpeg(md5, { input: frames(5, 2), slot: false })).rejects.toThrow(
			'the drawing failed'
		);
	});
});
