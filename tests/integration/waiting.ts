/** Waiting in integration tests for a condition: vitest's own `vi.waitFor`, naming what it waited for. */
import { vi } from 'vitest';

/**
 * Resolves with what `check` answers once it is truthy; gives up after `ms` saying what it
 * waited for (`what` may be a function, read at that moment, to add what the system said).
 */
export function waitFor<T>(
	what: string | (() => string),
	check: () => T | false | null | undefined,
	ms = 90_000
): Promise<T> {
	return vi.waitFor(
		() => {
			const value = check();
			if (!value)
				throw new Error(`Gave up waiting for ${typeof what === 'string' ? what : what()}.`);
			return value;
		},
		{ timeout: ms, interval: 50 }
	);
}
