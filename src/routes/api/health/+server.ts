import { json } from '@sveltejs/kit';
import { sql } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { checkStorage } from '$lib/server/storage';
import { checkMail } from '$lib/server/mail';
import { mediaToolReport, type MediaToolReport } from '$lib/server/media/ffmpeg';
import type { RequestHandler } from './$types';

/** What anyone may know: up or not. */
export interface PublicHealth {
	status: 'ok' | 'degraded';
}

/** What a clinic's admin sees: each service, with its address and any error. */
export interface HealthReport extends PublicHealth {
	database: { ok: boolean; detail: string };
	storage: { ok: boolean; detail: string };
	mail: { ok: boolean; detail: string };
	/** Which ffmpeg and ffprobe this process runs (path, where from, version line). */
	ffmpeg: MediaToolReport;
	ffprobe: MediaToolReport;
}

function checkDatabase(): { ok: boolean; detail: string } {
	try {
		db().get(sql`select 1`);
		return { ok: true, detail: 'SQLite answers' };
	} catch (e) {
		return { ok: false, detail: e instanceof Error ? e.message : String(e) };
	}
}

/**
 * Whether each service Kinelume needs is reachable: 200 or 503 for anyone, with only the
 * overall status; the details (service addresses, error messages) only for an admin, since they
 * tell an attacker where the storage and mail servers are and what fails.
 */
export const GET: RequestHandler = async ({ locals }) => {
	const [storage, mail] = await Promise.all([checkStorage(), checkMail()]);
	const database = checkDatabase();
	const ok = database.ok && storage.ok && mail.ok;
	const status = ok ? 'ok' : 'degraded';
	const headers = { 'Cache-Control': 'no-store' };
	if (locals.user?.role !== 'admin') {
		return json({ status } satisfies PublicHealth, { status: ok ? 200 : 503, headers });
	}
	// The media tools are reported, not counted in the status: the web process serves without
	// them (the worker runs ffmpeg), and a broken tool shows in each media job's error.
	const [ffmpeg, ffprobe] = await Promise.all([
		mediaToolReport('ffmpeg'),
		mediaToolReport('ffprobe')
	]);
	const report: HealthReport = { status, database, storage, mail, ffmpeg, ffprobe };
	return json(report, { status: ok ? 200 : 503, headers });
};
