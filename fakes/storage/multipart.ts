import { readdir, readFile, rm, stat } from 'node:fs/promises';
import type { IncomingMessage, ServerResponse } from 'node:http';
import { join } from 'node:path';

/**
 * The multipart calls s3rver lacks — ListParts, AbortMultipartUpload, ListMultipartUploads —
 * answered from the folder where s3rver keeps unfinished uploads, plus S3's NoSuchUpload for a
 * part sent to an upload that no longer exists (s3rver would silently start a new one). Resume
 * and the abandoned-upload sweep depend on these behaving as S3 does.
 */

const UPLOADS_FOLDER = '._S3rver_uploads';

function escapeXml(value: string): string {
	return value.replace(/[<>&'"]/g, (c) => `&#${c.charCodeAt(0)};`);
}

function sendXml(res: ServerResponse, status: number, body: string) {
	const xml = `<?xml version="1.0" encoding="UTF-8"?>\n${body}`;
	res.writeHead(status, {
		'Content-Type': 'application/xml',
		'Content-Length': Buffer.byteLength(xml)
	});
	res.end(xml);
}

function noSuchUpload(res: ServerResponse, uploadId: string) {
	sendXml(
		res,
		404,
		`<Error><Code>NoSuchUpload</Code><Message>The specified upload does not exist.</Message><UploadId>${escapeXml(uploadId)}</UploadId></Error>`
	);
}

async function exists(path: string): Promise<boolean> {
	try {
		await stat(path);
		return true;
	} catch {
		return false;
	}
}

/** Handles the request if it is one of the missing multipart calls; returns whether it did. */
export async function handleMultipart(
	req: IncomingMessage,
	res: ServerResponse,
	directory: string,
	cors: (req: IncomingMessage, res: ServerResponse) => void
): Promise<boolean> {
	const url = new URL(req.url ?? '/', 'http://fake');
	const [, bucket, ...keyParts] = url.pathname.split('/');
	if (!bucket) return false;
	const key = keyParts.map(decodeURIComponent).join('/');
	const uploadsRoot = join(directory, bucket, UPLOADS_FOLDER);
	const uploadId = url.searchParams.get('uploadId');

	if (uploadId !== null && !/^[0-9a-f]{32}$/.test(uploadId)) {
		noSuchUpload(res, uploadId);
		return true;
	}
	const uploadDir = uploadId ? join(uploadsRoot, uploadId) : '';

	if (req.method === 'PUT' && uploadId && key) {
		if (await exists(join(uploadDir, 'key'))) return false;
		req.resume();
		cors(req, res);
		noSuchUpload(res, uploadId);
		return true;
	}

	if (req.method === 'GET' && uploadId && key) {
		if (!(await exists(join(uploadDir, 'key')))) {
			noSuchUpload(res, uploadId);
			return true;
		}
		const entries = await readdir(uploadDir);
		const numbers = entries
			.filter((e) => /^\d+$/.test(e))
			.map(Number)
			.sort((a, b) => a - b);
		const parts: string[] = [];
		for (const n of numbers) {
			const info = await stat(join(uploadDir, String(n)));
			const md5 = await readFile(join(uploadDir, `${n}.md5`), 'utf8').catch(() => null);
			// A part still being written has no checksum yet: it is not stored.
			if (md5 === null) continue;
			parts.push(
				`<Part><PartNumber>${n}</PartNumber><LastModified>${info.mtime.toISOString()}</LastModified><ETag>"${md5}"</ETag><Size>${info.size}</Size></Part>`
			);
		}
		sendXml(
			res,
			200,
			`<ListPartsResult><Bucket>${escapeXml(bucket)}</Bucket><Key>${escapeXml(key)}</Key><UploadId>${uploadId}</UploadId><MaxParts>10000</MaxParts><IsTruncated>false</IsTruncated>${parts.join('')}</ListPartsResult>`
		);
		return true;
	}

	if (req.method === 'DELETE' && uploadId && key) {
		if (!(await exists(join(uploadDir, 'key')))) {
			noSuchUpload(res, uploadId);
			return true;
		}
		await rm(uploadDir, { recursive: true, force: true });
		res.writeHead(204);
		res.end();
		return true;
	}

	if (req.method === 'GET' && !key && url.searchParams.has('uploads')) {
		const prefix = url.searchParams.get('prefix') ?? '';
		const ids = await readdir(uploadsRoot).catch(() => [] as string[]);
		const items: string[] = [];
		for (const id of ids) {
			const objectKey = await readFile(join(uploadsRoot, id, 'key'), 'utf8').catch(() => null);
			if (objectKey === null || !objectKey.startsWith(prefix)) continue;
			const info = await stat(join(uploadsRoot, id, 'key'));
			items.push(
				`<Upload><Key>${escapeXml(objectKey)}</Key><UploadId>${id}</UploadId><Initiated>${info.mtime.toISOString()}</Initiated></Upload>`
			);
		}
		sendXml(
			res,
			200,
			`<ListMultipartUploadsResult><Bucket>${escapeXml(bucket)}</Bucket><Prefix>${escapeXml(prefix)}</Prefix><MaxUploads>1000</MaxUploads><IsTruncated>false</IsTruncated>${items.join('')}</ListMultipartUploadsResult>`
		);
		return true;
	}
	return false;
}
