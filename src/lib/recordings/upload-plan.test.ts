import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import {
	choosePartSize,
	fileFingerprint,
	fingerprintRanges,
	FINGERPRINT_PATTERN,
	isRetryableStatus,
	keepSamples,
	MAX_RETRY_WAIT_MS,
	measureSpeed,
	MiB,
	partBytes,
	partCount,
	partRange,
	planParts,
	probeDelay,
	retryDelay,
	type SpeedSample
} from './upload-plan';

describe('part plan', () => {
	it('cuts files into 5 MiB parts (S3’s minimum) and never more than 10 000 of them', () => {
		// S3: every part but the last at least 5 MiB, at most 10 000 parts (the S3 API reference,
		// UploadPart and "Amazon S3 multipart upload limits").
		expect(choosePartSize(1)).toBe(5 * MiB);
		expect(choosePartSize(2 * 1024 ** 3)).toBe(5 * MiB);
		expect(partCount(2 * 1024 ** 3, 5 * MiB)).toBe(410);
		const huge = 200_000 * MiB;
		expect(choosePartSize(huge) % MiB).toBe(0);
		expect(partCount(huge, choosePartSize(huge))).toBeLessThanOrEqual(10_000);
	});

	it('gives every part its exact byte range, the last one the rest', () => {
		const size = 12 * MiB + 7;
		expect(partCount(size, 5 * MiB)).toBe(3);
		expect(partRange(size, 5 * MiB, 1)).toEqual({ start: 0, end: 5 * MiB });
		expect(partRange(size, 5 * MiB, 3)).toEqual({ start: 10 * MiB, end: size });
		expect(partBytes(size, 5 * MiB, 3)).toBe(2 * MiB + 7);
		expect(partCount(0, 5 * MiB)).toBe(1);
		expect(partBytes(0, 5 * MiB, 1)).toBe(0);
	});

	it('keeps stored parts of the right size and sends the rest again, in order', () => {
		const plan = { sizeBytes: 12 * MiB + 7, partSize: 5 * MiB, partCount: 3 };
		const { kept, missing } = planParts(plan, [
			{ partNumber: 3, size: 2 * MiB + 7 },
			// A part cut short (or of an older part size) is sent again.
			{ partNumber: 1, size: 4 * MiB },
			// Not part of this upload at all.
			{ partNumber: 9, size: 5 * MiB }
		]);
		expect([...kept]).toEqual([[3, 2 * MiB + 7]]);
		expect(missing).toEqual([1, 2]);
		expect(planParts(plan, []).missing).toEqual([1, 2, 3]);
	});
});

describe('retries', () => {
	it('waits 1, 2, 4 … s, jittered by a quarter either way, never more than 30 s', () => {
		expect(retryDelay(1, () => 0.5)).toBe(1000);
		expect(retryDelay(2, () => 0.5)).toBe(2000);
		expect(retryDelay(4, () => 0.5)).toBe(8000);
		expect(retryDelay(1, () => 0)).toBe(750);
		expect(retryDelay(1, () => 1)).toBe(1250);
		expect(retryDelay(6, () => 1)).toBe(MAX_RETRY_WAIT_MS);
		// No cap on tries: the hundredth still gets a wait, the longest one.
		expect(retryDelay(100, () => 0.5)).toBe(MAX_RETRY_WAIT_MS);
		for (let attempt = 1; attempt < 40; attempt++) {
			const wait = retryDelay(attempt);
			expect(wait).toBeGreaterThan(0);
			expect(wait).toBeLessThanOrEqual(MAX_RETRY_WAIT_MS);
		}
	});

	it('checks for the network every 2 s, then less often, at most every 15 s', () => {
		expect([0, 1, 2, 3, 4, 10].map(probeDelay)).toEqual([2000, 3000, 4500, 6750, 10125, 15000]);
	});

	it('tries again what may pass, and only that', () => {
		for (const status of [0, 408, 429, 500, 502, 503])
			expect(isRetryableStatus(status, 'server')).toBe(true);
		// Storage's 403 is an expired part URL; the app's 403 is a role that will not change.
		expect(isRetryableStatus(403, 'storage')).toBe(true);
		expect(isRetryableStatus(403, 'server')).toBe(false);
		for (const status of [400, 401, 404, 409, 413, 422])
			expect(isRetryableStatus(status, 'server')).toBe(false);
	});
});

