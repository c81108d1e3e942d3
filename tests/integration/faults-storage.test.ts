import { fakesDirectory, testEnv } from './env';
import { mkdtemp, rm } from 'node:fs/promises';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startStorageFake, type StorageFake } from '../../fakes/storage/server';
import { makeClip } from './recordings-support';
import getPort from 'get-port';

// Storage stopped while a recording is processed: the job waits for it without using up its
// attempts, the page's words say so, and once storage is back the recording is made in full.
// A storage fake of this file's own (the shared one serves the other files) and a database.

const port = await getPort({ host: '127.0.0.1' });
const storageDir = await mkdtemp(join(fakesDirectory, 'faults-storage-'));
const fakeOptions = {
	port,
	directory: storageDir,
	bucket: testEnv.S3_BUCKET,
	accessKeyId: testEnv.S3_ACCESS_KEY_ID,
	secretAccessKey: testEnv.S3_SECRET_ACCESS_KEY
};
let fake: StorageFake | undefined = await startStorageFake(fakeOptions);
process.env.S3_ENDPOINT = fake.url;
process.env.DATABASE_PATH = join(fakesDirectory, `faults-storage-${process.pid}.db`);

const { db, schema } = await import('$lib/server/db');
const { eq } = await import('drizzle-orm');
const uploads = await import('$lib/server/recordings/uploads');
const recordings = await import('$lib/server/recordings');
const queue = await import('$lib/server/jobs/queue');
const { startWorker } = await import('$lib/server/jobs/sqlite');
const { HANDLERS } = await import('$lib/server/jobs');
const { STAGE_LABEL } = await import('$lib/recordings/status');
const { makeClinic, makeStaff } = await import('./factories');
const { uploadFile } = await import('./media-support');

let owner: import('./factories').Staff;
let dir: string;

beforeAll(async () => {
	dir = await mkdtemp(join(fakesDirectory, 'faults-storage-clip-'));
	owner = makeStaff(makeClinic('Outage clinic').id, 'clinician', { name: 'Outage clinician' });
	await makeClip(join(dir, 'clip.mp4'));
});
afterAll(async () => {
	await fake?.close();
	await rm(dir, { recursive: true, force: true });
	await rm(storageDir, { recursive: true, force: true });
});

async function until<T>(what: string, check: () => T | null | undefined | false): Promise<T> {
	for (;;) {
		const value = check();
		if (value) return value;
		await new Promise((resolve) => setTimeout(resolve, 100));
	}
}

describe('storage stopped during processing', () => {
	it('waits for storage without using up attempts, then makes the recording in full', async () => {
		const session = await uploadFile(owner, join(dir, 'clip.mp4'), 'clip.mp4');
		const recording = await uploads.completeUpload(owner, session.id);

		// Storage goes away before the worker fetches the original.
		await fake!.close();
		fake = undefined;
		const worker = startWorker({
			handlers: HANDLERS,
			heartbeatSeconds: 0.2,
			pollMs: 100,
			retryBaseSeconds: 0,
			log: () => {}
		});
		try {
			const waiting = await until('the job to wait for storage', () => {
				const job = queue.latestJobFor(recording.id);
				return job?.stage === 'waiting for storage' && job.status === 'queued' && job;
			});
			// Not an attempt used up, and the page says so in words.
			expect(waiting.attempts).toBe(0);
			expect(waiting.lastError).toBeTruthy();
			expect(STAGE_LABEL[waiting.stage]).toMatch(/storage/i);
			expect(recordings.findRecording(owner.clinicId, recording.id)?.status).toBe('processing');

			// Storage is back (same data): the next try, once its wait is over, makes everything.
			fake = await startStorageFake(fakeOptions);
			// Its wait (30 s) cut short, so the test does not sit through it.
			db()
				.update(schema.jobs)
				.set({ runAfter: new Date() })
				.where(eq(schema.jobs.id, waiting.id))
				.run();
			const ready = await until('the recording to be ready', () => {
				const r = recordings.findRecording(owner.clinicId, recording.id);
				return r?.status !== 'processing' && r;
			});
			expect(ready.status).toBe('ready');
			const job = queue.latestJobFor(recording.id)!;
			expect(job.status).toBe('succeeded');
			expect(job.attempts).toBe(1);
		} finally {
			await worker.stop();
		}
	}, 120_000);
});
