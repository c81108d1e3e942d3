import { error, redirect } from '@sveltejs/kit';
import { localDateOf } from '$lib/clinical/calendar';
import { describeDosage } from '$lib/dosage';
import { howToMove } from '$lib/sessions/how-to-move';
import { renderSafetyNotes } from '$lib/server/markdown';
import {
	acknowledgeSafety,
	captionStyleOf,
	dosageOn,
	findReplayItem,
	hasAcknowledged,
	itemToday,
	clipShape,
	rangeGuideWords,
	slingOn,
	segmentMedia,
	transcriptLines
} from '$lib/server/sessions';
import { requirePatient } from '$lib/server/sessions/guard';
import { storageOrigin } from '$lib/server/storage/multipart';
import type { Actions, PageServerLoad } from './$types';

/** The patient's own exercise by programme item id; any other id is a 404, as if it did not exist. */
function ownItem(id: string) {
	const { patient } = requirePatient();
	const found = findReplayItem(patient.id, id);
	if (!found) error(404, 'Not found.');
	return { patient, ...found };
}

export const load: PageServerLoad = ({ params }) => {
	const { patient, programme, item, exercise, segment } = ownItem(params.id);
	const today = localDateOf(Date.now(), patient.timeZone);
	const dosage = dosageOn(programme, item, today);
	const safetyHtml = renderSafetyNotes(exercise.safetyNotes);
	const ready = segment?.status === 'ready';
	return {
		itemId: item.id,
		queueOwner: patient.id,
		exercise: {
			title: exercise.title,
			description: exercise.description,
			position: exercise.position,
			side: exercise.side,
			movementType: exercise.movementType,
			equipment: exercise.equipment,
			coachingCues: exercise.coachingCues
		},
		howToMove: howToMove({ ...exercise, affectedSide: patient.affectedSide }),
		programmeTitle: programme.title,
		dosage,
		dosageWords: describeDosage(dosage, item.weekdays),
		safetyHtml,
		// An exercise without notes of its own has nothing to acknowledge; the standing caution stays.
		acknowledged: !safetyHtml || hasAcknowledged(patient.id, exercise.id),
		media: ready && segment ? segmentMedia(segment) : null,
		storageOrigin: storageOrigin(),
		language: segment?.captionsLanguage ?? 'en',
		transcript: ready ? transcriptLines(segment) : [],
		captionStyle: captionStyleOf(patient),
		today: itemToday(patient.id, programme, item, today),
		rangeGuides: rangeGuideWords(patient, item, exercise, today),
		shape: segment ? clipShape(segment) : null,
		slingUntil: slingOn(patient, today)
	};
};

export const actions: Actions = {
	/** "I have read these notes": recorded once per exercise, then the player shows. */
	acknowledge: ({ params, url }) => {
		const { patient, exercise } = ownItem(params.id);
		acknowledgeSafety(patient.id, exercise.id);
		redirect(303, url.pathname);
	}
};