describe('speed', () => {
	const moving: SpeedSample[] = Array.from({ length: 9 }, (_, i) => ({
		at: i * 1000,
		bytes: i * 100_000
	}));

	it('is bytes per second over the last 8 s while bytes move', () => {
		expect(measureSpeed(moving, 8000)).toBe(100_000);
	});

	it('is not told before 1.5 s of samples', () => {
		expect(measureSpeed(moving.slice(0, 2), 1000)).toBeNull();
		expect(measureSpeed([], 0)).toBeNull();
	});

	it('is not shown once no byte has moved for 3 s (offline, waiting)', () => {
		expect(measureSpeed(moving, 8000 + 2999)).toBe(100_000);
		expect(measureSpeed(moving, 8000 + 3001)).toBeNull();
		// Bytes dropping (a part given up) are not movement.
		const dropped = [...moving, { at: 9000, bytes: 500_000 }];
		expect(measureSpeed(dropped, 12_500)).toBeNull();
	});

	it('keeps only the samples of the window and one before it', () => {
		const many: SpeedSample[] = Array.from({ length: 30 }, (_, i) => ({ at: i * 1000, bytes: i }));
		const kept = keepSamples(many, 29_000);
		expect(kept[0].at).toBe(20_000);
		expect(kept.at(-1)!.at).toBe(29_000);
		expect(keepSamples(many.slice(0, 2), 50_000)).toHaveLength(2);
	});
});

describe('fingerprint', () => {
	function sha256(...parts: Uint8Array[]): string {
		const hash = createHash('sha256');
		for (const p of parts) hash.update(p);
		return hash.digest('hex');
	}

	function bytes(size: number, seed: number): Uint8Array<ArrayBuffer> {
		const out = new Uint8Array(size);
		for (let i = 0; i < size; i++) out[i] = (i * 31 + seed) & 0xff;
		return out;
	}

	it('reads the first and last MiB, or the whole of a file under 2 MiB', () => {
		expect(fingerprintRanges(10)).toEqual([{ start: 0, end: 10 }]);
		expect(fingerprintRanges(2 * MiB)).toEqual([{ start: 0, end: 2 * MiB }]);
		expect(fingerprintRanges(5 * MiB)).toEqual([
			{ start: 0, end: MiB },
			{ start: 4 * MiB, end: 5 * MiB }
		]);
	});

	it('is the SHA-256 of those bytes (checked against node:crypto)', async () => {
		const data = bytes(3 * MiB + 5, 7);
		const print = await fileFingerprint(new Blob([data]));
		expect(print).toMatch(FINGERPRINT_PATTERN);
		expect(print).toBe(sha256(data.subarray(0, MiB), data.subarray(data.length - MiB)));
		const small = bytes(1000, 3);
		expect(await fileFingerprint(new Blob([small]))).toBe(sha256(small));
	});

	it('tells files apart by their edges and ignores their middle', async () => {
		const a = bytes(3 * MiB, 1);
		const middle = a.slice();
		middle[Math.floor(1.5 * MiB)] ^= 0xff;
		const end = a.slice();
		end[a.length - 1] ^= 0xff;
		const [pa, pm, pe] = await Promise.all(
			[a, middle, end].map((d) => fileFingerprint(new Blob([d])))
		);
		expect(pm).toBe(pa);
		expect(pe).not.toBe(pa);
	});

	it('is null where Web Crypto is missing (a page over plain http)', async () => {
		expect(await fileFingerprint(new Blob([bytes(10, 1)]), null)).toBeNull();
	});
});
