import { testEnv } from './env';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';

// A database of this file's own: the digest goes to every clinician in it, and rows are counted.
process.env.DATABASE_PATH = join(mkdtempSync(join(tmpdir(), 'kinelume-followup-')), 'followup.db');

const { db, schema } = await import('../../src/lib/server/db');
const { addDays, datesFrom } = await import('../../src/lib/clinical/calendar');
const { addRomMeasurement, deleteRomMeasurement, listCaseload, patientFollowup, RomError } =
	await import('../../src/lib/server/followup');
const { sendWeeklyDigests } = await import('../../src/lib/server/followup/digest');
const { listInbox, readInboxMessage } = await import('../../src/lib/server/mail/inbox');
const factories = await import('./factories');
const { makeClinic, makeExercise, makeProgramme, makeSessionLog } = factories;

type Staff = import('./factories').Staff;
type Patient = import('$lib/server/db/schema').Patient;

const makeClinician = (clinicId: string, name: string) =>
	factories.makeStaff(clinicId, 'clinician', { name });

// Monday 30 November 2026, 12:00 in London (GMT): the patients' today is 30 Nov.
const NOW = new Date('2026-11-30T12:00:00Z');
const SCHEDULE = { weekday: 1, hour: 7, timeZone: 'Europe/London' } as const;

/** A patient after a knee replacement, looked after by `clinician`. */
function makePatient(
	clinician: Staff,
	fullName: string,
	extra: Parameters<typeof factories.makePatient>[2] = {}
) {
	return factories.makePatient(clinician.clinicId, fullName, {
		emailDomain: 'followup-test.example',
		affectedSide: 'left',
		condition: 'Left total knee replacement',
		operationDate: '2026-10-19',
		protocol: 'knee-replacement',
		careOf: [clinician],
		...extra
	});
}

/** A published programme of one exercise done once a day, every day, from `startDate`. */
function publishProgramme(patient: Patient, startDate: string) {
	const exercise = makeExercise(patient.clinicId, 'Heel slides', { reps: 10, sessionsPerDay: 1 });
	const { programme, items } = makeProgramme(patient, [exercise.id], {
		title: 'Knee home programme',
		startDate,
		publishedAt: new Date(`${startDate}T08:00:00Z`),
		item: { sets: 1, reps: 10, restSeconds: 0, sessionsPerDay: 1, progression: { kind: 'none' } }
	});
	return { programme, item: items[0] };
}

function logSessions(patient: Patient, itemId: string, days: { date: string; pain: number }[]) {
	for (const { date, pain } of days) {
		makeSessionLog(patient, itemId, { localDate: date, repsDone: 10, pain });
	}
}

const query = {
	sort: 'name' as const,
	dir: 'asc' as const,
	flag: 'all' as const,
	q: '',
	mine: false,
	page: 1,
	pageSize: 25
};

let clinicA: { id: string };
let clinicianA: Staff;
let colleagueA: Staff;
let clinicianB: Staff;
let rising: Patient;
let steady: Patient;
let otherClinicPatient: Patient;

beforeAll(() => {
	expect(testEnv.DEV_INBOX_URL).toMatch(/^http/);
	clinicA = makeClinic('Invented Follow-up Clinic');
	const clinicB = makeClinic('Invented Other Clinic');
	clinicianA = makeClinician(clinicA.id, 'Ada Quill');
	colleagueA = makeClinician(clinicA.id, 'Bo Fennel');
	clinicianB = makeClinician(clinicB.id, 'Cy Marram');

	// Every day from 2 Nov: pain 2 in the first week, 3 after, 5 in the last 7 days → flagged.
	rising = makePatient(clinicianA, 'Rhoda Rise');
	const r = publishProgramme(rising, '2026-11-02');
	logSessions(rising, r.item.id, [
		...datesFrom('2026-11-02', '2026-11-08').map((date) => ({ date, pain: 2 })),
		...datesFrom('2026-11-09', '2026-11-23').map((date) => ({ date, pain: 3 })),
		...datesFrom('2026-11-24', '2026-11-30').map((date) => ({ date, pain: 5 }))
	]);

	// Five of the last seven days, pain steady at 2.
	steady = makePatient(colleagueA, 'Sam Steady');
	const s = publishProgramme(steady, '2026-11-02');
	logSessions(steady, s.item.id, [
		...datesFrom('2026-11-02', '2026-11-23').map((date) => ({ date, pain: 2 })),
		...['2026-11-24', '2026-11-25', '2026-11-27', '2026-11-28', '2026-11-29'].map((date) => ({
			date,
			pain: 2
		}))
	]);

	otherClinicPatient = makePatient(clinicianB, 'Rhoda Elsewhere');
	const o = publishProgramme(otherClinicPatient, '2026-11-02');
	logSessions(otherClinicPatient, o.item.id, [{ date: '2026-11-29', pain: 9 }]);
});

