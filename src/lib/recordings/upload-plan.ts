/**
 * The pure arithmetic of a multipart upload, shared by the browser (which sends the parts) and
 * the server (which signs and checks them): how a file is cut into parts, which parts still need
 * sending, how long to wait before trying a part again, how fast bytes are moving, and the
 * fingerprint that lets the server recognise the same file chosen again in any browser.
 */

export const MiB = 1024 * 1024;
/** S3's limits on multipart uploads (every part but the last at least 5 MiB, at most 10 000 parts). */
export const MAX_PARTS = 10_000;
export const MIN_PART_SIZE = 5 * MiB;

/**
 * The smallest whole-MiB part size of at least 5 MiB (S3's minimum) that fits `size` bytes in
 * 10 000 parts. Small parts on purpose: an interrupted part is sent again whole (S3 keeps only
 * finished parts), so a drop costs at most one part — 5 MiB, about 28 s on a 1.5 Mbit/s uplink.
 */
export function choosePartSize(size: number): number {
	const needed = Math.ceil(size / MAX_PARTS / MiB) * MiB;
	return Math.max(MIN_PART_SIZE, needed);
}

export function partCount(size: number, partSize: number): number {
	return Math.max(1, Math.ceil(size / partSize));
}

/** How many bytes part `partNumber` (1-based) of an upload of `size` bytes holds: the last one the rest. */
export function partBytes(size: number, partSize: number, partNumber: number): number {
	return Math.max(0, Math.min(partSize, size - (partNumber - 1) * partSize));
}

/** Where part `partNumber` starts and ends in the file (end exclusive), for `File.slice`. */
export function partRange(
	size: number,
	partSize: number,
	partNumber: number
): { start: number; end: number } {
	const start = (partNumber - 1) * partSize;
	return { start, end: start + partBytes(size, partSize, partNumber) };
}

export interface PartPlan {
	sizeBytes: number;
	partSize: number;
	partCount: number;
}

/**
 * The parts storage holds that can be kept (their size is the size the plan expects; a part of
 * another size is sent again), and the part numbers still to send, in order.
 */
export function planParts(
	plan: PartPlan,
	stored: readonly { partNumber: number; size: number }[]
): { kept: Map<number, number>; missing: number[] } {
	const kept = new Map<number, number>();
	for (const p of stored) {
		if (!Number.isInteger(p.partNumber) || p.partNumber < 1 || p.partNumber > plan.partCount)
			continue;
		if (p.size === partBytes(plan.sizeBytes, plan.partSize, p.partNumber))
			kept.set(p.partNumber, p.size);
	}
	const missing: number[] = [];
	for (let n = 1; n <= plan.partCount; n++) if (!kept.has(n)) missing.push(n);
	return { kept, missing };
}

/** The longest wait between two tries of the same step. */
export const MAX_RETRY_WAIT_MS = 30_000;

/**
 * How long to wait before try `attempt + 1` after try `attempt` failed while the network was up:
 * 1 s, 2 s, 4 s … doubling, with ±25 % jitter so many browsers do not retry in step, and never
 * more than 30 s. There is no cap on the number of tries: while the network is up a transient
 * fault (storage busy, a reset connection) ends sooner or later, and the person can pause or
 * cancel at any time. Time offline is not counted at all (the upload waits for the network).
 */
export function retryDelay(attempt: number, random: () => number = Math.random): number {
	const base = 1000 * 2 ** Math.min(Math.max(0, attempt - 1), 16);
	const jittered = base * (0.75 + random() * 0.5);
	return Math.round(Math.min(MAX_RETRY_WAIT_MS, jittered));
}

/**
 * How long to wait between two checks for the network while offline: 2 s, then 1.5× longer each
 * time up to 15 s. The browser's `online` event ends a wait at once; the check is there because
 * `navigator.onLine` can say "online" on a network that reaches nothing.
 */
export function probeDelay(check: number): number {
	return Math.round(Math.min(15_000, 2000 * 1.5 ** Math.max(0, check)));
}

