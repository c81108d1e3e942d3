/**
 * Factories for the library tests, on the shared ones (factories.ts): a clinic with a clinician
 * and an educator, and exercises on ready segments whose clip and posters are real objects in
 * the storage fake.
 */
import { createTrack, saveVersion } from '$lib/server/captions';
import type { schema } from '$lib/server/db';
import { putObject } from '$lib/server/storage';
import { recordingKeys } from '$lib/server/storage/keys';
import type { Cue } from '$lib/captions/types';
import * as factories from './factories';

const { makeClinic, makeRecording, makeStaff } = factories;

export interface World {
	clinicId: string;
	clinician: { id: string; clinicId: string; email: string };
	educator: { id: string; name: string; email: string };
}

export function makeWorld(name: string): World {
	const clinicId = makeClinic(name).id;
	const clinician = makeStaff(clinicId, 'clinician');
	const educator = makeStaff(clinicId, 'educator');
	return {
		clinicId,
		clinician: { id: clinician.id, clinicId, email: clinician.email },
		educator: { id: educator.id, name: educator.name!, email: educator.email }
	};
}

export const GOOD_CUES: Cue[] = [
	{ id: '1', start: 0, end: 2, text: 'Lie on your back.' },
	{ id: '2', start: 3, end: 5, text: 'Slide the heel in.' },
	{ id: '3', start: 6, end: 8, text: 'And slide it out.' }
];

export const CLIP_BYTES = new TextEncoder().encode('a clip of a heel slide, as bytes');
export const POSTER_BYTES = new TextEncoder().encode('a poster of a heel slide');

/**
 * A ready recording and segment (0–9 s) with its clip and `posters` posters in storage. With
 * `track`, the recording gets a captions track of those cues (in the recording's seconds),
 * which the segment's captions then follow.
 */
export async function makeSegment(
	world: World,
	{ cues = GOOD_CUES, posters = 2, track }: { cues?: Cue[]; posters?: number; track?: Cue[] } = {}
) {
	const recording = makeRecording(world.clinicId);
	if (track) {
		const made = createTrack(recording, { kind: 'captions', language: 'en-GB' });
		saveVersion(made, { baseVersion: 0, cues: track, source: 'import' });
	}
	const segment = factories.makeSegment(recording, {
		endSeconds: 9,
		clipSize: CLIP_BYTES.length,
		posterCount: posters,
		cues,
		captionsVersion: 1,
		captionsLanguage: 'en-GB'
	});
	const keys = recordingKeys(world.clinicId, recording.id);
	await putObject(keys.segment(segment.id), CLIP_BYTES, 'video/mp4');
	for (let i = 0; i < posters; i++) {
		await putObject(keys.segmentPoster(segment.id, i), POSTER_BYTES, 'image/jpeg');
	}
	return segment;
}

export async function makeExercise(
	world: World,
	changes: Partial<typeof schema.exercises.$inferInsert> = {},
	segmentOptions: Parameters<typeof makeSegment>[1] = {}
) {
	const segment = await makeSegment(world, segmentOptions);
	return factories.makeExercise(world.clinicId, 'Heel slides', {
		segmentId: segment.id,
		description: 'Lying on your back, slide the heel towards you and back.',
		movementType: 'active-assisted',
		equipment: ['Towel'],
		coachingCues: [{ text: 'Keep the heel on the bed', atSeconds: 3 }],
		safetyNotes: 'Tightness at the end of the bend is normal. **Stop** if pain is sharp.',
		restSeconds: 30,
		...changes
	});
}

/** The submission form's input with the exercise's own words. */
export function submissionInput(
	exercise: typeof schema.exercises.$inferSelect,
	changes: Partial<{ description: string; safetyNotes: string; title: string }> = {}
) {
	return {
		wording: {
			title: changes.title ?? exercise.title,
			description: changes.description ?? exercise.description,
			coachingCues: exercise.coachingCues.map((c) => c.text),
			safetyNotes: changes.safetyNotes ?? exercise.safetyNotes
		},
		consentConfirmed: true,
		consentDetails: 'Signed form kept in the clinic office',
		licence: 'cc-by-nc-4.0' as const,
		attribution: 'Test clinic physiotherapy team',
		noteToReviewer: ''
	};
}

export const ALL_JUDGEMENT = ['safe-demonstration', 'plain-words', 'no-identifying-detail'];
