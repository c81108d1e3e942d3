/**
 * The queue contract test's pieces (queue-engines.test.ts and its worker child): a job handler
 * whose behaviour is written in its recording's title, and a Redis server of the test's own.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync } from 'node:fs';
import { eq } from 'drizzle-orm';
import { db, schema } from '../../src/lib/server/db';
import type { JobHandler } from '../../src/lib/server/jobs/engine';
import getPort from 'get-port';

export interface NoteInput {
	recordingId: string;
	title: string;
	attempt: number;
}

/**
 * Reads the recording's title where the database is (`prepare`), works from the title alone
 * (`run`: `ok …` answers it in capitals, `fail N …` fails its first N attempts, `hang …` runs
 * until stopped, unless told it `hangs: false`) and writes the answer back as the title (`apply`). A final failure or a cancel
 * is written as the recording's failure reason.
 */
export function noteHandler(
	onRun: (input: NoteInput) => void = () => {},
	{ hangs = true } = {}
): JobHandler<NoteInput, { title: string }> {
	return {
		prepare(job) {
			const row = db()
				.select({ title: schema.recordings.title })
				.from(schema.recordings)
				.where(eq(schema.recordings.id, job.recordingId))
				.get();
			return row ? { recordingId: job.recordingId, title: row.title, attempt: job.attempts } : null;
		},
		async run(input, context) {
			onRun(input);
			const [word, count] = input.title.split(' ');
			if (word === 'fail' && input.attempt <= Number(count)) {
				throw new Error(`storage unavailable (attempt ${input.attempt})`);
			}
			if (word === 'hang' && hangs) {
				context.report('hanging', 0.5);
				await new Promise((_, reject) => {
					context.signal.addEventListener('abort', () => reject(context.signal.reason as Error));
				});
			}
			context.report('noting', 1);
			return { title: input.title.toUpperCase() };
		},
		apply(job, result) {
			db()
				.update(schema.recordings)
				.set({ title: result.title })
				.where(eq(schema.recordings.id, job.recordingId))
				.run();
		},
		failed(job, reason) {
			db()
				.update(schema.recordings)
				.set({ status: 'failed', failureReason: reason })
				.where(eq(schema.recordings.id, job.recordingId))
				.run();
		},
		cancelled(job) {
			db()
				.update(schema.recordings)
				.set({ failureReason: 'cancelled' })
				.where(eq(schema.recordings.id, job.recordingId))
				.run();
		}
	};
}

export const REDIS_SERVER = process.env.REDIS_SERVER_PATH ?? '/usr/bin/redis-server';

/**
 * Starts a throwaway redis-server (no persistence) on a free port; resolves once it accepts
 * commands. Fails with a sentence when redis-server is not installed.
 */
export async function startRedis(): Promise<{ url: string; stop(): Promise<void> }> {
	if (!existsSync(REDIS_SERVER)) {
		throw new Error(
			`The BullMQ queue tests need redis-server at ${REDIS_SERVER}: install it (apt-get install -y redis-server) or set REDIS_SERVER_PATH. .ci/run installs it.`
		);
	}
	const port = await getPort({ host: '127.0.0.1' });
	const server: ChildProcess = spawn(
		REDIS_SERVER,
		['--port', String(port), '--bind', '127.0.0.1', '--save', '', '--appendonly', 'no'],
		{ stdio: ['ignore', 'pipe', 'pipe'] }
	);
	let output = '';
	await new Promise<void>((resolve, reject) => {
		const read = (chunk: Buffer) => {
			output += chunk.toString();
			if (output.includes('Ready to accept connections')) resolve();
		};
		server.stdout!.on('data', read);
		server.stderr!.on('data', read);
		server.once('error', reject);
		server.once('exit', (code) => reject(new Error(`redis-server exited (${code}): ${output}`)));
	});
	return {
		url: `redis://127.0.0.1:${port}`,
		stop: () =>
			new Promise((resolve) => {
				if (server.exitCode !== null) return resolve();
				server.once('exit', () => resolve());
				server.kill('SIGKILL');
			})
	};
}
