import { inject } from 'vitest';
import type { TestEnv } from './global-setup';

/**
 * Import this first in an integration test: it copies the addresses global-setup provided into
 * process.env before any app module reads its configuration.
 */
export const testEnv: TestEnv = inject('testEnv');
export const fakesDirectory: string = inject('fakesDirectory');

Object.assign(process.env, testEnv);

/** Runs `fn` with some variables changed, for checks that need a fresh module reading them. */
export async function withEnv<T>(
	changes: Partial<Record<keyof TestEnv, string>>,
	fn: () => Promise<T>
): Promise<T> {
	const saved = Object.fromEntries(Object.keys(changes).map((key) => [key, process.env[key]]));
	Object.assign(process.env, changes);
	try {
		return await fn();
	} finally {
		for (const [key, value] of Object.entries(saved)) {
			if (value === undefined) delete process.env[key];
			else process.env[key] = value;
		}
	}
}
