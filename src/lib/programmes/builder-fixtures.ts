/**
 * Test support, not a test (vitest runs only `*.test.ts`): an exercise as the programme builder
 * is sent it, for the builder's unit tests. Heel slides, ready, with a 40 s demonstration.
 */
import type { BuilderExercise } from './builder';

export function builderExercise(changes: Partial<BuilderExercise> = {}): BuilderExercise {
	return {
		id: '11111111-1111-4111-8111-111111111111',
		title: 'Heel slides',
		bodyRegion: 'Knee',
		position: 'supine',
		movementType: 'active-assisted',
		phase: 2,
		equipment: [],
		precautionTags: [],
		dosageBounds: null,
		secondsPerRep: null,
		segmentSeconds: 40,
		defaultDosage: {
			sets: 1,
			reps: 8,
			holdSeconds: 0,
			restSeconds: 30,
			sessionsPerDay: 3,
			daysPerWeek: 7
		},
		defaultProgression: { kind: 'reps', addPerWeek: 2, ceiling: 15 },
		posterUrl: null,
		status: 'ready',
		hasSegment: true,
		...changes
	};
}
