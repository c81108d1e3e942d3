import { testEnv, withEnv } from './env';
import { createHash, randomBytes } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Readable } from 'node:stream';
import {
	CompleteMultipartUploadCommand,
	CreateMultipartUploadCommand,
	HeadBucketCommand,
	PutObjectCommand,
	S3Client,
	UploadPartCommand
} from '@aws-sdk/client-s3';
import { getSignedUrl } from '@aws-sdk/s3-request-presigner';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import {
	checkStorage,
	deleteObject,
	deletePrefix,
	getObjectStream,
	headObject,
	putObject,
	storage
} from '$lib/server/storage';
import { recordingKeys } from '$lib/server/storage/keys';

const MiB = 1024 * 1024;
const bucket = testEnv.S3_BUCKET;
const origin = 'http://localhost:5173';

function sha256(data: Uint8Array): string {
	return createHash('sha256').update(data).digest('hex');
}

async function streamSha256(stream: Readable): Promise<{ hash: string; bytes: number }> {
	const hash = createHash('sha256');
	let bytes = 0;
	for await (const chunk of stream) {
		hash.update(chunk as Buffer);
		bytes += (chunk as Buffer).length;
	}
	return { hash: hash.digest('hex'), bytes };
}

async function readBack(key: string) {
	const object = await getObjectStream(key);
	expect(object).not.toBeNull();
	return streamSha256(object!.body);
}

async function closedPort(): Promise<number> {
	const server = createServer();
	await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
	const address = server.address();
	await new Promise<void>((resolve) => server.close(() => resolve()));
	if (typeof address !== 'object' || !address) throw new Error('no port');
	return address.port;
}

function clientWith(overrides: {
	secretAccessKey?: string;
	accessKeyId?: string;
	checksums?: boolean;
}) {
	return new S3Client({
		endpoint: testEnv.S3_ENDPOINT,
		region: testEnv.S3_REGION,
		forcePathStyle: true,
		maxAttempts: 1,
		credentials: {
			accessKeyId: overrides.accessKeyId ?? testEnv.S3_ACCESS_KEY_ID,
			secretAccessKey: overrides.secretAccessKey ?? testEnv.S3_SECRET_ACCESS_KEY
		},
		...(overrides.checksums
			? {}
			: {
					requestChecksumCalculation: 'WHEN_REQUIRED',
					responseChecksumValidation: 'WHEN_REQUIRED'
				})
	});
}

let scratch: string;
beforeAll(async () => {
	scratch = await mkdtemp(join(tmpdir(), 'kinelume-storage-test-'));
});
afterAll(async () => {
	await rm(scratch, { recursive: true, force: true });
});

