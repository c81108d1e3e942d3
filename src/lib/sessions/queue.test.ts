import { describe, expect, it } from 'vitest';
import type { SessionLogInput } from './log';
import {
	classifyStatus,
	memoryStore,
	retryDelay,
	SessionQueue,
	type SendResult,
	type Sender
} from './queue';

let counter = 0;
function log(overrides: Partial<SessionLogInput> = {}): SessionLogInput {
	counter++;
	return {
		clientId: `00000000-0000-4000-8000-${String(counter).padStart(12, '0')}`,
		programmeItemId: '11111111-1111-4111-8111-111111111111',
		doneAt: '2026-03-02T10:00:00.000Z',
		setsDone: 2,
		repsDone: 10,
		pain: 3,
		note: '',
		...overrides
	};
}

/** A server stand-in that answers from a script and remembers what reached it, once per clientId. */
function scriptedServer(answers: (SendResult | 'throw')[]) {
	const stored = new Map<string, SessionLogInput>();
	const calls: string[] = [];
	const send: Sender = async (l) => {
		calls.push(l.clientId);
		const answer = answers.length > 1 ? answers.shift()! : answers[0];
		if (answer === 'throw') throw new TypeError('Failed to fetch');
		if (answer.kind === 'sent' && !stored.has(l.clientId)) stored.set(l.clientId, l);
		return answer;
	};
	return { send, stored, calls };
}

const SENT: SendResult = { kind: 'sent' };
const OFFLINE: SendResult = { kind: 'retry', problem: 'No connection.' };

describe('the session log queue', () => {
	it('sends a log at once when the server answers, leaving nothing behind', async () => {
		const server = scriptedServer([SENT]);
		const queue = new SessionQueue(memoryStore(), server.send);
		const entry = log();
		expect(await queue.add(entry)).toBe('sent');
		expect(await queue.entries()).toEqual([]);
		expect(server.stored.get(entry.clientId)).toEqual(entry);
	});

	it('keeps a log made offline without trying, and sends it when flushed back online', async () => {
		const server = scriptedServer([SENT]);
		const queue = new SessionQueue(memoryStore(), server.send);
		const entry = log();
		expect(await queue.add(entry, false)).toBe('saved');
		expect(server.calls).toEqual([]);
		expect((await queue.entries()).map((e) => e.log)).toEqual([entry]);
		expect(await queue.flush(true)).toEqual({ sent: 1, waiting: 0, refused: 0 });
		expect(server.stored.has(entry.clientId)).toBe(true);
	});

	it('keeps the log when sending throws (no network) and when the server fails', async () => {
		const server = scriptedServer(['throw', { kind: 'retry', problem: 'Server error.' }, SENT]);
		let now = 1_000;
		const queue = new SessionQueue(memoryStore(), server.send, () => now);
		const entry = log();
		expect(await queue.add(entry)).toBe('saved');
		let [kept] = await queue.entries();
		expect(kept).toMatchObject({ state: 'waiting', attempts: 1, problem: 'No connection.' });
		expect(kept.nextAttemptAt).toBe(1_000 + retryDelay(1));

		// Not yet due: an ordinary flush leaves it alone.
		expect(await queue.flush()).toEqual({ sent: 0, waiting: 1, refused: 0 });
		now = kept.nextAttemptAt;
		expect(await queue.flush()).toEqual({ sent: 0, waiting: 1, refused: 0 });
		[kept] = await queue.entries();
		expect(kept).toMatchObject({ attempts: 2, problem: 'Server error.' });
		now = kept.nextAttemptAt;
		expect(await queue.flush()).toEqual({ sent: 1, waiting: 0, refused: 0 });
		expect(server.stored.size).toBe(1);
	});

	it('keeps a refused log, says why, and sends it again only when asked', async () => {
		const server = scriptedServer([{ kind: 'refused', problem: 'Not in your programme.' }, SENT]);
		const queue = new SessionQueue(memoryStore(), server.send);
		const entry = log();
		expect(await queue.add(entry)).toBe('refused');
		expect(await queue.flush(true)).toEqual({ sent: 0, waiting: 0, refused: 1 });
		expect(server.calls).toHaveLength(1);
		expect((await queue.entries())[0]).toMatchObject({
			state: 'refused',
			problem: 'Not in your programme.'
		});
		await queue.retry(entry.clientId);
		expect(await queue.flush()).toEqual({ sent: 1, waiting: 0, refused: 0 });
	});

	it('sends oldest first and stops at the first failure, keeping the rest in order', async () => {
		const server = scriptedServer([SENT, OFFLINE]);
		const queue = new SessionQueue(memoryStore(), server.send);
		const [a, b, c] = [log(), log(), log()];
		for (const entry of [a, b, c]) await queue.add(entry, false);
		expect(await queue.flush(true)).toEqual({ sent: 1, waiting: 2, refused: 0 });
		expect(server.calls).toEqual([a.clientId, b.clientId]);
		expect((await queue.entries()).map((e) => e.log.clientId)).toEqual([b.clientId, c.clientId]);
	});

	it('stores a log once even when it is added twice', async () => {
		const queue = new SessionQueue(memoryStore(), scriptedServer([OFFLINE]).send);
		const entry = log();
		await queue.add(entry, false);
		await queue.add(entry, false);
		expect(await queue.entries()).toHaveLength(1);
	});

	it('runs one flush at a time: a second call shares the first', async () => {
		let release: () => void = () => {};
		const gate = new Promise<void>((resolve) => (release = resolve));
		let sends = 0;
		const queue = new SessionQueue(memoryStore(), async () => {
			sends++;
			await gate;
			return SENT;
		});
		await queue.add(log(), false);
		const first = queue.flush(true);
		const second = queue.flush(true);
		expect(second).toBe(first);
		release();
		expect(await first).toEqual({ sent: 1, waiting: 0, refused: 0 });
		expect(sends).toBe(1);
	});

	it('tells subscribers about every change, and when the next attempt is due', async () => {
		let now = 50;
		const queue = new SessionQueue(memoryStore(), scriptedServer([OFFLINE]).send, () => now);
		const seen: number[] = [];
		const stop = queue.subscribe((entries) => seen.push(entries.length));
		expect(await queue.nextAttemptAt()).toBeNull();
		await queue.add(log());
		expect(seen).toEqual([1, 1]);
		expect(await queue.nextAttemptAt()).toBe(50 + retryDelay(1));
		stop();
		now = 10_000_000;
		await queue.flush();
		expect(seen).toEqual([1, 1]);
	});
});

describe('what an answer means for a queued log', () => {
	it('treats success as sent, refusals of the log as refused and the rest as later', () => {
		expect(classifyStatus(201)).toBe('sent');
		expect(classifyStatus(200)).toBe('sent');
		expect(classifyStatus(422)).toBe('refused');
		expect(classifyStatus(404)).toBe('refused');
		expect(classifyStatus(400)).toBe('refused');
		for (const later of [401, 403, 408, 429, 500, 502, 503]) {
			expect(classifyStatus(later), String(later)).toBe('retry');
		}
	});

	it('backs off from 5 seconds, doubling, to at most 5 minutes (common practice)', () => {
		expect([1, 2, 3, 4].map(retryDelay)).toEqual([5_000, 10_000, 20_000, 40_000]);
		expect(retryDelay(20)).toBe(300_000);
		expect(retryDelay(0)).toBe(5_000);
	});
});
