/**
 * The patient pages' side of the service worker (browser only): registering it (SvelteKit's own
 * registration is off, so staff and public pages never install it) and telling it what to keep.
 */
import { dev } from '$app/environment';
import type { WorkerMessage } from './messages';

let registering: Promise<ServiceWorkerRegistration | null> | null = null;

/** Registers /service-worker.js once per page load; null where the browser has none. */
export function registerOfflineWorker(): Promise<ServiceWorkerRegistration | null> {
	if (!('serviceWorker' in navigator)) return Promise.resolve(null);
	registering ??= navigator.serviceWorker
		.register('/service-worker.js', { type: dev ? 'module' : 'classic' })
		// Offline, or refused: the pages work as before, only without saved copies.
		.catch(() => null);
	return registering;
}

/** Sends `message` to the active worker once there is one. */
export async function tellOfflineWorker(message: WorkerMessage): Promise<void> {
	if (!(await registerOfflineWorker())) return;
	const ready = await navigator.serviceWorker.ready;
	ready.active?.postMessage(message);
}
