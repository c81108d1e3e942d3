import { fakesDirectory } from './env';
import { execFileSync } from 'node:child_process';
import { createHash, randomBytes } from 'node:crypto';
import { mkdtemp, readFile, rm, stat, truncate, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeClip } from './recordings-support';
import { waitFor } from './waiting';

// A database of this file's own, chosen before any app module reads the configuration.
process.env.DATABASE_PATH = join(fakesDirectory, `recordings-${process.pid}.db`);
process.env.JOB_RETRY_BASE_SECONDS = '0';

const { db, schema } = await import('$lib/server/db');
const { eq } = await import('drizzle-orm');
const uploads = await import('$lib/server/recordings/uploads');
const recordings = await import('$lib/server/recordings');
const queue = await import('$lib/server/jobs/queue');
const { startWorker } = await import('$lib/server/jobs/sqlite');
const { HANDLERS } = await import('$lib/server/jobs');
const { detectionKey } = await import('$lib/server/segments/detection');
const { getObjectStream, headObject, storage, bucketName } = await import('$lib/server/storage');
const { recordingKeys } = await import('$lib/server/storage/keys');
const multipart = await import('$lib/server/storage/multipart');
const { ListObjectsCommand } = await import('@aws-sdk/client-s3');
const { makeClinic, makeRecording, makeStaff } = await import('./factories');
const { sendThroughPresignedParts, uploadFile } = await import('./media-support');

const MiB = 1024 * 1024;
let dir: string;
type Staff = import('./factories').Staff;
let owner: Staff;
/** Another clinician of the same clinic, and one of another clinic. */
let colleague: Staff;
let otherClinic: Staff;

function sha256(data: Uint8Array): string {
	return createHash('sha256').update(data).digest('hex');
}

async function storedKeys(prefix: string): Promise<string[]> {
	const page = await storage().send(
		new ListObjectsCommand({ Bucket: bucketName(), Prefix: prefix })
	);
	return (page.Contents ?? []).flatMap((o) => (o.Key ? [o.Key] : []));
}

async function clinicObjects(): Promise<string[]> {
	return storedKeys(`clinics/${owner.clinicId}/`);
}

async function openUploadsInStorage(): Promise<number> {
	return (await multipart.listMultipartUploads(`clinics/${owner.clinicId}/`)).length;
}

/**
 * The job's final state. The handler marks the recording ready and then removes its scratch
 * folder, so on a loaded machine the recording can read ready while its job is still running.
 */
function jobFinished(recordingId: string) {
	return waitFor('the job to finish', () => {
		const job = queue.latestJobFor(recordingId);
		return job && job.status !== 'running' && job;
	});
}

beforeAll(async () => {
	dir = await mkdtemp(join(fakesDirectory, 'recordings-'));
	const clinicId = makeClinic('Test clinic').id;
	owner = makeStaff(clinicId);
	colleague = makeStaff(clinicId);
	otherClinic = makeStaff(makeClinic('Other clinic').id);
	await makeClip(join(dir, 'clip.mp4'), { seconds: 4 });
	await makeClip(join(dir, 'long.mp4'), { seconds: 30, size: '1280x720' });
}, 120_000);

afterAll(async () => {
	await rm(dir, { recursive: true, force: true });
});