/**
 * Whether a failed request may be tried again with the network up: no answer at all (status 0),
 * 408, 429 and any 5xx; from storage also 403, which is what a part URL that expired while
 * waiting gets (a fresh one is signed for each try). Anything else (400, 404, 409, 413, 422; the
 * app's 401 and 403) would fail the same way again.
 */
export function isRetryableStatus(status: number, from: 'server' | 'storage'): boolean {
	if (status === 0 || status === 408 || status === 429 || status >= 500) return true;
	return from === 'storage' && status === 403;
}

export interface SpeedSample {
	at: number;
	bytes: number;
}

/** Bytes moving for a speed: the samples of the last 8 s. */
export const SPEED_WINDOW_MS = 8000;
/** With no new byte for this long, no speed or time left is shown. */
export const STILL_AFTER_MS = 3000;

/**
 * The upload speed in bytes per second from progress samples (time in ms), over the last
 * SPEED_WINDOW_MS; null when it cannot be told honestly: fewer than 1.5 s of samples, or no
 * byte moved for STILL_AFTER_MS before `now` (offline, paused, waiting for storage).
 */
export function measureSpeed(samples: readonly SpeedSample[], now: number): number | null {
	if (samples.length < 2) return null;
	const last = samples[samples.length - 1];
	let lastMove = -Infinity;
	for (let i = samples.length - 1; i > 0; i--) {
		if (samples[i].bytes > samples[i - 1].bytes) {
			lastMove = samples[i].at;
			break;
		}
	}
	if (now - lastMove > STILL_AFTER_MS) return null;
	const from = samples.find((s) => s.at >= last.at - SPEED_WINDOW_MS) ?? samples[0];
	const seconds = (last.at - from.at) / 1000;
	if (seconds < 1.5) return null;
	return Math.max(0, (last.bytes - from.bytes) / seconds);
}

/** The samples worth keeping after adding one: the window and one before it. */
export function keepSamples(samples: SpeedSample[], now: number): SpeedSample[] {
	let first = 0;
	while (first < samples.length - 2 && now - samples[first + 1].at > SPEED_WINDOW_MS) first++;
	return first > 0 ? samples.slice(first) : samples;
}

/** The bytes the fingerprint reads: the first and the last MiB (the whole file when smaller than 2 MiB). */
export const FINGERPRINT_EDGE = MiB;

/** The byte ranges (end exclusive) a fingerprint reads from a file of `size` bytes. */
export function fingerprintRanges(size: number): { start: number; end: number }[] {
	if (size <= 2 * FINGERPRINT_EDGE) return [{ start: 0, end: size }];
	return [
		{ start: 0, end: FINGERPRINT_EDGE },
		{ start: size - FINGERPRINT_EDGE, end: size }
	];
}

/** A fingerprint is 64 lowercase hex digits (SHA-256). */
export const FINGERPRINT_PATTERN = /^[0-9a-f]{64}$/;

/**
 * SHA-256 (hex) of the file's first and last MiB, read with `Blob.slice` (two small reads, not
 * the whole file), computed with Web Crypto. With the file's name and size it tells the server
 * "the same file again", whichever browser chose it: a camera's video differs in its first MiB
 * (the header with its timestamps and sizes) and its last. Null where Web Crypto is missing
 * (a page served over plain http on a LAN address): the upload then works but cannot resume.
 */
export async function fileFingerprint(
	file: Blob,
	subtle: SubtleCrypto | null = globalThis.crypto?.subtle ?? null
): Promise<string | null> {
	if (!subtle) return null;
	const pieces = await Promise.all(
		fingerprintRanges(file.size).map((r) => file.slice(r.start, r.end).arrayBuffer())
	);
	const joined = new Uint8Array(pieces.reduce((n, p) => n + p.byteLength, 0));
	let offset = 0;
	for (const piece of pieces) {
		joined.set(new Uint8Array(piece), offset);
		offset += piece.byteLength;
	}
	const digest = new Uint8Array(await subtle.digest('SHA-256', joined));
	return Array.from(digest, (b) => b.toString(16).padStart(2, '0')).join('');
}
