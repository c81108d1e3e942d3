import { json } from '@sveltejs/kit';
import { sql } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { checkStorage } from '$lib/server/storage';
import { checkMail } from '$lib/server/mail';
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
	const body: PublicHealth | HealthReport =
		locals.user?.role === 'admin' ? { status, database, storage, mail } : { status };
	return json(body, { status: ok ? 200 : 503, headers: { 'Cache-Control': 'no-store' } });
};
