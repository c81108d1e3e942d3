import { and, eq, inArray, lt, sql } from 'drizzle-orm';
import { db } from '../db';
import { jobs, type Job, type JobKind, type JobStatus } from '../db/schema';

type Tx = Parameters<Parameters<ReturnType<typeof db>['transaction']>[0]>[0];

/** Queues a job, inside the caller's transaction when given one (so it lands with its record). */
export function enqueue(
	input: { kind: JobKind; recordingId: string; segmentId?: string; maxAttempts?: number },
	tx: Tx | ReturnType<typeof db> = db()
): Job {
	return tx
		.insert(jobs)
		.values({
			kind: input.kind,
			recordingId: input.recordingId,
			segmentId: input.segmentId ?? null,
			maxAttempts: input.maxAttempts ?? 3
		})
		.returning()
		.get();
}

/**
 * Queues work that must be done once whoever asks for it: the one job with `uniqueKey`, queued
 * now unless a process (this one or another) already queued it. Answers that job, new or not.
 */
export function enqueueOnce(
	input: { kind: JobKind; recordingId: string; uniqueKey: string; maxAttempts?: number },
	tx: Tx | ReturnType<typeof db> = db()
): Job {
	tx.insert(jobs)
		.values({
			kind: input.kind,
			recordingId: input.recordingId,
			uniqueKey: input.uniqueKey,
			maxAttempts: input.maxAttempts ?? 3
		})
		.onConflictDoNothing({ target: jobs.uniqueKey })
		.run();
	return tx.select().from(jobs).where(eq(jobs.uniqueKey, input.uniqueKey)).get()!;
}

/** The job queued with this unique key, or null. */
export function jobWithKey(uniqueKey: string): Job | null {
	return db().select().from(jobs).where(eq(jobs.uniqueKey, uniqueKey)).get() ?? null;
}

/**
 * Takes the oldest due job for `workerId`, or null. One UPDATE with the pick as a subquery, so two
 * workers (in one process or two) can never both take the same row.
 */
export function claim(workerId: string, now = new Date()): Job | null {
	const picked = sql`(select ${jobs.id} from ${jobs} where ${jobs.status} = 'queued' and ${jobs.runAfter} <= ${now.getTime()} order by ${jobs.runAfter}, ${jobs.createdAt} limit 1)`;
	const row = db()
		.update(jobs)
		.set({
			status: 'running',
			attempts: sql`${jobs.attempts} + 1`,
			lockedBy: workerId,
			heartbeatAt: now,
			stage: 'starting',
			progress: 0,
			cancelRequested: false
		})
		.where(and(eq(jobs.id, picked), eq(jobs.status, 'queued')))
		.returning()
		.get();
	return row ?? null;
}

/**
 * Marks a running job alive and records its progress. Answers whether the worker should stop:
 * a cancel was asked for, or the job is no longer its own (recovered elsewhere, deleted).
 */
export function heartbeat(
	jobId: string,
	workerId: string,
	report?: { stage: string; progress: number }
): { stop: boolean } {
	const row = db()
		.update(jobs)
		.set({
			heartbeatAt: new Date(),
			...(report
				? { stage: report.stage, progress: Math.max(0, Math.min(1, report.progress)) }
				: {})
		})
		.where(and(eq(jobs.id, jobId), eq(jobs.lockedBy, workerId), eq(jobs.status, 'running')))
		.returning({ cancelRequested: jobs.cancelRequested })
		.get();
	return { stop: !row || row.cancelRequested };
}

function finishWhere(jobId: string, workerId: string) {
	return and(eq(jobs.id, jobId), eq(jobs.lockedBy, workerId), eq(jobs.status, 'running'));
}

export function succeed(jobId: string, workerId: string): void {
	db()
		.update(jobs)
		.set({
			status: 'succeeded',
			progress: 1,
			stage: 'done',
			lockedBy: null,
			finishedAt: new Date()
		})
		.where(finishWhere(jobId, workerId))
		.run();
}

/** Seconds to wait before attempt `attempt + 1`: base × 4^(attempt − 1). */
export function backoffSeconds(attempt: number, baseSeconds: number): number {
	return baseSeconds * 4 ** Math.max(0, attempt - 1);
}

/**
 * Records a failed attempt: queued again after a back-off while attempts remain, otherwise failed
 * for good. Answers which it was.
 */
export function failAttempt(
	job: Job,
	workerId: string,
	message: string,
	baseSeconds: number
): 'retrying' | 'failed' {
	const final = job.attempts >= job.maxAttempts;
	db()
		.update(jobs)
		.set(
			final
				? { status: 'failed', lastError: message, lockedBy: null, finishedAt: new Date() }
				: {
						status: 'queued',
						lastError: message,
						lockedBy: null,
						heartbeatAt: null,
						stage: 'waiting to retry',
						runAfter: new Date(Date.now() + backoffSeconds(job.attempts, baseSeconds) * 1000)
					}
		)
		.where(finishWhere(job.id, workerId))
		.run();
	return final ? 'failed' : 'retrying';
}

