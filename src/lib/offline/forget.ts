/**
 * Deleting a patient's offline copies from the page itself (browser only): at sign-out, before the
 * form is sent, and on any page whose viewer is not a patient (another sign-in on this phone).
 * The session logs waiting to be sent are not touched: they live in IndexedDB, one key per
 * patient, and are sent when that patient is back.
 */
import { isPatientCache } from './scope';
import type { WorkerMessage } from './messages';

/** Deletes every patient cache and tells the worker to stop any saving under way. */
export async function forgetOfflineCopies(): Promise<void> {
	const forget: WorkerMessage = { type: 'forget' };
	navigator.serviceWorker?.controller?.postMessage(forget);
	if (typeof caches === 'undefined') return;
	const names = await caches.keys();
	await Promise.all(names.filter(isPatientCache).map((name) => caches.delete(name)));
}

/**
 * Submit handler for sign-out forms: forgets this phone's copies first (waiting two seconds at
 * most), then sends the form as it would have gone. Without scripts the form goes at once and the
 * signed-out page that follows forgets them instead.
 */
export function forgetThenSubmit(event: SubmitEvent) {
	const form = event.currentTarget;
	if (!(form instanceof HTMLFormElement)) return;
	event.preventDefault();
	const wait = new Promise<void>((resolve) => setTimeout(resolve, 2_000));
	void Promise.race([forgetOfflineCopies().catch(() => undefined), wait]).then(() => form.submit());
}
