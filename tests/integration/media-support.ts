/**
 * A recording's media in the storage fake, for integration tests: a file stored as processing
 * leaves it, or uploaded the way the browser uploads it. (recordings-support.ts makes the clips;
 * it stays free of app modules because the end-to-end tests import it too.) Nothing here reads
 * the configuration on import, so a test file may still set its own first.
 */
import { readFile } from 'node:fs/promises';
import { expect } from 'vitest';
import type { Recording } from '$lib/server/db/schema';
import { createUpload, presignParts } from '$lib/server/recordings/uploads';
import { putObject } from '$lib/server/storage';
import { recordingKeys } from '$lib/server/storage/keys';

/** Stores the file at `path` as the recording's web version (or its original upload). */
export async function storeMedia(
	recording: Pick<Recording, 'id' | 'clinicId'>,
	path: string,
	asset: 'rendition' | 'original' = 'rendition'
): Promise<void> {
	const bytes = await readFile(path);
	await putObject(recordingKeys(recording.clinicId, recording.id)[asset], bytes, 'video/mp4');
}

type Uploader = Parameters<typeof presignParts>[0];

/** Sends a file's parts the way the browser does: presigned part URLs and plain fetch PUTs. */
export async function sendThroughPresignedParts(
	owner: Uploader,
	session: { id: string; partSize: number; partCount: number },
	bytes: Uint8Array<ArrayBuffer>,
	skip: number[] = []
): Promise<void> {
	const numbers = Array.from({ length: session.partCount }, (_, i) => i + 1).filter(
		(n) => !skip.includes(n)
	);
	for (const { partNumber, url } of await presignParts(owner, session.id, numbers)) {
		const start = (partNumber - 1) * session.partSize;
		const response = await fetch(url, {
			method: 'PUT',
			body: bytes.subarray(start, start + session.partSize)
		});
		expect(response.status, `part ${partNumber}`).toBe(200);
	}
}

/** Starts an upload of the file at `path` and sends all of it; completing it is the test's. */
export async function uploadFile(
	owner: Uploader,
	path: string,
	filename: string,
	contentType = 'video/mp4'
) {
	const bytes = new Uint8Array(await readFile(path));
	const session = await createUpload(owner, { filename, contentType, sizeBytes: bytes.length });
	await sendThroughPresignedParts(owner, session, bytes);
	return session;
}