describe('multipart upload through presigned URLs', () => {
	it('stores the bytes exactly (SHA-256 on read-back) and resumes without the stored parts', async () => {
		const bytes = new Uint8Array(randomBytes(17 * MiB + 12345));
		const session = await uploads.createUpload(owner, {
			filename: 'big.mp4',
			contentType: 'video/mp4',
			sizeBytes: bytes.length
		});
		expect(session.partSize).toBe(5 * MiB);
		expect(session.partCount).toBe(4);
		expect(session.resumed).toBe(false);

		await sendThroughPresignedParts(owner, session, bytes, [2, 3, 4]);
		const half = await uploads.uploadState(owner, session.id);
		expect(half.parts.map((p) => p.partNumber)).toEqual([1]);
		await sendThroughPresignedParts(owner, session, bytes, [1]);
		const full = await uploads.uploadState(owner, session.id);
		expect(full.parts.map((p) => p.size)).toEqual([
			5 * MiB,
			5 * MiB,
			5 * MiB,
			bytes.length - 15 * MiB
		]);

		const upload = uploads.findUpload(owner, session.id);
		await multipart.completeMultipartUpload(upload.objectKey, upload.s3UploadId, full.parts);
		const object = await getObjectStream(upload.objectKey);
		const hash = createHash('sha256');
		for await (const chunk of object!.body) hash.update(chunk as Buffer);
		expect(hash.digest('hex')).toBe(sha256(bytes));

		await storage().send(
			new (await import('@aws-sdk/client-s3')).DeleteObjectCommand({
				Bucket: bucketName(),
				Key: upload.objectKey
			})
		);
		db().delete(schema.uploads).where(eq(schema.uploads.id, session.id)).run();
	});

	it('chooses parts of at least 5 MiB (S3’s minimum) and never more than 10 000 of them', () => {
		expect(multipart.choosePartSize(1)).toBe(5 * MiB);
		const size = 2 * 1024 ** 3;
		const part = multipart.choosePartSize(size);
		expect(part).toBeGreaterThanOrEqual(5 * MiB);
		expect(multipart.partCount(size, part)).toBeLessThanOrEqual(10_000);
		expect(
			multipart.partCount(200_000 * MiB, multipart.choosePartSize(200_000 * MiB))
		).toBeLessThanOrEqual(10_000);
	});

	it('finds the same file’s unfinished upload again — its owner only — and says how much is stored', async () => {
		const print = 'ab'.repeat(32);
		const declared = {
			filename: 'Knee bends.mp4',
			contentType: 'video/mp4',
			sizeBytes: 11 * MiB,
			fingerprint: print
		};
		const bytes = new Uint8Array(randomBytes(declared.sizeBytes));
		const first = await uploads.createUpload(owner, declared);
		await sendThroughPresignedParts(owner, first, bytes, [2, 3]);

		// The same file chosen again (another browser: only name, size and fingerprint in common).
		const again = await uploads.createUpload(owner, { ...declared, contentType: '' });
		expect(again.resumed).toBe(true);
		expect(again.id).toBe(first.id);
		expect(again.parts.map((p) => [p.partNumber, p.size])).toEqual([[1, 5 * MiB]]);

		// Anything else is another file: a new upload each time.
		const others = await Promise.all([
			uploads.createUpload(owner, { ...declared, fingerprint: 'cd'.repeat(32) }),
			uploads.createUpload(owner, { ...declared, filename: 'Knee bends (2).mp4' }),
			uploads.createUpload(owner, { ...declared, sizeBytes: declared.sizeBytes + 1 }),
			uploads.createUpload(owner, { ...declared, fingerprint: null }),
			uploads.createUpload(colleague, declared),
			uploads.createUpload(otherClinic, declared)
		]);
		for (const other of others) {
			expect(other.resumed).toBe(false);
			expect(other.id).not.toBe(first.id);
		}
		// A fingerprint that is not one is not looked up (the endpoint refuses it with a 400).
		expect((await uploads.createUpload(owner, { ...declared, fingerprint: 'x' })).resumed).toBe(
			false
		);

		const listed = await uploads.listOpenUploads(owner);
		const mine = listed.find((u) => u.id === first.id);
		expect(mine).toMatchObject({ storedBytes: 5 * MiB, storedParts: 1, sizeBytes: 11 * MiB });
		// Only the caller's own: not a colleague's, not another clinic's.
		const colleagues = await uploads.listOpenUploads(colleague);
		expect(colleagues.map((u) => u.id)).toEqual([others[4].id]);
		expect(listed.map((u) => u.id)).not.toContain(others[4].id);
		expect(listed.map((u) => u.id)).not.toContain(others[5].id);

		// Storage forgot it (aborted elsewhere): dropped from the list, and not found again.
		const upload = uploads.findUpload(owner, first.id);
		await multipart.abortMultipartUpload(upload.objectKey, upload.s3UploadId);
		expect((await uploads.listOpenUploads(owner)).map((u) => u.id)).not.toContain(first.id);
		const fresh = await uploads.createUpload(owner, declared);
		expect(fresh.resumed).toBe(false);

		for (const who of [owner, colleague, otherClinic])
			for (const u of await uploads.listOpenUploads(who)) await uploads.abortUpload(who, u.id);
		expect(db().select().from(schema.uploads).all()).toEqual([]);
	});

	it('aborts an upload and frees its parts', async () => {
		const session = await uploads.createUpload(owner, {
			filename: 'gone.mov',
			contentType: '',
			sizeBytes: 1000
		});
		await sendThroughPresignedParts(owner, session, new Uint8Array(1000));
		await uploads.abortUpload(owner, session.id);
		expect(await openUploadsInStorage()).toBe(0);
		expect(db().select().from(schema.uploads).all()).toEqual([]);
	});

	it('sweeps uploads idle for longer than the limit, with their parts', async () => {
		const session = await uploads.createUpload(owner, {
			filename: 'idle.mp4',
			contentType: 'video/mp4',
			sizeBytes: 500
		});
		await sendThroughPresignedParts(owner, session, new Uint8Array(500));
		const later = new Date(Date.now() + 25 * 3600 * 1000);
		expect(await uploads.sweepUploads(later)).toBeGreaterThanOrEqual(1);
		expect(db().select().from(schema.uploads).all()).toEqual([]);
		expect(await openUploadsInStorage()).toBe(0);
	});
});

