/**
 * Follow-up fixtures straight into the e2e database: patients of a clinician's clinic with an
 * operation date, and weeks of session logs on a programme made by programme-fixtures.ts.
 */
import { addDays, localDateOf } from '../../src/lib/clinical/calendar';
import type { Page } from '@playwright/test';
import { database, signedInRequest } from './support';

/** The patients' today (the fixtures' patients live in London). */
export function londonToday(): string {
	return localDateOf(Date.now(), 'Europe/London');
}

/** A patient of `clinicianEmail`'s clinic, looked after by them, who has not signed up. */
export function seedCaseloadPatient(
	clinicianEmail: string,
	{
		name,
		operationDaysAgo = 42,
		affectedSide = 'left'
	}: { name: string; operationDaysAgo?: number | null; affectedSide?: string }
): string {
	const db = database();
	const id = crypto.randomUUID();
	try {
		const member = db
			.prepare(
				'select m.clinic_id as clinicId, u.id as userId from membership m join user u on u.id = m.user_id where u.email = ?'
			)
			.get(clinicianEmail) as { clinicId: string; userId: string };
		db.prepare(
			`insert into patient (id, clinic_id, full_name, email, affected_side, condition, operation_date, protocol, time_zone, created_at)
			 values (?, ?, ?, ?, ?, ?, ?, 'knee-replacement', 'Europe/London', ?)`
		).run(
			id,
			member.clinicId,
			name,
			`caseload-${id.slice(0, 8)}@followup-e2e.example`,
			affectedSide,
			`${affectedSide === 'right' ? 'Right' : 'Left'} total knee replacement`,
			operationDaysAgo === null ? null : addDays(londonToday(), -operationDaysAgo),
			Date.now()
		);
		db.prepare('insert into patient_clinician (patient_id, clinician_user_id) values (?, ?)').run(
			id,
			member.userId
		);
	} finally {
		db.close();
	}
	return id;
}

/** One log per entry, at 10:00 UTC on its day (London's day too), with its pain score. */
export function seedSessionLogs(
	patientId: string,
	programmeItemId: string,
	days: { date: string; pain: number }[]
): void {
	const db = database();
	try {
		const { clinicId } = db
			.prepare('select clinic_id as clinicId from patient where id = ?')
			.get(patientId) as { clinicId: string };
		const insert = db.prepare(
			`insert into session_log (id, clinic_id, patient_id, programme_item_id, client_id, done_at, local_date,
			 sets_done, reps_done, pain, note, created_at) values (?, ?, ?, ?, ?, ?, ?, 1, 10, ?, '', ?)`
		);
		for (const { date, pain } of days) {
			insert.run(
				crypto.randomUUID(),
				clinicId,
				patientId,
				programmeItemId,
				crypto.randomUUID(),
				Date.parse(`${date}T10:00:00Z`),
				date,
				pain,
				Date.now()
			);
		}
	} finally {
		db.close();
	}
}

/** Every date from `daysAgo` days before today up to `untilDaysAgo` days before (inclusive). */
export function daysBack(daysAgo: number, untilDaysAgo = 0): string[] {
	const today = londonToday();
	const out: string[] = [];
	for (let d = daysAgo; d >= untilDaysAgo; d--) out.push(addDays(today, -d));
	return out;
}

/**
 * Signs `page` in by the password form's action and hands the session cookie to the browser:
 * for tests about what comes after signing in (sign-in itself is tested in sign-in.e2e.ts).
 */
export async function signInAs(page: Page, email: string): Promise<void> {
	const request = await signedInRequest(email);
	const { cookies } = await request.storageState();
	await page.context().addCookies(cookies);
	await request.dispose();
}
