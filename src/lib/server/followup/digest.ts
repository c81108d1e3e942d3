import { and, eq } from 'drizzle-orm';
import { PAIN_BASIS } from '$lib/clinical/pain';
import { localDateOf, type Weekday } from '$lib/clinical/calendar';
import { digestWeek, type DigestSchedule } from '$lib/followup/digest-schedule';
import { ADHERENCE_BASIS, patientFigures } from '$lib/followup/figures';
import { daysAgo, formatDate } from '$lib/followup/words';
import { config } from '../config';
import { db, schema } from '../db';
import { sendMail } from '../mail';
import { weeklyDigestMail, type DigestPatient } from '../mail/templates';
import { clinicPatients, figureInput, loadRecords } from './records';

export interface DigestRun {
	weekStart: string;
	/** Addresses a digest went to in this run. */
	sent: string[];
	/** Clinicians whose digest for this week had already gone (or is going from another worker). */
	alreadySent: number;
	/** Clinicians none of whose patients has a published programme or a log: nothing sent. */
	nothingToReport: number;
	failed: { email: string; reason: string }[];
}

export function digestSchedule(): DigestSchedule {
	const c = config();
	return {
		weekday: c.DIGEST_WEEKDAY as Weekday,
		hour: c.DIGEST_HOUR,
		timeZone: c.DIGEST_TIME_ZONE
	};
}

/** Every clinician of every clinic, with their clinic's name. */
function clinicians() {
	return db()
		.select({
			id: schema.users.id,
			email: schema.users.email,
			name: schema.users.name,
			clinicId: schema.clinics.id,
			clinicName: schema.clinics.name
		})
		.from(schema.memberships)
		.innerJoin(schema.users, eq(schema.users.id, schema.memberships.userId))
		.innerJoin(schema.clinics, eq(schema.clinics.id, schema.memberships.clinicId))
		.where(eq(schema.memberships.role, 'clinician'))
		.all();
}

/** What one clinician's digest says about each of their patients, flagged first. */
export function digestPatients(
	clinician: { id: string; clinicId: string },
	now: Date
): (DigestPatient & { reportable: boolean })[] {
	const origin = config().ORIGIN;
	const patients = clinicPatients(clinician.clinicId, clinician.id);
	const records = loadRecords(clinician.clinicId, patients);
	const lines = patients.map((patient) => {
		const f = patientFigures(figureInput(records.get(patient.id)!), now);
		return {
			reportable: f.prescribed || f.lastSession !== null,
			name: patient.fullName,
			url: new URL(`/patients/${patient.id}`, origin).toString(),
			flags: f.flags.map((flag) => ({ label: flag.label, detail: flag.detail })),
			adherence: f.adherence7 ? f.adherence7.text : 'no published programme',
			// A pain flag already says it all; otherwise the trend in a sentence.
			pain: f.pain && !f.pain.flagged ? f.pain.text : null,
			lastSession: f.lastSession
				? `${daysAgo(f.lastSession.localDate, f.today).toLowerCase()} (${formatDate(f.lastSession.localDate)}), pain ${f.lastSession.pain}/10`
				: 'none logged'
		};
	});
	return [...lines.filter((l) => l.flags.length > 0), ...lines.filter((l) => l.flags.length === 0)];
}

/**
 * Sends each clinician this week's digest, once: a row in weekly_digest (unique per clinician and
 * week) is claimed before the e-mail goes, so a restart, a second worker or `npm run digest` run
 * twice sends nothing more; a failed send gives the claim back, for the next try.
 */
export async function sendWeeklyDigests(
	options: { now?: Date; schedule?: DigestSchedule; log?: (m: string) => void } = {}
): Promise<DigestRun> {
	const now = options.now ?? new Date();
	const schedule = options.schedule ?? digestSchedule();
	const { weekStart } = digestWeek(now, schedule);
	const run: DigestRun = { weekStart, sent: [], alreadySent: 0, nothingToReport: 0, failed: [] };
	const origin = config().ORIGIN;
	for (const clinician of clinicians()) {
		const patients = digestPatients(clinician, now);
		// Not claimed, so the week's digest still goes once there is something to say.
		if (!patients.some((p) => p.reportable)) {
			run.nothingToReport += 1;
			continue;
		}
		const claim = db()
			.insert(schema.weeklyDigests)
			.values({ userId: clinician.id, weekStart })
			.onConflictDoNothing()
			.returning()
			.get();
		if (!claim) {
			run.alreadySent += 1;
			continue;
		}
		const mail = weeklyDigestMail({
			clinicianName: clinician.name ?? clinician.email,
			clinicName: clinician.clinicName,
			weekLabel: formatDate(weekStart),
			asOf: formatDate(localDateOf(now, schedule.timeZone)),
			patients,
			caseloadUrl: new URL('/caseload?mine=1', origin).toString(),
			basis: [`Adherence: ${ADHERENCE_BASIS}`, `Pain: ${PAIN_BASIS}`]
		});
		try {
			await sendMail({ to: clinician.email, ...mail });
			run.sent.push(clinician.email);
		} catch (error) {
			db()
				.delete(schema.weeklyDigests)
				.where(
					and(
						eq(schema.weeklyDigests.userId, clinician.id),
						eq(schema.weeklyDigests.weekStart, weekStart)
					)
				)
				.run();
			const reason = error instanceof Error ? error.message : String(error);
			run.failed.push({ email: clinician.email, reason });
			options.log?.(`[digest] sending to ${clinician.email} failed: ${reason}`);
		}
	}
	return run;
}

/**
 * Checks once an hour (and at start) whether this week's digest is due, and sends what has not
 * gone yet. Runs beside the job worker; returns a function that stops it.
 */
export function startDigestSchedule(log: (m: string) => void = console.log): () => void {
	if (!config().DIGEST_ENABLED) return () => {};
	let running = false;
	const check = () => {
		if (running || !digestWeek(new Date(), digestSchedule()).due) return;
		running = true;
		sendWeeklyDigests({ log })
			.then((run) => {
				if (run.sent.length > 0)
					log(`[digest] sent ${run.sent.length} weekly digest(s) for the week of ${run.weekStart}`);
			})
			.catch((error: unknown) => log(`[digest] failed: ${String(error)}`))
			.finally(() => {
				running = false;
			});
	};
	const timer = setInterval(check, 60 * 60 * 1000);
	timer.unref();
	check();
	return () => clearInterval(timer);
}
