import { and, eq } from 'drizzle-orm';
import { isPainAlert, PAIN_SEVERE_FROM } from '$lib/clinical/pain';
import { formatDate } from '$lib/followup/words';
import type { StoredSessionLog } from '$lib/sessions/log';
import { config } from '../config';
import { db, schema } from '../db';
import type { Patient } from '../db/schema';
import { sendMail } from '../mail';
import { painAlertMail } from '../mail/templates';

/** Who is told: the patient's own clinicians, or every clinician of the clinic when none is named. */
function recipientsOf(patient: Patient): { email: string; name: string }[] {
	const own = db()
		.select({ email: schema.users.email, name: schema.users.name })
		.from(schema.patientClinicians)
		.innerJoin(schema.users, eq(schema.users.id, schema.patientClinicians.clinicianUserId))
		.innerJoin(
			schema.memberships,
			and(
				eq(schema.memberships.userId, schema.users.id),
				eq(schema.memberships.clinicId, patient.clinicId)
			)
		)
		.where(eq(schema.patientClinicians.patientId, patient.id))
		.all();
	const people =
		own.length > 0
			? own
			: db()
					.select({ email: schema.users.email, name: schema.users.name })
					.from(schema.memberships)
					.innerJoin(schema.users, eq(schema.users.id, schema.memberships.userId))
					.where(
						and(
							eq(schema.memberships.clinicId, patient.clinicId),
							eq(schema.memberships.role, 'clinician')
						)
					)
					.all();
	return people.map((p) => ({ email: p.email, name: p.name ?? p.email }));
}

/**
 * Tells the patient's clinicians by e-mail when a log carries severe pain (7 or more) or a ticked
 * "sharp or new pain": at most one such e-mail a patient a day (their day), claimed in
 * `pain_alert_mail` before sending and given back when sending fails, so a later alert that day
 * tries again. Never throws: the patient's log is stored whatever happens to the e-mail.
 */
export async function tellCliniciansOfPain(
	patient: Patient,
	log: StoredSessionLog
): Promise<'sent' | 'already-sent-today' | 'not-needed' | 'failed'> {
	if (!isPainAlert({ date: log.localDate, score: log.pain, sharp: log.sharpPain }))
		return 'not-needed';
	const claimed = db()
		.insert(schema.painAlertMails)
		.values({ patientId: patient.id, localDate: log.localDate, sessionLogId: log.id })
		.onConflictDoNothing()
		.run().changes;
	if (claimed === 0) return 'already-sent-today';
	const clinic = db()
		.select({ name: schema.clinics.name })
		.from(schema.clinics)
		.where(eq(schema.clinics.id, patient.clinicId))
		.get();
	const exercise = db()
		.select({ title: schema.exercises.title })
		.from(schema.programmeItems)
		.innerJoin(schema.exercises, eq(schema.exercises.id, schema.programmeItems.exerciseId))
		.where(eq(schema.programmeItems.id, log.programmeItemId))
		.get();
	try {
		const recipients = recipientsOf(patient);
		if (recipients.length === 0) throw new Error('the clinic has no clinician to tell');
		for (const clinician of recipients) {
			await sendMail({
				clinicId: patient.clinicId,
				to: clinician.email,
				...painAlertMail({
					clinicianName: clinician.name,
					clinicName: clinic?.name ?? '',
					patientName: patient.fullName,
					exerciseTitle: exercise?.title ?? 'an exercise',
					score: log.pain,
					severe: log.pain >= PAIN_SEVERE_FROM,
					sharp: log.sharpPain,
					dateText: formatDate(log.localDate),
					hasNote: log.note !== '',
					url: new URL(`/patients/${patient.id}`, config().ORIGIN).toString()
				})
			});
		}
		return 'sent';
	} catch (error) {
		db()
			.delete(schema.painAlertMails)
			.where(
				and(
					eq(schema.painAlertMails.patientId, patient.id),
					eq(schema.painAlertMails.localDate, log.localDate)
				)
			)
			.run();
		console.error(`[pain alert] telling the clinicians of patient ${patient.id} failed:`, error);
		return 'failed';
	}
}
