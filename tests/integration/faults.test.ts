import { fakesDirectory } from './env';
import { spawn } from 'node:child_process';
import { join, resolve } from 'node:path';
import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';

// A database of this file's own, chosen before any app module reads the configuration.
process.env.DATABASE_PATH = join(fakesDirectory, `faults-${process.pid}.db`);

const { db, schema } = await import('$lib/server/db');
const { makeClinic, makeExercise, makePatient, makeProgramme } = await import('./factories');

const TSX = resolve('node_modules/.bin/tsx');
const WRITER = resolve('tests/integration/session-writers-child.ts');

function runWriter(env: Record<string, string>): Promise<{ acknowledged: number }> {
	return new Promise((done, fail) => {
		const child = spawn(TSX, [WRITER], {
			env: { ...process.env, ...env },
			stdio: ['ignore', 'pipe', 'pipe']
		});
		let stdout = '';
		let stderr = '';
		child.stdout.on('data', (chunk: Buffer) => (stdout += chunk.toString()));
		child.stderr.on('data', (chunk: Buffer) => (stderr += chunk.toString()));
		child.on('error', fail);
		child.on('close', (code) =>
			code === 0
				? done(JSON.parse(stdout.slice(stdout.lastIndexOf('{'))) as { acknowledged: number })
				: fail(new Error(`writer exited with ${code}: ${stderr}`))
		);
	});
}

describe('faults survived, nothing lost', () => {
	it('keeps every session log when four processes write to SQLite at once (busy waits, no loss)', async () => {
		const clinic = makeClinic('Contention clinic');
		const patient = makePatient(clinic.id, 'Contention Patient');
		const exercise = makeExercise(clinic.id, 'Heel slides');
		const { items } = makeProgramme(patient, [exercise.id]);
		// Open here first: the writers then find the database migrated.
		db();

		const writers = 4;
		const logs = 40;
		const startAt = String(Date.now() + 1500);
		const results = await Promise.all(
			Array.from({ length: writers }, () =>
				runWriter({
					PATIENT_ID: patient.id,
					ITEM_ID: items[0].id,
					START_AT: startAt,
					LOGS: String(logs)
				})
			)
		);
		const acknowledged = results.reduce((sum, r) => sum + r.acknowledged, 0);
		const stored = db()
			.select()
			.from(schema.sessionLogs)
			.where(eq(schema.sessionLogs.patientId, patient.id))
			.all();
		expect(acknowledged).toBe(writers * logs);
		expect(stored).toHaveLength(acknowledged);
		expect(new Set(stored.map((l) => l.clientId)).size).toBe(stored.length);
	}, 120_000);
});
