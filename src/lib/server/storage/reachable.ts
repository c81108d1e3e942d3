/**
 * Whether an error means the storage service could not be reached or could not answer now
 * (refused or dropped connection, no name, a timeout, a 5xx or throttling answer), as opposed to
 * a refusal that would come again (no such object, access denied, a bad request). Work that
 * meets the first kind waits and tries again without using up its attempts.
 */

const NETWORK_CODES = new Set([
	'ECONNREFUSED',
	'ECONNRESET',
	'ENOTFOUND',
	'EAI_AGAIN',
	'EPIPE',
	'ETIMEDOUT',
	'EHOSTUNREACH',
	'ENETUNREACH',
	'UND_ERR_SOCKET',
	'UND_ERR_CONNECT_TIMEOUT'
]);
const NETWORK_NAMES = new Set(['TimeoutError', 'RequestTimeout', 'SlowDown', 'ServiceUnavailable']);

interface ErrorShape {
	code?: unknown;
	name?: unknown;
	cause?: unknown;
	errors?: unknown;
	$metadata?: { httpStatusCode?: number };
}

export function storageUnreachable(error: unknown, depth = 0): boolean {
	if (!error || typeof error !== 'object' || depth > 4) return false;
	const shape = error as ErrorShape;
	if (typeof shape.code === 'string' && NETWORK_CODES.has(shape.code)) return true;
	if (typeof shape.name === 'string' && NETWORK_NAMES.has(shape.name)) return true;
	const status = shape.$metadata?.httpStatusCode;
	if (typeof status === 'number' && status >= 500) return true;
	// Node wraps a failed connection in AggregateError (one per address tried) or a cause.
	if (Array.isArray(shape.errors) && shape.errors.some((e) => storageUnreachable(e, depth + 1))) {
		return true;
	}
	return storageUnreachable(shape.cause, depth + 1);
}
