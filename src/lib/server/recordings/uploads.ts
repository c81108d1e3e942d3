import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { and, desc, eq, lt } from 'drizzle-orm';
import { refusalReason, type ProbeResult } from '../../media/validate';
import { titleFromFilename, uploadType } from '../../recordings/formats';
import { config } from '../config';
import { db } from '../db';
import { recordings, uploads, type Recording, type Upload } from '../db/schema';
import { enqueue } from '../jobs/queue';
import { MediaError, probeFile } from '../media/probe';
import { deleteObject, headObject } from '../storage';
import { recordingKeys } from '../storage/keys';
import { FINGERPRINT_PATTERN } from '../../recordings/upload-plan';
import {
	abortMultipartUpload,
	choosePartSize,
	completeMultipartUpload,
	createMultipartUpload,
	downloadToFile,
	listMultipartUploads,
	listParts,
	partCount,
	partBytes,
	presignPart,
	type StoredPart
} from '../storage/multipart';

/** A refusal the caller shows as is (a plain sentence) with its HTTP status. */
export class UploadError extends Error {
	constructor(
		readonly status: number,
		message: string
	) {
		super(message);
	}
}

export interface Owner {
	id: string;
	clinicId: string;
}

export interface UploadSession {
	id: string;
	filename: string;
	sizeBytes: number;
	partSize: number;
	partCount: number;
	/** The recording the upload becomes once accepted (so a browser whose answer was lost can look). */
	recordingId: string;
}

/** A session with the parts storage already holds; `resumed` when it was found, not started. */
export interface OpenedUpload extends UploadSession {
	parts: StoredPart[];
	resumed: boolean;
}

/** An unfinished upload for the "Unfinished uploads" panel: how much of it storage holds. */
export interface OpenUploadView extends UploadSession {
	/** Bytes in the parts storage holds; null when storage could not be asked just now. */
	storedBytes: number | null;
	storedParts: number | null;
	lastActivityAt: string;
}

function session(u: Upload): UploadSession {
	return {
		id: u.id,
		filename: u.filename,
		sizeBytes: u.sizeBytes,
		partSize: u.partSize,
		partCount: partCount(u.sizeBytes, u.partSize),
		recordingId: u.recordingId
	};
}

export interface DeclaredFile {
	filename: string;
	contentType: string;
	sizeBytes: number;
	/** SHA-256 (hex) of the file's first and last MiB, or null when the browser could not compute it. */
	fingerprint?: string | null;
}

/**
 * Starts a multipart upload for a declared file, refusing what could never be a recording; or,
 * when the same person already has an unfinished upload of a file with this name, size and
 * fingerprint (chosen in any browser), carries that one on: its session and the parts storage
 * holds. An upload storage has already forgotten is dropped and a new one started.
 */
export async function createUpload(owner: Owner, declared: DeclaredFile): Promise<OpenedUpload> {
	const type = uploadType(declared.filename, declared.contentType, declared.sizeBytes);
	if ('refusal' in type) throw new UploadError(422, type.refusal);
	const fingerprint =
		declared.fingerprint && FINGERPRINT_PATTERN.test(declared.fingerprint)
			? declared.fingerprint
			: null;
	if (fingerprint) {
		const found = await findSameFile(owner, declared.filename, declared.sizeBytes, fingerprint);
		if (found) return found;
	}
	const recordingId = crypto.randomUUID();
	const objectKey = recordingKeys(owner.clinicId, recordingId).original;
	const s3UploadId = await createMultipartUpload(objectKey, type.contentType);
	const row = db()
		.insert(uploads)
		.values({
			clinicId: owner.clinicId,
			userId: owner.id,
			recordingId,
			objectKey,
			s3UploadId,
			filename: declared.filename,
			contentType: type.contentType,
			sizeBytes: declared.sizeBytes,
			partSize: choosePartSize(declared.sizeBytes),
			fingerprint
		})
		.returning()
		.get();
	return { ...session(row), parts: [], resumed: false };
}