describe('the caseload', () => {
	it('lists only the clinic’s own patients, with figures computed from their logs', () => {
		const caseload = listCaseload(clinicianA, query, NOW);
		expect(caseload.rows.map((r) => r.fullName)).toEqual(['Rhoda Rise', 'Sam Steady']);
		const [rise, stay] = caseload.rows;
		expect(rise.adherence7).toMatchObject({ prescribed: 7, counted: 7, percent: 100 });
		expect(rise.adherence28).toMatchObject({ from: '2026-11-03', prescribed: 28, counted: 28 });
		expect(rise.pain).toMatchObject({ baseline: 3, recent: 5, flagged: true });
		expect(rise.flags.map((f) => f.kind)).toEqual(['pain-rise']);
		// Today (Monday) has nothing yet, so it does not count against Sam: 5 of the 6 days before.
		expect(stay.adherence7).toMatchObject({ prescribed: 6, counted: 5, percent: 83 });
		expect(stay.adherence7?.text).toBe('5 of 6 sessions (83%) over 24–30 Nov 2026');
		expect(stay.flags).toEqual([]);
		expect(stay.sinceOperation).toMatchObject({ weeks: 6 });
		expect(caseload.counts).toMatchObject({ all: 2, flagged: 1, 'pain-rise': 1, 'no-flags': 1 });
	});

	it('never shows another clinic’s patient, by search or by id', () => {
		expect(listCaseload(clinicianA, { ...query, q: 'elsewhere' }, NOW).rows).toEqual([]);
		expect(listCaseload(clinicianB, query, NOW).rows.map((r) => r.fullName)).toEqual([
			'Rhoda Elsewhere'
		]);
		expect(patientFollowup(clinicA.id, otherClinicPatient.id, { now: NOW })).toBeNull();
		expect(patientFollowup(clinicA.id, rising.id, { now: NOW })?.logs).toHaveLength(29);
	});

	it('filters by flag, by name and by who looks after the patient', () => {
		const flagged = listCaseload(clinicianA, { ...query, flag: 'pain-rise' }, NOW);
		expect(flagged.rows.map((r) => r.fullName)).toEqual(['Rhoda Rise']);
		expect(listCaseload(clinicianA, { ...query, q: 'SAM' }, NOW).rows).toHaveLength(1);
		expect(listCaseload(clinicianA, { ...query, mine: true }, NOW).rows.map((r) => r.id)).toEqual([
			rising.id
		]);
	});

	it('sorts by a figure with patients lacking it last, and pages by 25', () => {
		const pageClinic = makeClinic('Invented Busy Clinic');
		const busy = makeClinician(pageClinic.id, 'Di Busy');
		for (let i = 1; i <= 30; i++) {
			const p = makePatient(busy, `Patient ${String(i).padStart(2, '0')}`);
			if (i <= 3) {
				const { item } = publishProgramme(p, '2026-11-23');
				// Patient 01 logged 1 of the 7 days, 02 logged 2, 03 logged 3.
				logSessions(
					p,
					item.id,
					datesFrom('2026-11-23', addDays('2026-11-23', i - 1)).map((date) => ({ date, pain: 1 }))
				);
			}
		}
		const byAdherence = listCaseload(
			busy,
			{ ...query, sort: 'adherence7', dir: 'desc', pageSize: 25 },
			NOW
		);
		expect(byAdherence.total).toBe(30);
		expect(byAdherence.pageCount).toBe(2);
		expect(byAdherence.rows).toHaveLength(25);
		expect(byAdherence.rows.slice(0, 4).map((r) => r.fullName)).toEqual([
			'Patient 03',
			'Patient 02',
			'Patient 01',
			'Patient 04'
		]);
		const second = listCaseload(busy, { ...query, page: 2 }, NOW);
		expect(second.rows.map((r) => r.fullName)).toEqual([
			'Patient 26',
			'Patient 27',
			'Patient 28',
			'Patient 29',
			'Patient 30'
		]);
		// An address past the last page shows the last page.
		expect(listCaseload(busy, { ...query, page: 9 }, NOW).page).toBe(2);
	});
});

