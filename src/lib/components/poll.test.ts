import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { poll } from './poll';

function answer(body: unknown, status = 200, type = 'application/json'): Response {
	return new Response(JSON.stringify(body), { status, headers: { 'content-type': type } });
}

describe('poll', () => {
	beforeEach(() => vi.useFakeTimers());
	afterEach(() => vi.useRealTimers());

	it('asks again every interval and hands over each answer', async () => {
		const fetcher = vi.fn(async () => answer({ n: fetcher.mock.calls.length }));
		const seen: unknown[] = [];
		const stop = poll<{ n: number }>({
			url: '/api/x',
			every: 1000,
			fetch: fetcher,
			onData: (d) => void seen.push(d.n)
		});
		await vi.advanceTimersByTimeAsync(999);
		expect(fetcher).not.toHaveBeenCalled();
		await vi.advanceTimersByTimeAsync(1);
		await vi.advanceTimersByTimeAsync(1000);
		expect(seen).toEqual([1, 2]);
		stop();
		await vi.advanceTimersByTimeAsync(10_000);
		expect(fetcher).toHaveBeenCalledTimes(2);
	});

	it('reports failures (no answer, an error status, an HTML page) and keeps trying, slower', async () => {
		const results: (() => Response)[] = [
			() => {
				throw new TypeError('Failed to fetch');
			},
			() => answer({ error: {} }, 503),
			() => new Response('<html>sign in</html>', { headers: { 'content-type': 'text/html' } }),
			() => answer({ ok: true })
		];
		const times: number[] = [];
		const fetcher = vi.fn(async () => {
			times.push(Date.now());
			return results[Math.min(times.length, results.length) - 1]();
		});
		const problems: boolean[] = [];
		const data: unknown[] = [];
		const start = Date.now();
		poll({
			url: '/api/x',
			every: 1000,
			maxEvery: 3000,
			fetch: fetcher,
			onData: (d) => void data.push(d),
			onProblem: (p) => problems.push(p)
		});
		await vi.advanceTimersByTimeAsync(20_000);
		// Waits double after each failure, up to maxEvery.
		expect(times.slice(0, 4).map((t) => t - start)).toEqual([1000, 3000, 6000, 9000]);
		// Told once when it starts failing and once when it works again.
		expect(problems).toEqual([true, false]);
		expect(data[0]).toEqual({ ok: true });
	});

	it('stops when onData says so, and reads the address before each poll', async () => {
		let page = 1;
		const urls: string[] = [];
		const fetcher = vi.fn(async (url: RequestInfo | URL) => {
			urls.push(String(url));
			return answer({ done: urls.length === 2 });
		});
		poll<{ done: boolean }>({
			url: () => `/api/x?page=${page++}`,
			every: 500,
			immediately: true,
			fetch: fetcher,
			onData: (d) => !d.done
		});
		await vi.advanceTimersByTimeAsync(5000);
		expect(urls).toEqual(['/api/x?page=1', '/api/x?page=2']);
	});
});