describe('storage module against the storage fake', () => {
	it('completes a two-part multipart upload and reads back the same bytes', async () => {
		const key = recordingKeys('clinic-mp', 'rec-1').original;
		const parts = [randomBytes(5 * MiB), randomBytes(5 * MiB + 123)];
		const client = storage();

		const { UploadId } = await client.send(
			new CreateMultipartUploadCommand({ Bucket: bucket, Key: key, ContentType: 'video/mp4' })
		);
		expect(UploadId).toBeTruthy();
		const uploaded = [];
		for (const [index, body] of parts.entries()) {
			const part = await client.send(
				new UploadPartCommand({
					Bucket: bucket,
					Key: key,
					UploadId,
					PartNumber: index + 1,
					Body: body
				})
			);
			expect(part.ETag).toMatch(/^"[0-9a-f]{32}"$/);
			uploaded.push({ ETag: part.ETag, PartNumber: index + 1 });
		}
		await client.send(
			new CompleteMultipartUploadCommand({
				Bucket: bucket,
				Key: key,
				UploadId,
				MultipartUpload: { Parts: uploaded }
			})
		);

		const whole = Buffer.concat(parts);
		const head = await headObject(key);
		expect(head?.contentLength).toBe(whole.length);
		expect(head?.contentType).toBe('video/mp4');
		expect(await readBack(key)).toEqual({ hash: sha256(whole), bytes: whole.length });
	});

	it('a presigned part URL takes exactly its part’s size and refuses any other', async () => {
		const { createMultipartUpload, presignPart, partBytes, abortMultipartUpload } = await import(
			'$lib/server/storage/multipart'
		);
		const key = recordingKeys('clinic-bound', 'rec-1').original;
		const uploadId = await createMultipartUpload(key, 'video/mp4');
		// A 1,000-byte file has one part of 1,000 bytes.
		const size = partBytes(1000, 8 * MiB, 1);
		expect(size).toBe(1000);
		const url = await presignPart(key, uploadId, 1, size);
		expect(new URL(url).searchParams.get('X-Amz-SignedHeaders')).toContain('content-length');
		const tooBig = await fetch(url, { method: 'PUT', body: randomBytes(2 * MiB) });
		expect(tooBig.status).toBe(403);
		await tooBig.arrayBuffer();
		const exact = await fetch(url, { method: 'PUT', body: randomBytes(1000) });
		expect(exact.status).toBe(200);
		await exact.arrayBuffer();
		await abortMultipartUpload(key, uploadId);
	});

	it('stores a plain put from a buffer and from a file stream without altering a byte', async () => {
		const keys = recordingKeys('clinic-put', 'rec-1');
		const poster = randomBytes(64 * 1024);
		await putObject(keys.poster(0), poster, 'image/jpeg');
		expect(await readBack(keys.poster(0))).toEqual({ hash: sha256(poster), bytes: poster.length });
		expect((await headObject(keys.poster(0)))?.contentType).toBe('image/jpeg');

		// A stream body is where the SDK's default checksums used to corrupt objects.
		const rendition = randomBytes(1000);
		const file = join(scratch, 'rendition.mp4');
		await writeFile(file, rendition);
		await putObject(keys.rendition, createReadStream(file), 'video/mp4');
		expect(await readBack(keys.rendition)).toEqual({ hash: sha256(rendition), bytes: 1000 });
	});

	it('serves a byte range', async () => {
		const key = recordingKeys('clinic-range', 'rec-1').segment('seg-1');
		const body = randomBytes(4096);
		await putObject(key, body, 'video/mp4');
		const part = await getObjectStream(key, 'bytes=100-199');
		expect(part?.contentRange).toBe('bytes 100-199/4096');
		expect(await streamSha256(part!.body)).toEqual({
			hash: sha256(body.subarray(100, 200)),
			bytes: 100
		});
	});

	it('answers null for a missing object and deletes single objects', async () => {
		const key = recordingKeys('clinic-del', 'rec-1').poster(3);
		expect(await headObject(key)).toBeNull();
		expect(await getObjectStream(key)).toBeNull();
		await putObject(key, 'x', 'text/plain');
		expect(await headObject(key)).not.toBeNull();
		await deleteObject(key);
		expect(await headObject(key)).toBeNull();
		await expect(deleteObject(key)).resolves.toBeUndefined();
	});

	it('deletes a prefix without touching a sibling whose id shares its start', async () => {
		const doomed = recordingKeys('clinic-prefix', 'rec-1');
		const sibling = recordingKeys('clinic-prefix', 'rec-10');
		for (const key of [doomed.original, doomed.rendition, doomed.poster(0), doomed.segment('a')]) {
			await putObject(key, key, 'text/plain');
		}
		await putObject(sibling.original, 'keep', 'text/plain');

		expect(await deletePrefix(doomed.prefix)).toBe(4);
		expect(await headObject(doomed.rendition)).toBeNull();
		expect(await headObject(doomed.segment('a'))).toBeNull();
		expect(await headObject(sibling.original)).not.toBeNull();
		expect(await deletePrefix(doomed.prefix)).toBe(0);
		await expect(deletePrefix('clinics/clinic-prefix')).rejects.toThrow(/ending with '\/'/);
	});

	it('refuses a stream of unknown length before sending it', async () => {
		await expect(
			putObject('clinics/c/recordings/r/original', Readable.from([Buffer.from('x')]), 'video/mp4')
		).rejects.toThrow(/contentLength/);
	});
});

