import { json } from '@sveltejs/kit';
import { sql } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { checkStorage } from '$lib/server/storage';
import { checkMail } from '$lib/server/mail';
import type { RequestHandler } from './$types';

export interface HealthReport {
	status: 'ok' | 'degraded';
	database: { ok: boolean; detail: string };
	storage: { ok: boolean; detail: string };
	mail: { ok: boolean; detail: string };
}

function checkDatabase(): { ok: boolean; detail: string } {
	try {
		db().get(sql`select 1`);
		return { ok: true, detail: 'SQLite answers' };
	} catch (e) {
		return { ok: false, detail: e instanceof Error ? e.message : String(e) };
	}
}

/** Public: reports whether each service Kinelume needs is reachable, without any data. */
export const GET: RequestHandler = async () => {
	const [storage, mail] = await Promise.all([checkStorage(), checkMail()]);
	const database = checkDatabase();
	const ok = database.ok && storage.ok && mail.ok;
	const report: HealthReport = { status: ok ? 'ok' : 'degraded', database, storage, mail };
	return json(report, { status: ok ? 200 : 503, headers: { 'Cache-Control': 'no-store' } });
};
