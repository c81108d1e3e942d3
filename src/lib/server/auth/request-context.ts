import { AsyncLocalStorage } from 'node:async_hooks';

/**
 * What Auth.js's callbacks need to know about the request they run inside but are not given:
 * the client's address, for the sign-in limits. hooks.server.ts runs every request inside it, so
 * `authorize()` and the e-mailed link's checks count attempts wherever they come from.
 */
interface RequestContext {
	clientAddress: string;
}

const storage = new AsyncLocalStorage<RequestContext>();

export function runWithRequestContext<T>(context: RequestContext, run: () => T): T {
	return storage.run(context, run);
}

/** The client address of the request being handled ('unknown' outside a request, e.g. scripts). */
export function currentClientAddress(): string {
	return storage.getStore()?.clientAddress ?? 'unknown';
}