describe('storage fake access checks', () => {
	it('refuses a request signed with a wrong secret and stores nothing', async () => {
		const key = 'clinics/intruder/recordings/r/original';
		const wrong = clientWith({ secretAccessKey: 'not-the-secret' });
		await expect(
			wrong.send(new PutObjectCommand({ Bucket: bucket, Key: key, Body: 'evil' }))
		).rejects.toMatchObject({ name: 'SignatureDoesNotMatch', $metadata: { httpStatusCode: 403 } });
		await expect(wrong.send(new HeadBucketCommand({ Bucket: bucket }))).rejects.toMatchObject({
			$metadata: { httpStatusCode: 403 }
		});
		expect(await headObject(key)).toBeNull();
	});

	it('refuses an unknown access key, the built-in S3RVER pair and anonymous requests', async () => {
		await expect(
			clientWith({ accessKeyId: 'nobody' }).send(
				new PutObjectCommand({ Bucket: bucket, Key: 'x', Body: 'x' })
			)
		).rejects.toMatchObject({ name: 'InvalidAccessKeyId', $metadata: { httpStatusCode: 403 } });
		await expect(
			clientWith({ accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' }).send(
				new PutObjectCommand({ Bucket: bucket, Key: 'x', Body: 'x' })
			)
		).rejects.toMatchObject({ $metadata: { httpStatusCode: 403 } });

		const anonymous = await fetch(`${testEnv.S3_ENDPOINT}/${bucket}/x`, {
			method: 'PUT',
			body: 'x'
		});
		expect(anonymous.status).toBe(403);
		expect(await anonymous.text()).toContain('<Code>AccessDenied</Code>');
	});

	it('accepts a presigned URL and refuses it once its signature is altered', async () => {
		const key = 'clinics/c/recordings/presigned/original';
		const url = await getSignedUrl(
			storage(),
			new PutObjectCommand({ Bucket: bucket, Key: key, ContentType: 'text/plain' }),
			{ expiresIn: 60 }
		);
		const forged = url.replace(
			/X-Amz-Signature=([0-9a-f])/,
			(_, c: string) => `X-Amz-Signature=${c === '0' ? '1' : '0'}`
		);
		const refused = await fetch(forged, {
			method: 'PUT',
			body: 'x',
			headers: { 'Content-Type': 'text/plain' }
		});
		expect(refused.status).toBe(403);
		const accepted = await fetch(url, {
			method: 'PUT',
			body: 'hello',
			headers: { 'Content-Type': 'text/plain' }
		});
		expect(accepted.status).toBe(200);
		expect((await headObject(key))?.contentLength).toBe(5);
	});

	it('refuses aws-chunked uploads loudly instead of storing the framing', async () => {
		const file = join(scratch, 'chunked.bin');
		await writeFile(file, randomBytes(1000));
		const key = 'clinics/c/recordings/chunked/original';
		await expect(
			clientWith({ checksums: true }).send(
				new PutObjectCommand({ Bucket: bucket, Key: key, Body: createReadStream(file) })
			)
		).rejects.toMatchObject({ name: 'NotImplemented', $metadata: { httpStatusCode: 501 } });
		expect(await headObject(key)).toBeNull();
	});

	it('refuses keys that climb out of the bucket', async () => {
		const response = await fetch(`${testEnv.S3_ENDPOINT}/${bucket}/..%2F..%2Fescape`);
		expect(response.status).toBe(400);
	});
});

describe('storage fake CORS for direct browser uploads', () => {
	it('answers a PUT preflight as allowed', async () => {
		const response = await fetch(
			`${testEnv.S3_ENDPOINT}/${bucket}/clinics/c/recordings/r/original?partNumber=1&uploadId=u`,
			{
				method: 'OPTIONS',
				headers: {
					Origin: origin,
					'Access-Control-Request-Method': 'PUT',
					'Access-Control-Request-Headers': 'content-type'
				}
			}
		);
		expect(response.status).toBe(200);
		expect(response.headers.get('access-control-allow-origin')).toBe('*');
		expect(response.headers.get('access-control-allow-methods')).toContain('PUT');
		expect(response.headers.get('access-control-allow-headers')).toBe('content-type');
	});

	it('exposes the ETag of a part uploaded from a browser origin', async () => {
		const key = 'clinics/c/recordings/browser/original';
		const client = storage();
		const { UploadId } = await client.send(
			new CreateMultipartUploadCommand({ Bucket: bucket, Key: key })
		);
		const url = await getSignedUrl(
			client,
			new UploadPartCommand({ Bucket: bucket, Key: key, UploadId, PartNumber: 1 }),
			{ expiresIn: 60 }
		);
		const part = randomBytes(5 * MiB);
		const response = await fetch(url, { method: 'PUT', body: part, headers: { Origin: origin } });
		expect(response.status).toBe(200);
		expect(response.headers.get('etag')).toBe(`"${createHash('md5').update(part).digest('hex')}"`);
		expect(response.headers.get('access-control-allow-origin')).toBe('*');
		expect(response.headers.get('access-control-expose-headers')).toContain('ETag');
	});
});

describe('checkStorage', () => {
	async function freshCheck(changes: Parameters<typeof withEnv>[0]) {
		return withEnv(changes, async () => {
			vi.resetModules();
			const fresh = await import('$lib/server/storage');
			return fresh.checkStorage(1500);
		});
	}

	it('is ok against the running fake', async () => {
		const result = await checkStorage();
		expect(result).toEqual({ ok: true, detail: expect.stringContaining(`"${bucket}" reachable`) });
	});

	it('is not ok against a closed port, without throwing and without waiting for its timeout', async () => {
		const result = await freshCheck({ S3_ENDPOINT: `http://127.0.0.1:${await closedPort()}` });
		expect(result.ok).toBe(false);
		// The refusal itself is reported: a check that sat out its timeout would say "no answer".
		expect(result.detail).toMatch(/ECONNREFUSED/);
		expect(result.detail).not.toMatch(/no answer within/);
	});

	it('is not ok with a wrong secret or a missing bucket', async () => {
		const wrongSecret = await freshCheck({ S3_SECRET_ACCESS_KEY: 'wrong' });
		expect(wrongSecret).toEqual({ ok: false, detail: expect.stringContaining('access refused') });
		const noBucket = await freshCheck({ S3_BUCKET: 'no-such-bucket' });
		expect(noBucket).toEqual({ ok: false, detail: expect.stringContaining('does not exist') });
	});
});
