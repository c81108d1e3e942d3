import { existsSync } from 'node:fs';
import { dirname } from 'node:path';
import { describe, expect, inject, it } from 'vitest';

// Deliberately does not import ./env: this checks what reaches a worker by itself.
describe('test environment from global-setup', () => {
	const provided = inject('testEnv');

	it('reaches the worker through process.env', () => {
		expect(process.env.S3_ENDPOINT).toBe(provided.S3_ENDPOINT);
		expect(process.env.SMTP_PORT).toBe(provided.SMTP_PORT);
		expect(process.env.DEV_INBOX_URL).toBe(provided.DEV_INBOX_URL);
		expect(process.env.DATABASE_PATH).toBe(provided.DATABASE_PATH);
	});

	it('points at fakes listening on loopback ports chosen at start', () => {
		expect(provided.S3_ENDPOINT).toMatch(/^http:\/\/127\.0\.0\.1:\d+$/);
		expect(provided.S3_ENDPOINT).not.toBe('http://127.0.0.1:4569');
		expect(Number(provided.SMTP_PORT)).toBeGreaterThan(0);
		expect(provided.SMTP_PORT).not.toBe('2525');
		expect(provided.DEV_INBOX_URL).toMatch(/^http:\/\/127\.0\.0\.1:\d+$/);
	});

	it('gives a database path inside the scratch directory, not the development database', () => {
		expect(dirname(provided.DATABASE_PATH)).toBe(inject('fakesDirectory'));
		expect(existsSync(inject('fakesDirectory'))).toBe(true);
	});
});
