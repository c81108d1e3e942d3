/**
 * Factories for the library tests: a clinic with a clinician and an educator, and exercises on
 * ready segments whose clip and posters are real objects in the storage fake.
 */
import { createTrack, saveVersion } from '$lib/server/captions';
import { db, schema } from '$lib/server/db';
import { putObject } from '$lib/server/storage';
import { recordingKeys } from '$lib/server/storage/keys';
import type { Cue } from '$lib/captions/types';

export interface World {
	clinicId: string;
	clinician: { id: string; clinicId: string; email: string };
	educator: { id: string; name: string; email: string };
}

export function makeWorld(name: string): World {
	const clinicId = db().insert(schema.clinics).values({ name }).returning().get().id;
	const person = (role: 'clinician' | 'educator') => {
		const email = `${role}-${crypto.randomUUID()}@library.example`;
		const user = db()
			.insert(schema.users)
			.values({ email, name: `Test ${role}` })
			.returning()
			.get();
		db().insert(schema.memberships).values({ userId: user.id, clinicId, role }).run();
		return { id: user.id, email, name: `Test ${role}` };
	};
	const clinician = person('clinician');
	const educator = person('educator');
	return { clinicId, clinician: { ...clinician, clinicId }, educator };
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
	const recording = db()
		.insert(schema.recordings)
		.values({
			clinicId: world.clinicId,
			title: 'Knee class',
			originalFilename: 'knee.mp4',
			contentType: 'video/mp4',
			sizeBytes: 1,
			durationSeconds: 30,
			width: 2,
			height: 2,
			videoCodec: 'h264',
			status: 'ready'
		})
		.returning()
		.get();
	if (track) {
		const made = createTrack(recording, { kind: 'captions', language: 'en-GB' });
		saveVersion(made, { baseVersion: 0, cues: track, source: 'import' });
	}
	const segment = db()
		.insert(schema.segments)
		.values({
			recordingId: recording.id,
			clinicId: world.clinicId,
			position: 0,
			title: 'Heel slides',
			startSeconds: 0,
			endSeconds: 9,
			status: 'ready',
			clipDurationSeconds: 9,
			clipSize: CLIP_BYTES.length,
			posterCount: posters,
			cues,
			captionsVersion: 1,
			captionsLanguage: 'en-GB'
		})
		.returning()
		.get();
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
	return db()
		.insert(schema.exercises)
		.values({
			clinicId: world.clinicId,
			segmentId: segment.id,
			title: 'Heel slides',
			description: 'Lying on your back, slide the heel towards you and back.',
			bodyRegion: 'Knee',
			position: 'supine',
			movementType: 'active-assisted',
			equipment: ['Towel'],
			phase: 1,
			coachingCues: [{ text: 'Keep the heel on the bed', atSeconds: 3 }],
			safetyNotes: 'Tightness at the end of the bend is normal. **Stop** if pain is sharp.',
			sets: 1,
			reps: 8,
			holdSeconds: 0,
			restSeconds: 30,
			sessionsPerDay: 3,
			daysPerWeek: 7,
			status: 'ready',
			...changes
		})
		.returning()
		.get();
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
