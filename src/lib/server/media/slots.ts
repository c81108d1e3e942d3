import { hostname } from 'node:os';
import { count, eq, gte, inArray, lt } from 'drizzle-orm';
import { config } from '../config';
import { db } from '../db';
import { mediaSlots } from '../db/schema';
import { MediaError } from './ffmpeg';

/*
 * A counting lock on ffmpeg runs shared by every process on this machine: the app, `npm run
 * worker` (one or several) and scripts all open the same SQLite file, so a row per run in
 * `media_slot` is the count. Taking a slot is one immediate transaction (lapsed rows out, count,
 * insert when there is room), so two processes can never both take the last one. A holder renews
 * its row while ffmpeg runs; a process that died stops renewing and its rows lapse, and rows of a
 * process on this host that no longer exists are dropped at once.
 */

const LEASE_MS = 60_000;
const RENEW_MS = 15_000;
const HOST = hostname();
const HOLDER = `${HOST}:${process.pid}`;

export interface SlotOptions {
	signal?: AbortSignal;
	/** How often a waiting run asks again. Default 250 ms. */
	pollMs?: number;
	/** Slots on this machine; default FFMPEG_MAX_CONCURRENT. */
	limit?: number;
}

function processGone(holder: string): boolean {
	const separator = holder.lastIndexOf(':');
	if (holder.slice(0, separator) !== HOST) return false;
	const pid = Number(holder.slice(separator + 1));
	if (!Number.isInteger(pid) || pid <= 0) return false;
	try {
		process.kill(pid, 0);
		return false;
	} catch (error) {
		// EPERM: it exists, under another user.
		return (error as NodeJS.ErrnoException).code === 'ESRCH';
	}
}

/**
 * Held slots counted in this process instead of the database, for a worker that opens none (a
 * BullMQ worker on its own machine): there the machine's limit holds when it runs one worker.
 */
let inProcess: Set<string> | undefined;

/** Counts this process's ffmpeg runs here from now on, without the database. */
export function countSlotsInProcess(): void {
	inProcess ??= new Set();
}

/** Takes a slot if fewer than `limit` are held; its id, or null when all are taken. */
function tryTake(limit: number): string | null {
	if (inProcess) {
		if (inProcess.size >= limit) return null;
		const id = crypto.randomUUID();
		inProcess.add(id);
		return id;
	}
	return db().transaction(
		(tx) => {
			const now = new Date();
			tx.delete(mediaSlots).where(lt(mediaSlots.expiresAt, now)).run();
			const held = tx.select({ id: mediaSlots.id, holder: mediaSlots.holder }).from(mediaSlots);
			const gone = held
				.all()
				.filter((row) => processGone(row.holder))
				.map((row) => row.id);
			if (gone.length > 0) tx.delete(mediaSlots).where(inArray(mediaSlots.id, gone)).run();
			const taken = tx.select({ n: count() }).from(mediaSlots).get()?.n ?? 0;
			if (taken >= limit) return null;
			return tx
				.insert(mediaSlots)
				.values({ holder: HOLDER, expiresAt: new Date(now.getTime() + LEASE_MS) })
				.returning({ id: mediaSlots.id })
				.get().id;
		},
		{ behavior: 'immediate' }
	);
}

function pause(ms: number, signal?: AbortSignal): Promise<void> {
	return new Promise((resolve, reject) => {
		const stop = () => {
			clearTimeout(timer);
			reject(new MediaError('Processing was cancelled.', 'aborted'));
		};
		const timer = setTimeout(() => {
			signal?.removeEventListener('abort', stop);
			resolve();
		}, ms);
		signal?.addEventListener('abort', stop, { once: true });
	});
}

/**
 * Runs `work` (one ffmpeg run) once one of the machine's FFMPEG_MAX_CONCURRENT slots is free,
 * holding it until `work` settles. Waiting ends with an `aborted` MediaError when `signal` fires.
 */
export async function withMediaSlot<T>(
	work: () => Promise<T>,
	options: SlotOptions = {}
): Promise<T> {
	const { signal, pollMs = 250 } = options;
	const limit = Math.max(1, options.limit ?? config().FFMPEG_MAX_CONCURRENT);
	let id: string | null = null;
	for (;;) {
		if (signal?.aborted) throw new MediaError('Processing was cancelled.', 'aborted');
		id = tryTake(limit);
		if (id) break;
		// A little spread, so waiting processes do not all ask at the same instant.
		await pause(pollMs * (0.75 + Math.random() / 2), signal);
	}
	const slot = id;
	if (inProcess) {
		const held = inProcess;
		return work().finally(() => held.delete(slot));
	}
	const renew = setInterval(() => {
		try {
			db()
				.update(mediaSlots)
				.set({ expiresAt: new Date(Date.now() + LEASE_MS) })
				.where(eq(mediaSlots.id, slot))
				.run();
		} catch (error) {
			// The next renewal tries again; a lease lapses only after a minute of failures.
			console.error('[media] renewing an ffmpeg slot failed:', error);
		}
	}, RENEW_MS);
	try {
		return await work();
	} finally {
		clearInterval(renew);
		db().delete(mediaSlots).where(eq(mediaSlots.id, slot)).run();
	}
}

/** Slots held now on this machine, by every process: for tests and reports. */
export function mediaSlotsHeld(): number {
	return (
		db().select({ n: count() }).from(mediaSlots).where(gte(mediaSlots.expiresAt, new Date())).get()
			?.n ?? 0
	);
}
