/**
 * Public exercises written straight into the database, without review or media: for the
 * search tests and the library benchmark, which need many published exercises fast. Never used
 * by the app itself.
 */
import { MOVEMENT_TYPES, POSITIONS } from '../../lib/exercises/vocabulary';
import type { ExerciseSnapshot } from '../../lib/library/types';
import { db } from '../../lib/server/db';
import { libraryExercises, libraryVersions } from '../../lib/server/db/schema';
import { forgetCatalogue } from '../../lib/server/library/catalogue';
import { rebuildSearchIndex, reindexEntry } from '../../lib/server/library/search-index';

/** Inserts one public exercise (published unless told) with a single version; returns its ids. */
export function insertPublishedEntry(
	clinicId: string,
	slug: string,
	snapshot: ExerciseSnapshot,
	{ status = 'published' }: { status?: 'published' | 'unpublished' | 'retired' } = {}
): { entryId: string; versionId: string } {
	const entryId = crypto.randomUUID();
	const versionId = crypto.randomUUID();
	db().transaction((tx) => {
		tx.insert(libraryExercises)
			.values({ id: entryId, slug, clinicId, status, currentVersionId: versionId })
			.run();
		tx.insert(libraryVersions)
			.values(versionValues(entryId, versionId, snapshot))
			.run();
		reindexEntry(entryId);
	});
	forgetCatalogue();
	return { entryId, versionId };
}

function versionValues(entryId: string, versionId: string, snapshot: ExerciseSnapshot) {
	return {
		id: versionId,
		libraryExerciseId: entryId,
		version: 1,
		title: snapshot.title,
		bodyRegion: snapshot.bodyRegion,
		position: snapshot.position,
		movementType: snapshot.movementType,
		phase: snapshot.phase,
		equipment: snapshot.equipment,
		snapshot,
		licence: 'cc-by-nc-4.0' as const,
		attribution: 'Kinelume test data',
		posterCount: 0,
		clipDurationSeconds: snapshot.segment.durationSeconds
	};
}

// Invented words for generated exercises (no real protocol is described).
const ACTIONS = [
	'slide',
	'lift',
	'press',
	'bend',
	'straighten',
	'squeeze',
	'rock',
	'reach',
	'step',
	'turn',
	'march',
	'tap'
];
const PARTS = ['heel', 'knee', 'hip', 'ankle', 'toes', 'thigh', 'calf', 'foot', 'leg', 'trunk'];
const REGIONS = ['Knee', 'Hip', 'Ankle and foot', 'Balance', 'Back', 'Whole body'];
const EQUIPMENT = ['Chair', 'Towel', 'Step', 'Resistance band', 'Bed', 'Wall', 'Stick'];
const FILLER = [
	'slowly',
	'gently',
	'hold',
	'breathe',
	'out',
	'relax',
	'return',
	'start',
	'position',
	'keep',
	'the',
	'your',
	'back',
	'flat',
	'tall',
	'steady',
	'count',
	'three',
	'again',
	'rest',
	'comfortable',
	'range',
	'tightness',
	'normal',
	'stop',
	'sharp',
	'pain',
	'support',
	'balance',
	'weight'
];

/** A small deterministic generator (mulberry32), so every run indexes the same library. */
function random(seed: number) {
	let a = seed >>> 0;
	return () => {
		a = (a + 0x6d2b79f5) >>> 0;
		let t = a;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

/** One generated snapshot; `n` makes the title unique. */
export function syntheticSnapshot(n: number, next: () => number): ExerciseSnapshot {
	const pick = <T>(list: readonly T[]) => list[Math.floor(next() * list.length)];
	const words = (count: number) => Array.from({ length: count }, () => pick(FILLER)).join(' ');
	const action = pick(ACTIONS);
	const part = pick(PARTS);
	const position = pick(POSITIONS);
	const cues = Array.from({ length: 4 + Math.floor(next() * 6) }, (_, i) => ({
		id: String(i + 1),
		start: i * 3,
		end: i * 3 + 2,
		text: `${action} the ${part} ${words(5)}`
	}));
	return {
		title: `${action[0].toUpperCase()}${action.slice(1)} the ${part}, ${position} ${n}`,
		description: `${words(12)} ${action} ${part} ${words(8)}`,
		bodyRegion: pick(REGIONS),
		side: 'either',
		position,
		movementType: pick(MOVEMENT_TYPES),
		equipment:
			next() < 0.5
				? [pick(EQUIPMENT)]
				: [pick(EQUIPMENT), pick(EQUIPMENT)].filter((v, i, a) => a.indexOf(v) === i),
		phase: 1 + Math.floor(next() * 4),
		dosage: {
			sets: 1,
			reps: 8,
			holdSeconds: 0,
			restSeconds: 30,
			sessionsPerDay: 3,
			daysPerWeek: 7
		},
		coachingCues: [{ text: `${words(4)} ${part}` }, { text: words(6) }],
		safetyNotes: 'Tightness at the end of the movement is normal. Stop if pain is sharp.',
		precautionTags: [],
		segment: {
			id: crypto.randomUUID(),
			durationSeconds: cues.length * 3,
			posterCount: 0,
			captionsLanguage: 'en-GB'
		},
		cues
	};
}

/**
 * Inserts `count` generated published exercises in one transaction and rebuilds the index once
 * (much faster than indexing each); returns their slugs.
 */
export function insertSyntheticLibrary(clinicId: string, count: number, seed = 2026): string[] {
	const next = random(seed);
	const store = db();
	const slugs: string[] = [];
	store.transaction((tx) => {
		for (let n = 1; n <= count; n++) {
			const snapshot = syntheticSnapshot(n, next);
			const slug = `generated-${n}`;
			const entryId = crypto.randomUUID();
			const versionId = crypto.randomUUID();
			tx.insert(libraryExercises)
				.values({ id: entryId, slug, clinicId, status: 'published', currentVersionId: versionId })
				.run();
			tx.insert(libraryVersions)
				.values(versionValues(entryId, versionId, snapshot))
				.run();
			slugs.push(slug);
		}
	});
	rebuildSearchIndex();
	forgetCatalogue();
	return slugs;
}
