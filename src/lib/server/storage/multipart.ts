import { createWriteStream } from 'node:fs';
import { pipeline } from 'node:stream/promises';
import {
	AbortMultipartUploadCommand,
	CompleteMultipartUploadCommand,
	CreateMultipartUploadCommand,
	ListMultipartUploadsCommand,
	ListPartsCommand,
	S3ServiceException,
	UploadPartCommand
} from '@aws-sdk/client-s3';
import { getSignedUrl } from '@aws-sdk/s3-request-presigner';
import { config } from '../config';
import { bucketName, getObjectStream, storage } from './index';

export {
	choosePartSize,
	MAX_PARTS,
	MIN_PART_SIZE,
	partBytes,
	partCount
} from '../../recordings/upload-plan';
/** Presigned part URLs live no longer than this (seconds). */
export const PART_URL_SECONDS = 600;

export interface StoredPart {
	partNumber: number;
	etag: string;
	size: number;
}

export function isNoSuchUpload(error: unknown): boolean {
	return (
		error instanceof S3ServiceException &&
		(error.name === 'NoSuchUpload' || error.$metadata.httpStatusCode === 404)
	);
}

export async function createMultipartUpload(key: string, contentType: string): Promise<string> {
	const result = await storage().send(
		new CreateMultipartUploadCommand({ Bucket: bucketName(), Key: key, ContentType: contentType })
	);
	if (!result.UploadId)
		throw new Error(`createMultipartUpload(${key}): storage gave no upload id.`);
	return result.UploadId;
}

/**
 * A URL the browser PUTs one part's bytes to, without credentials of its own. The part's exact
 * length is signed into the URL (Content-Length among the signed headers), so storage refuses a
 * body of any other size: a URL for a 1,000-byte file cannot carry 20 MB.
 */
export async function presignPart(
	key: string,
	uploadId: string,
	partNumber: number,
	contentLength: number,
	expiresIn = PART_URL_SECONDS
): Promise<string> {
	return getSignedUrl(
		storage(),
		new UploadPartCommand({
			Bucket: bucketName(),
			Key: key,
			UploadId: uploadId,
			PartNumber: partNumber,
			ContentLength: contentLength
		}),
		{
			expiresIn: Math.min(expiresIn, PART_URL_SECONDS),
			signableHeaders: new Set(['content-length'])
		}
	);
}

/** The parts storage holds for an upload, in order; null when the upload no longer exists. */
export async function listParts(key: string, uploadId: string): Promise<StoredPart[] | null> {
	const parts: StoredPart[] = [];
	let marker: string | undefined;
	try {
		for (;;) {
			const page = await storage().send(
				new ListPartsCommand({
					Bucket: bucketName(),
					Key: key,
					UploadId: uploadId,
					PartNumberMarker: marker
				})
			);
			for (const p of page.Parts ?? []) {
				if (p.PartNumber && p.ETag) {
					parts.push({ partNumber: p.PartNumber, etag: p.ETag, size: p.Size ?? 0 });
				}
			}
			if (!page.IsTruncated || !page.NextPartNumberMarker) break;
			marker = page.NextPartNumberMarker;
		}
	} catch (error) {
		if (isNoSuchUpload(error)) return null;
		throw error;
	}
	return parts.sort((a, b) => a.partNumber - b.partNumber);
}

export async function completeMultipartUpload(
	key: string,
	uploadId: string,
	parts: StoredPart[]
): Promise<void> {
	await storage().send(
		new CompleteMultipartUploadCommand({
			Bucket: bucketName(),
			Key: key,
			UploadId: uploadId,
			MultipartUpload: {
				Parts: parts.map((p) => ({ PartNumber: p.partNumber, ETag: p.etag }))
			}
		})
	);
}

/** Aborts an upload and frees its parts; an upload already gone is not an error. */
export async function abortMultipartUpload(key: string, uploadId: string): Promise<void> {
	try {
		await storage().send(
			new AbortMultipartUploadCommand({ Bucket: bucketName(), Key: key, UploadId: uploadId })
		);
	} catch (error) {
		if (!isNoSuchUpload(error)) throw error;
	}
}

/** Every unfinished multipart upload under a prefix, with when it began. */
export async function listMultipartUploads(
	prefix: string
): Promise<{ key: string; uploadId: string; initiated: Date | undefined }[]> {
	const found: { key: string; uploadId: string; initiated: Date | undefined }[] = [];
	let keyMarker: string | undefined;
	let uploadIdMarker: string | undefined;
	for (;;) {
		const page = await storage().send(
			new ListMultipartUploadsCommand({
				Bucket: bucketName(),
				Prefix: prefix,
				KeyMarker: keyMarker,
				UploadIdMarker: uploadIdMarker
			})
		);
		for (const u of page.Uploads ?? []) {
			if (u.Key && u.UploadId)
				found.push({ key: u.Key, uploadId: u.UploadId, initiated: u.Initiated });
		}
		if (!page.IsTruncated) return found;
		keyMarker = page.NextKeyMarker;
		uploadIdMarker = page.NextUploadIdMarker;
	}
}

/** Streams an object into a local file (never through memory whole); false when it is missing. */
export async function downloadToFile(
	key: string,
	path: string,
	signal?: AbortSignal
): Promise<boolean> {
	const object = await getObjectStream(key);
	if (!object) return false;
	await pipeline(object.body, createWriteStream(path), { signal });
	return true;
}

/**
 * The origin browsers send parts to, for the page's Content-Security-Policy `connect-src`.
 * When no endpoint is set (AWS itself) the regional origin is derived from the region.
 */
export function storageOrigin(): string {
	const c = config();
	if (c.S3_ENDPOINT) return new URL(c.S3_ENDPOINT).origin;
	return c.S3_FORCE_PATH_STYLE
		? `https://s3.${c.S3_REGION}.amazonaws.com`
		: `https://${c.S3_BUCKET}.s3.${c.S3_REGION}.amazonaws.com`;
}
