import './env';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';

// A database of this file's own: the demo seed writes fixed addresses.
process.env.DATABASE_PATH = join(mkdtempSync(join(tmpdir(), 'kinelume-demo-lib-')), 'd.db');

const { db, schema } = await import('$lib/server/db');
const { seedDemo } = await import('../../src/scripts/demo/seed');
const { seedDemoExercises } = await import('../../src/scripts/demo/exercises');
const { seedDemoLibrary, DEMO_COLLECTION, DEMO_PUBLISHED } = await import(
	'../../src/scripts/demo/library'
);
const { DEMO_CLIPS } = await import('../../src/scripts/demo/clips/scripts');
const { planDemoClip } = await import('../../src/scripts/demo/clips/timeline');
const { shiftAndClip } = await import('$lib/captions/segment');
const { putObject } = await import('$lib/server/storage');
const { recordingKeys } = await import('$lib/server/storage/keys');
const library = await import('$lib/server/library/public');
const { listQueue } = await import('$lib/server/library/submissions');
const { makeRecording, makeSegment } = await import('./factories');

const CLINICIAN = 'clinician@alder-street.example';
const EDUCATOR = 'educator@alder-street.example';

/**
 * A cut segment for every exercise of the demo scripts, with the script's captions clipped to it
 * exactly as confirming segments clips them, and a clip and poster in storage.
 */
async function cutDemoSegments(clinicId: string): Promise<void> {
	for (const clip of DEMO_CLIPS) {
		const plan = planDemoClip(clip);
		const cues = plan.cues.map((c, i) => ({ id: String(i + 1), ...c }));
		const recording = makeRecording(clinicId, {
			title: clip.title,
			durationSeconds: plan.durationSeconds
		});
		const sections = plan.sections.filter((s) => s.kind === 'exercise');
		for (const [position, section] of sections.entries()) {
			const segment = makeSegment(recording, {
				position,
				title: section.title,
				startSeconds: section.start,
				endSeconds: section.end,
				cues: shiftAndClip(cues, section.start, section.end),
				captionsVersion: 1,
				captionsLanguage: 'en-GB'
			});
			const keys = recordingKeys(clinicId, recording.id);
			await putObject(keys.segment(segment.id), 'demo clip bytes', 'video/mp4');
			await putObject(keys.segmentPoster(segment.id, 0), 'demo poster bytes', 'image/jpeg');
		}
	}
}

describe('demo library', () => {
	it('publishes the chosen demo exercises through review, with a collection and one waiting', async () => {
		await seedDemo();
		const clinic = db()
			.select()
			.from(schema.clinics)
			.where(eq(schema.clinics.name, 'Alder Street Community Clinic'))
			.get()!;
		await cutDemoSegments(clinic.id);
		await seedDemoExercises(CLINICIAN, () => {}, { timeoutMs: 0 });

		const lines: string[] = [];
		const result = await seedDemoLibrary(CLINICIAN, EDUCATOR, (l) => lines.push(l));
		expect(lines).toEqual([]);
		expect(result).toEqual({ published: DEMO_PUBLISHED.length, waiting: 1 });

		const found = library.searchLibrary({
			q: '',
			filters: { region: '', position: '', movement: '', phase: null, equipment: '' },
			page: 1
		});
		expect(found.results.map((r) => r.title).sort()).toEqual([...DEMO_PUBLISHED].sort());
		const heel = library.searchLibrary({
			q: 'heel sli',
			filters: { region: '', position: '', movement: '', phase: null, equipment: '' },
			page: 1
		});
		expect(heel.results[0]?.title).toBe('Heel slides');
		const collection = library.publishedCollections().find((c) => c.title === DEMO_COLLECTION);
		expect(collection).toMatchObject({ count: DEMO_PUBLISHED.length });
		expect(collection?.cover).not.toBeNull();
		expect(listQueue('waiting').map((r) => r.title)).toEqual(['Quadriceps sets']);

		// Running again changes nothing.
		expect(await seedDemoLibrary(CLINICIAN, EDUCATOR, () => {})).toEqual({
			published: 0,
			waiting: 0
		});
		expect(db().select().from(schema.libraryExercises).all()).toHaveLength(DEMO_PUBLISHED.length);
	});
});
