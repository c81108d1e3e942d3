import './env';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';

// A database of this file's own: the demo seed writes fixed addresses.
process.env.DATABASE_PATH = join(mkdtempSync(join(tmpdir(), 'kinelume-demo-ex-')), 'd.db');

const { db, schema } = await import('../../src/lib/server/db');
const { seedDemo } = await import('../../src/scripts/demo/seed');
const { seedDemoExercises } = await import('../../src/scripts/demo/exercises');
const { makeRecording, makeSegment } = await import('./factories');

const CLINICIAN = 'clinician@alder-street.example';

function segmentFor(clinicId: string, title: string) {
	makeSegment(makeRecording(clinicId, { title: `Demo ${title}` }), { title });
}

describe('demo exercises', () => {
	it('wait for no segment they lack, then complete and publish once the segments are cut', async () => {
		await seedDemo();
		const lines: string[] = [];
		const before = await seedDemoExercises(CLINICIAN, (l) => lines.push(l), { timeoutMs: 0 });
		expect(before).toEqual({ exercises: 7, published: false });
		expect(lines.join('\n')).toMatch(/stay drafts/);
		const drafts = db().select().from(schema.exercises).all();
		expect(drafts.every((e) => e.status === 'draft' && e.segmentId === null)).toBe(true);

		const clinic = db()
			.select()
			.from(schema.clinics)
			.where(eq(schema.clinics.name, 'Alder Street Community Clinic'))
			.get()!;
		for (const e of drafts) segmentFor(clinic.id, e.title);
		const after = await seedDemoExercises(CLINICIAN, () => {}, { timeoutMs: 0 });
		expect(after).toEqual({ exercises: 7, published: true });
		expect(
			db()
				.select()
				.from(schema.exercises)
				.all()
				.every((e) => e.status === 'ready' && e.segmentId)
		).toBe(true);

		const patient = db()
			.select()
			.from(schema.patients)
			.where(eq(schema.patients.email, 'patient@alder-street.example'))
			.get()!;
		expect(patient).toMatchObject({ protocol: 'knee-replacement' });
		expect(patient.operationDate).toMatch(/^\d{4}-\d{2}-\d{2}$/);
		const programmes = db()
			.select()
			.from(schema.programmes)
			.where(eq(schema.programmes.patientId, patient.id))
			.all();
		expect(programmes.map((p) => [p.title, p.status]).sort()).toEqual([
			['First weeks at home', 'published'],
			['Weeks 2 to 6 (draft)', 'draft']
		]);

		// Running again changes nothing.
		expect(await seedDemoExercises(CLINICIAN, () => {}, { timeoutMs: 0 })).toEqual({
			exercises: 7,
			published: false
		});
		expect(db().select().from(schema.exercises).all()).toHaveLength(7);
	});
});