describe('range-of-motion readings', () => {
	it('are kept per clinic, compared with the other side and the previous reading', () => {
		const entry = {
			motion: 'knee-flexion' as const,
			mode: 'active' as const,
			note: '',
			instrument: 'goniometer' as const,
			armPosition: null
		};
		addRomMeasurement(
			clinicianA,
			rising.id,
			{ ...entry, side: 'right', degrees: 130, measuredOn: '2026-11-16' },
			NOW
		);
		addRomMeasurement(
			clinicianA,
			rising.id,
			{ ...entry, side: 'left', degrees: 90, measuredOn: '2026-11-16' },
			NOW
		);
		const later = addRomMeasurement(
			clinicianA,
			rising.id,
			{ ...entry, side: 'left', degrees: 96, measuredOn: '2026-11-30' },
			NOW
		);
		const rows = patientFollowup(clinicA.id, rising.id, { now: NOW })!.figures.rom;
		const last = rows.find((r) => r.id === later.id)!;
		expect(last.normal?.text).toBe('Knee flexion 96° = 71% of the AAOS normal 135°');
		expect(last.otherSide?.text).toBe('74% of the right side (130°, measured 16 Nov 2026)');
		expect(last.change?.beyondError).toBe(false);

		expect(() =>
			addRomMeasurement(
				clinicianB,
				rising.id,
				{ ...entry, side: 'left', degrees: 1, measuredOn: '2026-11-30' },
				NOW
			)
		).toThrow(RomError);
		expect(() =>
			addRomMeasurement(
				clinicianA,
				rising.id,
				{ ...entry, side: 'left', degrees: 1, measuredOn: '2026-12-01' },
				NOW
			)
		).toThrow('after today');
		expect(deleteRomMeasurement(clinicianB, rising.id, later.id)).toBe(false);
		expect(deleteRomMeasurement(clinicianA, rising.id, later.id)).toBe(true);
		expect(
			db()
				.select()
				.from(schema.romMeasurements)
				.where(eq(schema.romMeasurements.id, later.id))
				.all()
		).toEqual([]);
	});
});

describe('the weekly digest', () => {
	it('sends each clinician with patients one e-mail a week, read back from the mail fake', async () => {
		// A clinician whose only patient has no programme yet has nothing to report.
		const quiet = makeClinician(clinicA.id, 'Eve Quiet');
		makePatient(quiet, 'Una Waiting');
		const first = await sendWeeklyDigests({ now: NOW, schedule: SCHEDULE });
		expect(first.sent).not.toContain(quiet.email);
		expect(first.nothingToReport).toBeGreaterThanOrEqual(1);
		expect(
			db()
				.select()
				.from(schema.weeklyDigests)
				.where(eq(schema.weeklyDigests.userId, quiet.id))
				.all()
		).toEqual([]);
		expect(first.weekStarts).toEqual(['2026-11-30']);
		expect(first.failed).toEqual([]);
		expect(first.sent).toEqual(
			expect.arrayContaining([clinicianA.email, colleagueA.email, clinicianB.email])
		);

		const inbox = await listInbox(clinicA.id);
		const toA = inbox.filter((m) => m.to.includes(clinicianA.email));
		expect(toA).toHaveLength(1);
		expect(toA[0].subject).toBe('Your Kinelume week of 30 Nov 2026: 1 patient flagged');
		const message = await readInboxMessage(clinicA.id, toA[0].id);
		expect(message?.text).toContain('Rhoda Rise');
		expect(message?.text).toContain(
			'Pain flag: recent average 5.0 is 2.0 above the 7 days before (3.0) (a rise of 2 points or 30% is clinically important — Farrar et al. 2001, found for a fall in pain).'
		);
		expect(message?.text).toContain(
			'Adherence, 7 days: 7 of 7 sessions (100%) over 24–30 Nov 2026'
		);
		expect(message?.text).not.toContain('Sam Steady');
		expect(message?.text).not.toContain('Rhoda Elsewhere');
		expect(message?.html).toContain(`/patients/${rising.id}`);

		// Later the same week — a restart, a second worker, `npm run digest` — sends nothing more.
		const again = await sendWeeklyDigests({
			now: new Date('2026-12-03T09:00:00Z'),
			schedule: SCHEDULE
		});
		expect(again.sent).toEqual([]);
		expect(again.alreadySent).toBe(first.sent.length);
		expect(
			(await listInbox(clinicA.id)).filter((m) => m.to.includes(clinicianA.email))
		).toHaveLength(1);
		const rows = db()
			.select()
			.from(schema.weeklyDigests)
			.where(eq(schema.weeklyDigests.userId, clinicianA.id))
			.all();
		expect(rows.map((r) => r.weekStart)).toEqual(['2026-11-30']);

		// The next week is a new digest.
		const next = await sendWeeklyDigests({
			now: new Date('2026-12-07T08:00:00Z'),
			schedule: SCHEDULE
		});
		expect(next.weekStarts).toEqual(['2026-12-07']);
		expect(next.sent).toContain(clinicianA.email);
		expect(
			(await listInbox(clinicA.id)).filter((m) => m.to.includes(clinicianA.email))
		).toHaveLength(2);
	});

	it("goes out at the digest hour on each clinic's own clock", async () => {
		const west = makeClinic('Invented Clinic Out West');
		db()
			.update(schema.clinics)
			.set({ timeZone: 'America/New_York' })
			.where(eq(schema.clinics.id, west.id))
			.run();
		const wren = makeClinician(west.id, 'Wren Tally');
		publishProgramme(makePatient(wren, 'Ned Loam'), '2026-12-07');

		// Monday 14 Dec 2026, 07:30 in London (GMT) is 02:30 in New York (EST, UTC−5; tz database):
		// the London clinics' digests are due at the configured 07:00, New York's is not yet.
		const early = await sendWeeklyDigests({ now: new Date('2026-12-14T07:30:00Z'), onlyDue: true });
		expect(early.sent).toEqual(
			expect.arrayContaining([clinicianA.email, colleagueA.email, clinicianB.email])
		);
		expect(early.sent).not.toContain(wren.email);
		expect(early.notDueYet).toBe(1);
		expect(early.weekStarts).toEqual(['2026-12-14']);

		// 12:30 UTC is 07:30 in New York: only that clinic's digest is left to send.
		const later = await sendWeeklyDigests({ now: new Date('2026-12-14T12:30:00Z'), onlyDue: true });
		expect(later.sent).toEqual([wren.email]);
		expect(later.notDueYet).toBe(0);
		const mail = (await listInbox(west.id)).find((m) => m.to.includes(wren.email));
		// Ned has logged nothing in the programme's first week, which the digest flags.
		expect(mail?.subject).toBe('Your Kinelume week of 14 Dec 2026: 1 patient flagged');
		expect((await readInboxMessage(west.id, mail!.id))?.text).toContain('No sessions logged');
	});
});