describe('refusals leave nothing behind', () => {
	async function expectRefused(path: string, filename: string, pattern: RegExp) {
		const session = await uploadFile(owner, path, filename);
		await expect(uploads.completeUpload(owner, session.id)).rejects.toMatchObject({
			status: 422,
			message: expect.stringMatching(pattern)
		});
		expect(await clinicObjects()).toEqual([]);
		expect(await openUploadsInStorage()).toBe(0);
		expect(db().select().from(schema.uploads).all()).toEqual([]);
		expect(db().select().from(schema.recordings).all()).toEqual([]);
		expect(db().select().from(schema.jobs).all()).toEqual([]);
	}

	it('refuses a text file renamed .mp4', async () => {
		await writeFile(join(dir, 'notes.mp4'), 'Knee flexion: 3 sets of 10.\n'.repeat(200));
		await expectRefused(
			join(dir, 'notes.mp4'),
			'notes.mp4',
			/could not read|contents are something else/
		);
	});

	it('refuses a truncated MP4', async () => {
		const { size } = await stat(join(dir, 'clip.mp4'));
		await writeFile(join(dir, 'cut.mp4'), await readFile(join(dir, 'clip.mp4')));
		await truncate(join(dir, 'cut.mp4'), Math.floor(size / 2));
		await expectRefused(join(dir, 'cut.mp4'), 'cut.mp4', /could not read|no length|no picture/);
	});

	it('refuses a zero-byte file before anything is stored', async () => {
		await expect(
			uploads.createUpload(owner, { filename: 'empty.mp4', contentType: 'video/mp4', sizeBytes: 0 })
		).rejects.toMatchObject({ status: 422, message: expect.stringMatching(/empty/) });
		expect(await clinicObjects()).toEqual([]);
		expect(await openUploadsInStorage()).toBe(0);
		expect(db().select().from(schema.uploads).all()).toEqual([]);
	});

	it('keeps a session whose parts have not all arrived (409), so they can still be sent', async () => {
		const bytes = new Uint8Array(await readFile(join(dir, 'clip.mp4')));
		const session = await uploads.createUpload(owner, {
			filename: 'wait.mp4',
			contentType: 'video/mp4',
			sizeBytes: bytes.length
		});
		await expect(uploads.completeUpload(owner, session.id)).rejects.toMatchObject({ status: 409 });
		expect(uploads.findUpload(owner, session.id).id).toBe(session.id);
		await uploads.abortUpload(owner, session.id);
	});
});

