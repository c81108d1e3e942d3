import { and, asc, count, desc, eq, like, or, sql } from 'drizzle-orm';
import { db } from '../db';
import { jobs, recordings, type Job, type Recording, type RecordingStatus } from '../db/schema';
import * as queue from '../jobs/queue';
import { deletePrefix } from '../storage';
import { recordingKeys } from '../storage/keys';

export const SORTS = ['date', 'length', 'status', 'title'] as const;
export type RecordingSort = (typeof SORTS)[number];

export interface ListQuery {
	sort: RecordingSort;
	direction: 'asc' | 'desc';
	status: RecordingStatus | 'all';
	search: string;
	page: number;
	pageSize: number;
}

const SORT_COLUMNS = {
	date: recordings.createdAt,
	length: recordings.durationSeconds,
	status: recordings.status,
	title: recordings.title
} as const;

/** One page of a clinic's recordings, sorted and filtered in SQL, with the total for paging. */
export function listRecordings(
	clinicId: string,
	query: ListQuery
): { rows: (Recording & { progress: number | null; stage: string | null })[]; total: number } {
	const escaped = query.search.replace(/[\\%_]/g, (c) => `\\${c}`);
	const where = and(
		eq(recordings.clinicId, clinicId),
		query.status === 'all' ? undefined : eq(recordings.status, query.status),
		query.search
			? or(
					like(recordings.title, sql`${`%${escaped}%`} escape '\\'`),
					like(recordings.originalFilename, sql`${`%${escaped}%`} escape '\\'`)
				)
			: undefined
	);
	const total = db().select({ n: count() }).from(recordings).where(where).get()?.n ?? 0;
	const order = query.direction === 'asc' ? asc : desc;
	const latest = db()
		.select({
			recordingId: jobs.recordingId,
			progress: jobs.progress,
			stage: jobs.stage,
			rank: sql<number>`row_number() over (partition by ${jobs.recordingId} order by ${jobs.createdAt} desc)`.as(
				'rank'
			)
		})
		.from(jobs)
		.where(eq(jobs.kind, 'process-recording'))
		.as('latest');
	const rows = db()
		.select({ recording: recordings, progress: latest.progress, stage: latest.stage })
		.from(recordings)
		.leftJoin(latest, and(eq(latest.recordingId, recordings.id), eq(latest.rank, 1)))
		.where(where)
		.orderBy(order(SORT_COLUMNS[query.sort]), desc(recordings.createdAt))
		.limit(query.pageSize)
		.offset((query.page - 1) * query.pageSize)
		.all();
	return {
		rows: rows.map((r) => ({ ...r.recording, progress: r.progress, stage: r.stage })),
		total
	};
}

/** A recording of the clinic, or null (also for another clinic's id). */
export function findRecording(clinicId: string, recordingId: string): Recording | null {
	return (
		db()
			.select()
			.from(recordings)
			.where(and(eq(recordings.id, recordingId), eq(recordings.clinicId, clinicId)))
			.get() ?? null
	);
}

export interface RecordingStatusView {
	id: string;
	status: RecordingStatus;
	failureReason: string | null;
	job: {
		id: string;
		status: Job['status'];
		stage: string;
		progress: number;
		attempts: number;
		maxAttempts: number;
		lastError: string | null;
		runAfter: string;
	} | null;
}

/** What the recording page polls for: status, and the job's stage and progress. */
export function statusView(recording: Recording): RecordingStatusView {
	const job = queue.latestJobFor(recording.id);
	return {
		id: recording.id,
		status: recording.status,
		failureReason: recording.failureReason,
		job: job
			? {
					id: job.id,
					status: job.status,
					stage: job.stage,
					progress: job.progress,
					attempts: job.attempts,
					maxAttempts: job.maxAttempts,
					lastError: job.lastError,
					runAfter: job.runAfter.toISOString()
				}
			: null
	};
}

/** Queues processing again for a failed recording. */
export function retryProcessing(recording: Recording): boolean {
	if (recording.status !== 'failed') return false;
	const job = queue.latestJobFor(recording.id);
	db().transaction((tx) => {
		tx.update(recordings)
			.set({ status: 'processing', failureReason: null })
			.where(eq(recordings.id, recording.id))
			.run();
		if (!job || !queue.requeue(job.id)) {
			queue.enqueue({ kind: 'process-recording', recordingId: recording.id }, tx);
		}
	});
	return true;
}

/** Cancels a recording's processing; the recording shows as failed with the reason "cancelled". */
export function cancelProcessing(recording: Recording): boolean {
	const job = queue.latestJobFor(recording.id);
	if (!job || !queue.cancel(job.id)) return false;
	if (job.status === 'queued') markCancelled(recording.id);
	return true;
}

export function markCancelled(recordingId: string): void {
	db()
		.update(recordings)
		.set({
			status: 'failed',
			failureReason: 'Processing was cancelled. Choose “Process again” to restart it.'
		})
		.where(eq(recordings.id, recordingId))
		.run();
}

export function markFailed(recordingId: string, reason: string): void {
	db()
		.update(recordings)
		.set({ status: 'failed', failureReason: reason })
		.where(eq(recordings.id, recordingId))
		.run();
}

/**
 * Deletes a recording and every object stored for it. Storage goes first: if it fails, the row
 * stays and the delete can be tried again, rather than leaving objects nothing points to.
 */
export async function deleteRecording(recording: Recording): Promise<void> {
	const job = queue.latestJobFor(recording.id);
	if (job?.status === 'running') queue.cancel(job.id);
	await deletePrefix(recordingKeys(recording.clinicId, recording.id).prefix);
	db().delete(recordings).where(eq(recordings.id, recording.id)).run();
}

/** Renames a recording of the caller's clinic (the title is checked by `parseRecordingTitle`). */
export function renameRecording(recording: Recording, title: string): void {
	db()
		.update(recordings)
		.set({ title })
		.where(and(eq(recordings.id, recording.id), eq(recordings.clinicId, recording.clinicId)))
		.run();
}