/** The caller's own unfinished upload of this file (newest first), with its stored parts. */
async function findSameFile(
	owner: Owner,
	filename: string,
	sizeBytes: number,
	fingerprint: string
): Promise<OpenedUpload | null> {
	const candidates = db()
		.select()
		.from(uploads)
		.where(
			and(
				eq(uploads.clinicId, owner.clinicId),
				eq(uploads.userId, owner.id),
				eq(uploads.sizeBytes, sizeBytes),
				eq(uploads.filename, filename),
				eq(uploads.fingerprint, fingerprint)
			)
		)
		.orderBy(desc(uploads.lastActivityAt))
		.all();
	for (const upload of candidates) {
		if (completing.has(upload.id)) continue;
		const parts = await listParts(upload.objectKey, upload.s3UploadId);
		if (parts === null) {
			db().delete(uploads).where(eq(uploads.id, upload.id)).run();
			continue;
		}
		touch(upload.id);
		return { ...session(upload), parts, resumed: true };
	}
	return null;
}

/** An upload of the caller's clinic, or a 404 (another clinic's ids are not confirmed). */
export function findUpload(owner: Owner, uploadId: string): Upload {
	const row = db()
		.select()
		.from(uploads)
		.where(and(eq(uploads.id, uploadId), eq(uploads.clinicId, owner.clinicId)))
		.get();
	if (!row)
		throw new UploadError(404, 'This upload no longer exists. Please choose the file again.');
	return row;
}

/** Uploads this process is completing and checking now (a second request must not do it again). */
const completing = new Set<string>();

function touch(uploadId: string) {
	db().update(uploads).set({ lastActivityAt: new Date() }).where(eq(uploads.id, uploadId)).run();
}

/** How many unfinished uploads the panel lists (the most recently active). */
const OPEN_UPLOADS_SHOWN = 20;

/**
 * The caller's own unfinished uploads, most recently active first, each with how much storage
 * holds of it (ListParts), so the page can say what choosing the file again would save. One
 * storage has forgotten (expired) is dropped; when storage cannot be asked, the amount is null.
 */
export async function listOpenUploads(owner: Owner): Promise<OpenUploadView[]> {
	const rows = db()
		.select()
		.from(uploads)
		.where(and(eq(uploads.clinicId, owner.clinicId), eq(uploads.userId, owner.id)))
		.orderBy(desc(uploads.lastActivityAt))
		.limit(OPEN_UPLOADS_SHOWN)
		.all();
	const views = await Promise.all(
		// One being checked is no longer unfinished (and storage no longer lists it as open).
		rows
			.filter((upload) => !completing.has(upload.id))
			.map(async (upload): Promise<OpenUploadView | null> => {
				let parts: StoredPart[] | null;
				try {
					parts = await listParts(upload.objectKey, upload.s3UploadId);
				} catch {
					return {
						...session(upload),
						storedBytes: null,
						storedParts: null,
						lastActivityAt: upload.lastActivityAt.toISOString()
					};
				}
				if (parts === null) {
					db().delete(uploads).where(eq(uploads.id, upload.id)).run();
					return null;
				}
				return {
					...session(upload),
					storedBytes: parts.reduce((sum, p) => sum + p.size, 0),
					storedParts: parts.length,
					lastActivityAt: upload.lastActivityAt.toISOString()
				};
			})
	);
	return views.filter((v): v is OpenUploadView => v !== null);
}

/** The session and the parts storage already holds, for resuming or checking before completing. */
export async function uploadState(
	owner: Owner,
	uploadId: string
): Promise<UploadSession & { parts: StoredPart[] }> {
	const upload = findUpload(owner, uploadId);
	if (completing.has(upload.id)) {
		throw new UploadError(409, 'This upload is being checked. Please wait a moment.');
	}
	const parts = await listParts(upload.objectKey, upload.s3UploadId);
	if (parts === null) {
		db().delete(uploads).where(eq(uploads.id, upload.id)).run();
		throw new UploadError(404, 'This upload expired. Please choose the file again.');
	}
	touch(upload.id);
	return { ...session(upload), parts };
}

