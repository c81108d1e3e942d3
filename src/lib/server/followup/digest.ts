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
	/** The ISO weeks (their Mondays) digests were sent or checked for; one per clinic time zone. */
	weekStarts: string[];
	/** Addresses a digest went to in this run. */
	sent: string[];
	/** Addresses whose digest waits in the mail outbox (the mail server was away); it goes later. */
	queued: string[];
	/** Clinicians whose digest for this week had already gone (or is going from another worker). */
	alreadySent: number;
	/** Clinicians none of whose patients has a published programme or a log: nothing sent. */
	nothingToReport: number;
	/** Clinicians whose clinic has not reached the digest's weekday and hour yet (`onlyDue`). */
	notDueYet: number;
	failed: { email: string; reason: string }[];
}

/** When digests go out: the weekday and hour from the configuration, on the clinic's clock. */
export function digestSchedule(timeZone: string): DigestSchedule {
	const c = config();
	return { weekday: c.DIGEST_WEEKDAY as Weekday, hour: c.DIGEST_HOUR, timeZone };
}

/** The weekly_digest row of one clinician and week. */
function digestOf(userId: string, weekStart: string) {
	return and(
		eq(schema.weeklyDigests.userId, userId),
		eq(schema.weeklyDigests.weekStart, weekStart)
	);
}

/** Every clinician of every clinic, with their clinic's name and time zone. */
function clinicians() {
	return db()
		.select({
			id: schema.users.id,
			email: schema.users.email,
			name: schema.users.name,
			clinicId: schema.clinics.id,
			clinicName: schema.clinics.name,
			clinicTimeZone: schema.clinics.timeZone
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
 * twice sends nothing more; a failed send gives the claim back, for the next try. A clinic's week
 * and hour are on its own clock. With `onlyDue`, clinics whose digest hour has not come yet are
 * left for a later run (the hourly check); without it (`npm run digest`) everyone's goes now.
 * `schedule` replaces the configured one for every clinic (tests).
 */
export async function sendWeeklyDigests(
	options: {
		now?: Date;
		schedule?: DigestSchedule;
		onlyDue?: boolean;
		log?: (m: string) => void;
	} = {}
): Promise<DigestRun> {
	const now = options.now ?? new Date();
	const run: DigestRun = {
		weekStarts: [],
		sent: [],
		alreadySent: 0,
		nothingToReport: 0,
		notDueYet: 0,
		queued: [],
		failed: []
	};
	const origin = config().ORIGIN;
	for (const clinician of clinicians()) {
		const schedule = options.schedule ?? digestSchedule(clinician.clinicTimeZone);
		const { weekStart, due } = digestWeek(now, schedule);
		if (options.onlyDue && !due) {
			run.notDueYet += 1;
			continue;
		}
		if (!run.weekStarts.includes(weekStart)) run.weekStarts.push(weekStart);
		// Checked before the figures are worked out: the hourly check asks all week long.
		const sentBefore = db()
			.select({ userId: schema.weeklyDigests.userId })
			.from(schema.weeklyDigests)
			.where(digestOf(clinician.id, weekStart))
			.get();
		if (sentBefore) {
			run.alreadySent += 1;
			continue;
		}
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
			const delivery = await sendMail({
				clinicId: clinician.clinicId,
				to: clinician.email,
				...mail
			});
			if (delivery.status === 'sent') run.sent.push(clinician.email);
			else {
				// Kept in the outbox, which sends it once mail is back: the week stays claimed.
				run.queued.push(clinician.email);
				options.log?.(`[digest] ${clinician.email}: waiting in the outbox (${delivery.reason})`);
			}
		} catch (error) {
			db().delete(schema.weeklyDigests).where(digestOf(clinician.id, weekStart)).run();
			const reason = error instanceof Error ? error.message : String(error);
			run.failed.push({ email: clinician.email, reason });
			options.log?.(`[digest] sending to ${clinician.email} failed: ${reason}`);
		}
	}
	run.weekStarts.sort();
	return run;
}

/**
 * Checks once an hour (and at start) which clinics' digests are due, and sends what has not gone
 * yet. Runs beside the job worker; returns a function that stops it.
 */
export function startDigestSchedule(log: (m: string) => void = console.log): () => void {
	if (!config().DIGEST_ENABLED) return () => {};
	let running = false;
	const check = () => {
		if (running) return;
		running = true;
		sendWeeklyDigests({ onlyDue: true, log })
			.then((run) => {
				if (run.sent.length > 0)
					log(
						`[digest] sent ${run.sent.length} weekly digest(s) for the week of ${run.weekStarts.join(', ')}`
					);
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
