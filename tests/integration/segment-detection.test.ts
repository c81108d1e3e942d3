import { fakesDirectory } from './env';
import { spawn } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { readFile, rm } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CLIP_FIGURES, FFMPEG, makeClip } from './recordings-support';

/*
 * Segment detection runs once per rendition whoever asks: app processes asking at the same
 * moment queue one `detect-signals` job between them, a worker runs it, and the askers only read
 * its result. The askers are real OS processes whose ffmpeg and ffprobe refuse to run (and say
 * so in a file); this process's worker runs the real ffmpeg through a wrapper that notes each run.
 */

const work = mkdtempSync(join(fakesDirectory, 'segment-detection-'));
const ffmpegRuns = join(work, 'ffmpeg-runs');
const forbiddenRuns = join(work, 'forbidden-runs');
const wrapper = join(work, 'ffmpeg');
writeFileSync(wrapper, `#!/bin/sh\necho "$*" >> '${ffmpegRuns}'\nexec '${FFMPEG}' "$@"\n`, {
	mode: 0o755
});
const forbidden = join(work, 'forbidden');
writeFileSync(forbidden, `#!/bin/sh\necho "$0 $*" >> '${forbiddenRuns}'\nexit 1\n`, {
	mode: 0o755
});

// A database of this file's own, and the noting ffmpeg, before any app module reads the configuration.
process.env.DATABASE_PATH = join(work, 'kinelume.db');
process.env.FFMPEG_PATH = wrapper;

const { db, schema } = await import('$lib/server/db');
const { and, eq } = await import('drizzle-orm');
const { startWorker } = await import('$lib/server/jobs/sqlite');
const { HANDLERS } = await import('$lib/server/jobs');
const segments = await import('$lib/server/segments');
const { detectionKey } = await import('$lib/server/segments/detection');
const { makeClinic, makeRecording } = await import('./factories');
const { storeMedia } = await import('./media-support');

type SuggestionsAnswer = import('$lib/server/segments').SuggestionsAnswer;

const TSX = resolve('node_modules/.bin/tsx');
const CHILD = resolve('tests/integration/suggest-child.ts');
let clinicId: string;

async function readLines(path: string): Promise<string[]> {
	const text = await readFile(path, 'utf8').catch(() => '');
	return text.split('\n').filter((line) => line.trim() !== '');
}

async function readyRecording(title: string) {
	const clip = join(work, `${title}.mp4`);
	await makeClip(clip, { seconds: 4 });
	const recording = makeRecording(clinicId, { ...CLIP_FIGURES, title });
	await storeMedia(recording, clip);
	return recording;
}

function ask(recordingId: string, startAt: number): Promise<SuggestionsAnswer> {
	return new Promise((done, fail) => {
		const child = spawn(TSX, [CHILD], {
			env: {
				...process.env,
				RECORDING_ID: recordingId,
				START_AT: String(startAt),
				WAIT_MS: '120000',
				FFMPEG_PATH: forbidden,
				FFPROBE_PATH: forbidden
			},
			stdio: ['ignore', 'pipe', 'pipe']
		});
		let stdout = '';
		let stderr = '';
		child.stdout.on('data', (chunk: Buffer) => (stdout += chunk.toString()));
		child.stderr.on('data', (chunk: Buffer) => (stderr += chunk.toString()));
		child.on('error', fail);
		child.on('close', (code) =>
			code === 0 ? done(JSON.parse(stdout)) : fail(new Error(`exit ${code}: ${stderr}`))
		);
	});
}

const detectionJobs = (recordingId: string) =>
	db()
		.select()
		.from(schema.jobs)
		.where(and(eq(schema.jobs.recordingId, recordingId), eq(schema.jobs.kind, 'detect-signals')))
		.all();

beforeAll(() => {
	clinicId = makeClinic('Detection test clinic').id;
});

afterAll(async () => {
	await rm(work, { recursive: true, force: true });
});

describe('segment detection', () => {
	it('runs once when two app processes ask at the same moment, in the worker, never in the askers', async () => {
		const recording = await readyRecording('Asked twice');
		const worker = startWorker({
			handlers: HANDLERS,
			heartbeatSeconds: 0.2,
			pollMs: 100,
			log: () => {}
		});
		try {
			const startAt = Date.now() + 4000;
			const [first, second] = await Promise.all([
				ask(recording.id, startAt),
				ask(recording.id, startAt)
			]);
			expect(first.state).toBe('ready');
			expect(second).toEqual(first);
			if (first.state === 'ready') expect(first.note).toBeNull();
		} finally {
			await worker.stop();
		}
		const jobs = detectionJobs(recording.id);
		expect(jobs).toHaveLength(1);
		expect(jobs[0]).toMatchObject({
			status: 'succeeded',
			attempts: 1,
			uniqueKey: detectionKey(recording)
		});
		// One detection: one silencedetect pass and one scene pass, both in this process's worker.
		const runs = await readLines(ffmpegRuns);
		expect(runs.filter((r) => r.includes('silencedetect'))).toHaveLength(1);
		expect(runs.filter((r) => r.includes('scene'))).toHaveLength(1);
		expect(runs).toHaveLength(2);
		expect(await readLines(forbiddenRuns)).toEqual([]);
		// Asked again: answered from the stored result, nothing queued or measured.
		const again = await segments.suggestionsFor(recording, { waitMs: 0 });
		expect(again.state).toBe('ready');
		expect(detectionJobs(recording.id)).toHaveLength(1);
		expect(await readLines(ffmpegRuns)).toHaveLength(2);
	}, 120_000);

	it('answers "working" while no worker has measured, queueing the detection once however often asked', async () => {
		const recording = await readyRecording('Nobody measuring');
		const answers = await Promise.all(
			[0, 300, 0].map((waitMs) => segments.suggestionsFor(recording, { waitMs, pollMs: 50 }))
		);
		expect(answers).toEqual(
			Array.from({ length: 3 }, () => ({ state: 'working', recordingId: recording.id }))
		);
		const jobs = detectionJobs(recording.id);
		expect(jobs.map((j) => [j.status, j.uniqueKey])).toEqual([['queued', detectionKey(recording)]]);
	});
});