/** Presigned URLs for the given part numbers (each valid for at most 10 minutes). */
export async function presignParts(
	owner: Owner,
	uploadId: string,
	partNumbers: number[]
): Promise<{ partNumber: number; url: string }[]> {
	const upload = findUpload(owner, uploadId);
	const count = partCount(upload.sizeBytes, upload.partSize);
	for (const n of partNumbers) {
		if (!Number.isInteger(n) || n < 1 || n > count) {
			throw new UploadError(400, `Part ${n} is outside this upload (1 to ${count}).`);
		}
	}
	touch(upload.id);
	return Promise.all(
		partNumbers.map(async (partNumber) => ({
			partNumber,
			url: await presignPart(
				upload.objectKey,
				upload.s3UploadId,
				partNumber,
				partBytes(upload.sizeBytes, upload.partSize, partNumber)
			)
		}))
	);
}

/** Aborts the multipart upload, freeing its parts, and forgets it. */
export async function abortUpload(owner: Owner, uploadId: string): Promise<void> {
	const upload = findUpload(owner, uploadId);
	await abortMultipartUpload(upload.objectKey, upload.s3UploadId);
	db().delete(uploads).where(eq(uploads.id, upload.id)).run();
}

function checkParts(upload: Upload, parts: StoredPart[]): string | null {
	const count = partCount(upload.sizeBytes, upload.partSize);
	if (parts.length !== count || parts.some((p, i) => p.partNumber !== i + 1)) {
		const missing = count - parts.length;
		return missing > 0
			? `${missing} of ${count} parts have not arrived yet. Keep the page open until the upload finishes.`
			: 'The upload holds unexpected parts. Please upload the file again.';
	}
	const total = parts.reduce((sum, p) => sum + p.size, 0);
	if (total !== upload.sizeBytes) {
		return `The parts add up to ${total} bytes, but the file was declared as ${upload.sizeBytes}. Please upload it again.`;
	}
	const badPart = parts.find((p, i) => i < parts.length - 1 && p.size !== upload.partSize);
	if (badPart)
		return `Part ${badPart.partNumber} has the wrong size. Please upload the file again.`;
	return null;
}

async function probeStored(key: string): Promise<ProbeResult | null> {
	const base = config().MEDIA_WORK_DIR || tmpdir();
	const dir = await mkdtemp(join(base, 'kinelume-probe-'));
	try {
		const path = join(dir, 'original');
		if (!(await downloadToFile(key, path))) return null;
		try {
			return await probeFile(path);
		} catch (error) {
			// Only "ffprobe could not read it" is the file's fault and becomes a refusal in words;
			// a missing ffprobe or a timeout is ours and must not be blamed on the clinician.
			if (error instanceof MediaError && error.kind === 'unreadable') return null;
			throw error;
		}
	} finally {
		await rm(dir, { recursive: true, force: true });
	}
}

async function refuse(upload: Upload, reason: string, whileMultipart: boolean): Promise<never> {
	if (whileMultipart) await abortMultipartUpload(upload.objectKey, upload.s3UploadId);
	else await deleteObject(upload.objectKey);
	db().delete(uploads).where(eq(uploads.id, upload.id)).run();
	throw new UploadError(422, reason);
}

/**
 * Finishes an upload: checks the parts against the declared size, completes it, checks the stored
 * object's size and type, then probes it. A refused file is deleted with its upload row, so
 * nothing of it remains; an accepted one becomes a recording with its processing job, together.
 */
export async function completeUpload(owner: Owner, uploadId: string): Promise<Recording> {
	const upload = findUpload(owner, uploadId);
	// A double click or a retried request must not complete and probe the same upload twice.
	if (completing.has(upload.id)) {
		throw new UploadError(409, 'This upload is already being checked. Please wait a moment.');
	}
	completing.add(upload.id);
	try {
		return await completeChecked(upload);
	} finally {
		completing.delete(upload.id);
	}
}

