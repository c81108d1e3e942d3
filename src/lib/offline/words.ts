/** What the patient pages say while the phone has no connection; plain words, one or two lines. */

export type OfflinePlace =
	| { page: 'today' }
	| { page: 'replay'; video: 'saved' | 'not-saved' | 'none' };

const LATER = 'sessions you log are sent when you are back online.';

/** The offline line for a patient page. */
export function offlineWords(place: OfflinePlace): string {
	if (place.page === 'today') {
		return `You are offline. This is your programme as it was last saved on this phone. Exercises you have opened before still play; ${LATER}`;
	}
	if (place.video === 'saved') {
		return `You are offline. This exercise and its captions are saved on this phone; ${LATER}`;
	}
	if (place.video === 'not-saved') {
		return `You are offline. The video for this exercise is not saved on this phone yet, so it may not play; ${LATER}`;
	}
	return `You are offline. You can still count your reps; ${LATER}`;
}