describe('severe or sharp pain reaches the clinicians by e-mail', () => {
	it('e-mails once a patient a day, for a score of 7 or more or "sharp or new pain" (Serlin et al. 1995)', async () => {
		const { recordSession } = await import('../../src/lib/server/sessions');
		const { tellCliniciansOfPain } = await import('../../src/lib/server/followup/pain-alerts');
		const clinic = makeClinic('Invented Pain Alert Clinic');
		const clinician = makeClinician(clinic.id, 'Ivo Alert');
		const patient = makePatient(clinician, 'Rhea Sharp', { timeZone: 'Europe/London' });
		const { item } = publishProgramme(patient, '2026-11-02');
		const log = (day: string, pain: number, sharpPain = false) =>
			recordSession(
				patient,
				{
					clientId: crypto.randomUUID(),
					programmeItemId: item.id,
					doneAt: `${day}T10:00:00Z`,
					setsDone: 1,
					repsDone: 10,
					pain,
					sharpPain,
					note: ''
				},
				Date.parse('2026-12-31T00:00:00Z')
			).log;

		expect(await tellCliniciansOfPain(patient, log('2026-12-01', 6))).toBe('not-needed');
		expect(await tellCliniciansOfPain(patient, log('2026-12-01', 8))).toBe('sent');
		expect(await tellCliniciansOfPain(patient, log('2026-12-01', 9))).toBe('already-sent-today');
		expect(await tellCliniciansOfPain(patient, log('2026-12-02', 3, true))).toBe('sent');

		const mails = (await listInbox(clinic.id)).filter((m) => m.to.includes(clinician.email));
		expect(mails.map((m) => m.subject)).toEqual([
			'Kinelume: a patient logged severe or sharp pain',
			'Kinelume: a patient logged severe or sharp pain'
		]);
		const texts = await Promise.all(
			mails.map(async (m) => (await readInboxMessage(clinic.id, m.id))!.text)
		);
		// Newest first: the sharp one, then the severe one.
		expect(texts[0]).toContain(
			'Rhea Sharp (Invented Pain Alert Clinic) logged pain 3/10 and ticked “sharp or new pain” after “Heel slides” on 2 Dec 2026.'
		);
		expect(texts[1]).toContain('logged pain 8/10 after “Heel slides” on 1 Dec 2026.');
		expect(texts[1]).toContain('7 to 10 is severe on the 0–10 scale (Serlin et al., Pain 1995');
		expect(texts[1]).toContain(`/patients/${patient.id}`);
		// And the caseload says so, with the flag first.
		const figures = patientFollowup(clinic.id, patient.id, {
			now: new Date('2026-12-02T18:00:00Z')
		});
		expect(figures?.figures.flags[0]).toMatchObject({ kind: 'pain-severe' });
	});
});