async function completeChecked(upload: Upload): Promise<Recording> {
	const parts = await listParts(upload.objectKey, upload.s3UploadId);
	if (parts === null) {
		db().delete(uploads).where(eq(uploads.id, upload.id)).run();
		throw new UploadError(404, 'This upload expired. Please choose the file again.');
	}
	const partProblem = checkParts(upload, parts);
	if (partProblem) {
		// Missing parts can still arrive: the session stays so the browser can send them.
		if (parts.length < partCount(upload.sizeBytes, upload.partSize)) {
			throw new UploadError(409, partProblem);
		}
		await refuse(upload, partProblem, true);
	}
	await completeMultipartUpload(upload.objectKey, upload.s3UploadId, parts);

	const head = await headObject(upload.objectKey);
	if (!head || head.contentLength !== upload.sizeBytes) {
		await refuse(
			upload,
			'The stored file is not the size that was declared. Please upload it again.',
			false
		);
	}
	if (head && head.contentType !== upload.contentType) {
		await refuse(
			upload,
			'The stored file is not the type that was declared. Please upload it again.',
			false
		);
	}

	const probe = await probeStored(upload.objectKey);
	const declared = {
		filename: upload.filename,
		contentType: upload.contentType,
		sizeBytes: upload.sizeBytes
	};
	const reason = refusalReason(probe, declared);
	if (reason || !probe || !probe.video) {
		await refuse(upload, reason ?? 'This file has no video track.', false);
	}
	const video = probe!.video!;
	return db().transaction((tx) => {
		const recording = tx
			.insert(recordings)
			.values({
				id: upload.recordingId,
				clinicId: upload.clinicId,
				uploadedBy: upload.userId,
				title: titleFromFilename(upload.filename),
				originalFilename: upload.filename,
				contentType: upload.contentType,
				sizeBytes: upload.sizeBytes,
				status: 'processing',
				durationSeconds: probe!.durationSeconds,
				width: video.displayWidth,
				height: video.displayHeight,
				videoCodec: video.codec,
				audioCodec: probe!.audio?.codec ?? null,
				frameRate: video.frameRate,
				rotation: video.rotation,
				hasAudio: probe!.audio !== null
			})
			.returning()
			.get();
		enqueue({ kind: 'process-recording', recordingId: recording.id }, tx);
		tx.delete(uploads).where(eq(uploads.id, upload.id)).run();
		return recording;
	});
}

/**
 * Aborts multipart uploads idle longer than UPLOAD_IDLE_HOURS and forgets their rows; then aborts
 * any unfinished upload under the clinics' keys that no row knows (an orphan of a crash) once it
 * is as old. Returns how many it aborted.
 */
export async function sweepUploads(now = new Date()): Promise<number> {
	const cutoff = new Date(now.getTime() - config().UPLOAD_IDLE_HOURS * 3600 * 1000);
	let aborted = 0;
	const idle = db().select().from(uploads).where(lt(uploads.lastActivityAt, cutoff)).all();
	for (const upload of idle) {
		await abortMultipartUpload(upload.objectKey, upload.s3UploadId);
		db().delete(uploads).where(eq(uploads.id, upload.id)).run();
		aborted++;
	}
	const known = new Set(
		db()
			.select({ s3UploadId: uploads.s3UploadId })
			.from(uploads)
			.all()
			.map((u) => u.s3UploadId)
	);
	for (const open of await listMultipartUploads('clinics/')) {
		if (known.has(open.uploadId)) continue;
		if (open.initiated && open.initiated > cutoff) continue;
		await abortMultipartUpload(open.key, open.uploadId);
		aborted++;
	}
	return aborted;
}

/** Runs the sweep every UPLOAD_SWEEP_MINUTES; returns a function that stops it. */
export function startUploadSweep(log: (m: string) => void = console.log): () => void {
	const run = () => {
		sweepUploads().then(
			(n) => {
				if (n > 0) log(`[uploads] aborted ${n} abandoned upload(s)`);
			},
			(error: unknown) => log(`[uploads] sweep failed: ${String(error)}`)
		);
	};
	const timer = setInterval(run, config().UPLOAD_SWEEP_MINUTES * 60 * 1000);
	timer.unref();
	run();
	return () => clearInterval(timer);
}