describe('processing', () => {
	it('accepts a real clip and its job makes rendition, three posters, sprite and waveform', async () => {
		const session = await uploadFile(owner, join(dir, 'clip.mp4'), 'Heel slides.mp4');
		const recording = await uploads.completeUpload(owner, session.id);
		expect(recording.status).toBe('processing');
		expect(recording.durationSeconds).toBeCloseTo(4, 0);
		expect(recording.width).toBe(320);
		expect(recording.title).toBe('Heel slides');
		expect(db().select().from(schema.uploads).all()).toEqual([]);

		const worker = startWorker({
			handlers: HANDLERS,
			heartbeatSeconds: 0.2,
			pollMs: 100,
			log: () => {}
		});
		try {
			const ready = await waitFor('ready', () => {
				const r = recordings.findRecording(owner.clinicId, recording.id);
				return r?.status !== 'processing' && r;
			});
			expect(ready.failureReason).toBeNull();
			expect(ready.status).toBe('ready');
			expect(ready.posterCount).toBe(3);
			expect(ready.sprite?.count).toBeGreaterThan(0);
			const keys = recordingKeys(owner.clinicId, recording.id);
			const stored = await storedKeys(keys.prefix);
			expect(stored.sort()).toEqual(
				[
					keys.original,
					keys.rendition,
					keys.sprite,
					keys.waveform,
					keys.poster(0),
					keys.poster(1),
					keys.poster(2)
				].sort()
			);
			expect((await headObject(keys.rendition))?.contentLength).toBe(ready.renditionSize);
			const job = await jobFinished(recording.id);
			expect(job).toMatchObject({ status: 'succeeded', progress: 1, attempts: 1 });
			// The rendition's segment detection was queued with it, and the worker ran it.
			expect(queue.latestJobFor(recording.id, 'detect-signals')?.uniqueKey).toBe(
				detectionKey(ready)
			);
			const signals = await waitFor('the segment detectors’ result', () =>
				db()
					.select()
					.from(schema.recordingSignals)
					.where(eq(schema.recordingSignals.recordingId, recording.id))
					.get()
			);
			expect(signals.renditionReadyAt.getTime()).toBe(ready.readyAt?.getTime());
		} finally {
			await worker.stop();
		}

		await recordings.deleteRecording(recordings.findRecording(owner.clinicId, recording.id)!);
		expect(await clinicObjects()).toEqual([]);
		expect(db().select().from(schema.jobs).all()).toEqual([]);
	}, 120_000);

	it('retries a job whose ffmpeg is killed mid-run, and finishes', async () => {
		const session = await uploadFile(owner, join(dir, 'long.mp4'), 'long.mp4');
		const recording = await uploads.completeUpload(owner, session.id);
		const worker = startWorker({
			handlers: HANDLERS,
			heartbeatSeconds: 0.2,
			pollMs: 100,
			retryBaseSeconds: 0,
			log: () => {}
		});
		try {
			await waitFor('the rendition to start', () => {
				const job = queue.latestJobFor(recording.id);
				return job?.stage === 'rendition' && job.progress > 0.09 && job;
			});
			// The rendition's ffmpeg is this process's child, reading the job's scratch copy.
			const pids = execFileSync('pgrep', ['-f', 'kinelume-job-.*original'], { encoding: 'utf8' })
				.split('\n')
				.filter(Boolean)
				.map(Number)
				.filter((pid) => pid !== process.pid);
			expect(pids.length).toBeGreaterThan(0);
			for (const pid of pids) {
				try {
					process.kill(pid, 'SIGKILL');
				} catch {
					// Already gone.
				}
			}
			const ready = await waitFor(
				'ready after the retry',
				() => {
					const r = recordings.findRecording(owner.clinicId, recording.id);
					return r?.status !== 'processing' && r;
				},
				180_000
			);
			expect(ready.status).toBe('ready');
			const job = await jobFinished(recording.id);
			expect(job.status).toBe('succeeded');
			expect(job.attempts).toBe(2);
			expect(job.lastError).toBeTruthy();
		} finally {
			await worker.stop();
		}
		await recordings.deleteRecording(recordings.findRecording(owner.clinicId, recording.id)!);
	}, 240_000);

	it('queues a running job again when its heartbeat went stale (its process died)', () => {
		const recording = makeRecording(owner.clinicId, { title: 'Orphan', status: 'processing' });
		const job = queue.enqueue({ kind: 'process-recording', recordingId: recording.id });
		const claimed = queue.claim('dead-worker');
		expect(claimed?.id).toBe(job.id);
		expect(queue.claim('other-worker')).toBeNull();
		db()
			.update(schema.jobs)
			.set({ heartbeatAt: new Date(Date.now() - 120_000) })
			.where(eq(schema.jobs.id, job.id))
			.run();
		expect(queue.recoverStale(60)).toBe(1);
		const after = queue.latestJobFor(recording.id)!;
		expect(after).toMatchObject({ status: 'queued', lockedBy: null, attempts: 0 });
		expect(queue.claim('live-worker')?.lockedBy).toBe('live-worker');
		db().delete(schema.recordings).where(eq(schema.recordings.id, recording.id)).run();
	});

	it('cancels a queued job and re-queues it on retry', () => {
		const recording = makeRecording(owner.clinicId, { title: 'C', status: 'processing' });
		queue.enqueue({ kind: 'process-recording', recordingId: recording.id });
		expect(recordings.cancelProcessing(recording)).toBe(true);
		const cancelled = recordings.findRecording(owner.clinicId, recording.id)!;
		expect(cancelled.status).toBe('failed');
		expect(cancelled.failureReason).toMatch(/cancelled/);
		expect(recordings.retryProcessing(cancelled)).toBe(true);
		expect(queue.latestJobFor(recording.id)).toMatchObject({ status: 'queued', attempts: 0 });
		db().delete(schema.recordings).where(eq(schema.recordings.id, recording.id)).run();
	});
});
