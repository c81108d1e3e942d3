import { describe, expect, it } from 'vitest';
import { storageUnreachable } from './reachable';

const withCode = (code: string) => Object.assign(new Error(code), { code });

describe('storageUnreachable', () => {
	it('is true when storage could not be reached or could not answer now', () => {
		expect(storageUnreachable(withCode('ECONNREFUSED'))).toBe(true);
		expect(storageUnreachable(withCode('ECONNRESET'))).toBe(true);
		expect(storageUnreachable(Object.assign(new Error('t'), { name: 'TimeoutError' }))).toBe(true);
		// S3 answers 503 SlowDown when throttling (a 5xx means try again later).
		expect(
			storageUnreachable(
				Object.assign(new Error('x'), { name: 'SlowDown', $metadata: { httpStatusCode: 503 } })
			)
		).toBe(true);
		expect(
			storageUnreachable(
				Object.assign(new Error('x'), { name: 'InternalError', $metadata: { httpStatusCode: 500 } })
			)
		).toBe(true);
		// Node's happy-eyeballs connect fails with one error per address tried.
		expect(storageUnreachable(new AggregateError([withCode('ECONNREFUSED')], 'all failed'))).toBe(
			true
		);
		expect(storageUnreachable(new Error('fetch failed', { cause: withCode('ENOTFOUND') }))).toBe(
			true
		);
	});

	it('is false for refusals that would come again, and for anything else', () => {
		expect(
			storageUnreachable(
				Object.assign(new Error('x'), { name: 'NoSuchKey', $metadata: { httpStatusCode: 404 } })
			)
		).toBe(false);
		expect(
			storageUnreachable(
				Object.assign(new Error('x'), { name: 'AccessDenied', $metadata: { httpStatusCode: 403 } })
			)
		).toBe(false);
		expect(storageUnreachable(new Error('ffmpeg exited with code 1'))).toBe(false);
		expect(storageUnreachable('ECONNREFUSED')).toBe(false);
		expect(storageUnreachable(null)).toBe(false);
	});
});