export function markCancelled(jobId: string, workerId: string): void {
	db()
		.update(jobs)
		.set({ status: 'cancelled', lockedBy: null, stage: 'cancelled', finishedAt: new Date() })
		.where(finishWhere(jobId, workerId))
		.run();
}

/** Queues a job again without counting the attempt its worker was on. */
function handBack(
	jobId: string,
	workerId: string,
	how: Pick<typeof jobs.$inferInsert, 'stage' | 'lastError' | 'runAfter'>
): void {
	db()
		.update(jobs)
		.set({
			status: 'queued',
			attempts: sql`max(${jobs.attempts} - 1, 0)`,
			lockedBy: null,
			heartbeatAt: null,
			...how
		})
		.where(finishWhere(jobId, workerId))
		.run();
}

/** Hands a job back untouched (its worker is shutting down): the attempt does not count. */
export function release(jobId: string, workerId: string): void {
	handBack(jobId, workerId, { stage: 'waiting' });
}

/** How long a job waits for storage to answer again before its next try (our choice). */
export const STORAGE_WAIT_SECONDS = 30;

/**
 * Hands a job back because storage could not be reached: queued again after a short wait, the
 * attempt not counted (an outage is nobody's fault and may last), its reason kept for the page.
 */
export function waitForStorage(jobId: string, workerId: string, message: string): void {
	handBack(jobId, workerId, {
		stage: 'waiting for storage',
		lastError: message,
		runAfter: new Date(Date.now() + STORAGE_WAIT_SECONDS * 1000)
	});
}

/**
 * Cancels a job: a queued one at once, a running one at its worker's next heartbeat (which aborts
 * its ffmpeg). Answers false when there was nothing to cancel.
 */
export function cancel(jobId: string): boolean {
	const queued = db()
		.update(jobs)
		.set({ status: 'cancelled', stage: 'cancelled', finishedAt: new Date() })
		.where(and(eq(jobs.id, jobId), eq(jobs.status, 'queued')))
		.run();
	if (queued.changes > 0) return true;
	const running = db()
		.update(jobs)
		.set({ cancelRequested: true })
		.where(and(eq(jobs.id, jobId), eq(jobs.status, 'running')))
		.run();
	return running.changes > 0;
}

/**
 * Puts a finished job back in the queue with fresh attempts: by default a failed or cancelled one.
 * One UPDATE, so when several processes try at once only one of them puts it back.
 */
export function requeue(
	jobId: string,
	from: readonly JobStatus[] = ['failed', 'cancelled']
): boolean {
	const result = db()
		.update(jobs)
		.set({
			status: 'queued',
			attempts: 0,
			runAfter: new Date(),
			progress: 0,
			stage: 'waiting',
			lastError: null,
			lockedBy: null,
			heartbeatAt: null,
			cancelRequested: false,
			finishedAt: null
		})
		.where(and(eq(jobs.id, jobId), inArray(jobs.status, [...from])))
		.run();
	return result.changes > 0;
}

/**
 * Queues again every running job whose heartbeat is older than `staleSeconds`: its worker died
 * with the process. The interrupted attempt does not count against the job.
 */
export function recoverStale(staleSeconds: number, now = new Date()): number {
	const cutoff = new Date(now.getTime() - staleSeconds * 1000);
	const result = db()
		.update(jobs)
		.set({
			status: 'queued',
			attempts: sql`max(${jobs.attempts} - 1, 0)`,
			lockedBy: null,
			heartbeatAt: null,
			stage: 'waiting',
			runAfter: now
		})
		.where(and(eq(jobs.status, 'running'), lt(jobs.heartbeatAt, cutoff)))
		.run();
	return result.changes;
}

/**
 * The newest job of one kind for a recording, for its page. Processing is the default kind, so a
 * recording's status never shows (or retries, or cancels) one of its segments' cuts.
 */
export function latestJobFor(recordingId: string, kind: JobKind = 'process-recording'): Job | null {
	return (
		db()
			.select()
			.from(jobs)
			.where(and(eq(jobs.recordingId, recordingId), eq(jobs.kind, kind)))
			.orderBy(sql`${jobs.createdAt} desc`)
			.limit(1)
			.get() ?? null
	);
}

/** The newest job of each of these segments, by segment id. */
export function latestSegmentJobs(segmentIds: readonly string[]): Map<string, Job> {
	const latest = new Map<string, Job>();
	if (segmentIds.length === 0) return latest;
	const rows = db()
		.select()
		.from(jobs)
		.where(and(eq(jobs.kind, 'cut-segment'), inArray(jobs.segmentId, [...segmentIds])))
		.orderBy(sql`${jobs.createdAt} asc`)
		.all();
	for (const row of rows) if (row.segmentId) latest.set(row.segmentId, row);
	return latest;
}
