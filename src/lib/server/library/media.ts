/**
 * The library's files. Approval copies a segment's clip and posters from the clinic's private
 * keys to `library/<published version>/…`, so every public URL reads a copy made for the
 * public and none reaches a clinic's own keys. Public endpoints stream only those copies.
 */
import { CopyObjectCommand } from '@aws-sdk/client-s3';
import { servedVersion, type StoredVersion } from '../../media/ladder';
import type { LibrarySubmission, LibraryVersion, SegmentRow } from '../db/schema';
import { bucketName, deletePrefix, headObject, storage } from '../storage';
import { libraryKeys, recordingKeys } from '../storage/keys';

export interface CopiedMedia {
	posterCount: number;
	clipSize: number;
	/** The smaller versions copied with the clip; null when it had none. */
	clipVersions: StoredVersion[] | null;
}

/** Copies each smaller version that is there; returns those copied (null for none). */
async function copyVersions(
	versions: readonly StoredVersion[] | null | undefined,
	from: (short: number) => string,
	to: (short: number) => string
): Promise<StoredVersion[] | null> {
	const copied: StoredVersion[] = [];
	for (const version of versions ?? []) {
		if (!(await headObject(from(version.short)))) continue;
		await copyObject(from(version.short), to(version.short), 'video/mp4');
		copied.push(version);
	}
	return copied.length ? copied : null;
}

async function copyObject(from: string, to: string, contentType: string): Promise<void> {
	await storage().send(
		new CopyObjectCommand({
			Bucket: bucketName(),
			Key: to,
			CopySource: `${bucketName()}/${from.split('/').map(encodeURIComponent).join('/')}`,
			ContentType: contentType,
			MetadataDirective: 'REPLACE'
		})
	);
}

/**
 * Copies the segment's clip and posters under the version's own prefix. Throws when the clip
 * is missing (its recording may have been deleted since the submission); a poster that is
 * missing is left out rather than failing the approval.
 */
export async function copySegmentToLibrary(
	segment: SegmentRow,
	versionId: string
): Promise<CopiedMedia> {
	const source = recordingKeys(segment.clinicId, segment.recordingId);
	const target = libraryKeys(versionId);
	const clip = await headObject(source.segment(segment.id));
	if (!clip) {
		throw new Error(`The clip of segment ${segment.id} is missing from storage.`);
	}
	await copyObject(source.segment(segment.id), target.segment(segment.id), 'video/mp4');
	const clipVersions = await copyVersions(
		segment.clipVersions,
		(short) => source.segmentVersion(segment.id, short),
		(short) => target.segmentVersion(segment.id, short)
	);
	let posterCount = 0;
	for (let index = 0; index < segment.posterCount; index++) {
		const from = source.segmentPoster(segment.id, index);
		if (!(await headObject(from))) break;
		await copyObject(from, target.poster(index), 'image/jpeg');
		posterCount++;
	}
	return { posterCount, clipSize: clip.contentLength, clipVersions };
}

/**
 * Copies a published version's own public copies (clip and posters) under a new version's
 * prefix, for a caption revision: the new version shows the same pictures as the one it
 * revises, read from the copies that were approved rather than from the clinic's files (which
 * may have gone since). Every version keeps files of its own, so serving, retiring and a failed
 * approval each deal with one prefix and never with another version's files.
 */
export async function copyVersionMedia(
	from: Pick<LibraryVersion, 'id' | 'posterCount' | 'snapshot' | 'clipVersions'>,
	versionId: string
): Promise<CopiedMedia> {
	const source = libraryKeys(from.id);
	const target = libraryKeys(versionId);
	const segmentId = from.snapshot.segment.id;
	const clip = await headObject(source.segment(segmentId));
	if (!clip) {
		throw new Error(`The public clip of version ${from.id} is missing from storage.`);
	}
	await copyObject(source.segment(segmentId), target.segment(segmentId), 'video/mp4');
	const clipVersions = await copyVersions(
		from.clipVersions,
		(short) => source.segmentVersion(segmentId, short),
		(short) => target.segmentVersion(segmentId, short)
	);
	let posterCount = 0;
	for (let index = 0; index < from.posterCount; index++) {
		const poster = source.poster(index);
		if (!(await headObject(poster))) break;
		await copyObject(poster, target.poster(index), 'image/jpeg');
		posterCount++;
	}
	return { posterCount, clipSize: clip.contentLength, clipVersions };
}

/** Removes every copy a version made (a failed approval, or a retired exercise). */
export async function deleteVersionMedia(versionId: string): Promise<void> {
	await deletePrefix(libraryKeys(versionId).prefix);
}

/** The key of a segment's clip, or of its smaller version `short` when that was made. */
export function segmentClipKey(
	segment: Pick<SegmentRow, 'id' | 'clinicId' | 'recordingId' | 'clipVersions'>,
	short: number | null
): string {
	const keys = recordingKeys(segment.clinicId, segment.recordingId);
	const served = servedVersion(short, segment.clipVersions);
	return served ? keys.segmentVersion(segment.id, served) : keys.segment(segment.id);
}

export interface StoredAsset {
	key: string;
	type: string;
}

const POSTER = /^poster-(\d{1,2})\.jpg$/;

/**
 * The public copy an asset name of a published version stands for; null for no such asset.
 * `short` asks for a smaller version of the clip (the clip itself when it has none of that size).
 */
export function versionAsset(
	version: LibraryVersion,
	asset: string,
	short: number | null = null
): StoredAsset | null {
	const keys = libraryKeys(version.id);
	if (asset === 'clip.mp4') {
		const segmentId = version.snapshot.segment.id;
		const served = servedVersion(short, version.clipVersions);
		const key = served ? keys.segmentVersion(segmentId, served) : keys.segment(segmentId);
		return { key, type: 'video/mp4' };
	}
	const poster = POSTER.exec(asset);
	if (poster && Number(poster[1]) < version.posterCount) {
		return { key: keys.poster(Number(poster[1])), type: 'image/jpeg' };
	}
	return null;
}

/**
 * The clinic's own file behind a submission, for the educator reviewing it (never public);
 * null for no such asset or a segment that is gone. A caption revision has no file of its
 * own: its clip and posters are those of the version it revises (`revisedVersionAsset`).
 */
export function submissionAsset(
	submission: LibrarySubmission,
	segment: SegmentRow | null,
	asset: string,
	short: number | null = null
): StoredAsset | null {
	if (submission.kind === 'captions') return null;
	if (!segment || segment.id !== submission.segmentId || segment.clinicId !== submission.clinicId) {
		return null;
	}
	const keys = recordingKeys(segment.clinicId, segment.recordingId);
	if (asset === 'clip.mp4') return { key: segmentClipKey(segment, short), type: 'video/mp4' };
	const poster = POSTER.exec(asset);
	if (poster && Number(poster[1]) < segment.posterCount) {
		return { key: keys.segmentPoster(segment.id, Number(poster[1])), type: 'image/jpeg' };
	}
	return null;
}

/** Where a published version's files are served, for pages and Open Graph tags. */
export function versionUrls(version: Pick<LibraryVersion, 'id' | 'posterCount'>) {
	const base = `/api/library/versions/${version.id}`;
	return {
		clip: `${base}/clip.mp4`,
		captions: `${base}/captions.vtt`,
		posters: Array.from({ length: version.posterCount }, (_, i) => `${base}/poster-${i}.jpg`)
	};
}

/** Where a submission's files are served to the educator reviewing it. */
export function submissionUrls(submissionId: string, posterCount: number) {
	const base = `/api/library/submissions/${submissionId}`;
	return {
		clip: `${base}/clip.mp4`,
		captions: `${base}/captions.vtt`,
		posters: Array.from({ length: posterCount }, (_, i) => `${base}/poster-${i}.jpg`)
	};
}
