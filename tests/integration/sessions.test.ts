import { fakesDirectory } from './env';
import { join } from 'node:path';
import { and, eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';

// A database of this file's own, so rows other files make cannot change what is counted here.
process.env.DATABASE_PATH = join(fakesDirectory, `sessions-${process.pid}.db`);

const { db, schema } = await import('$lib/server/db');
const sessions = await import('$lib/server/sessions');
const { calendarFile } = await import('$lib/server/sessions/calendar');
const { sessionLogSchema } = await import('$lib/sessions/log');
const { DEFAULT_CAPTION_STYLE } = await import('$lib/sessions/caption-style');
const factories = await import('./factories');
const { makeClinic, makeExercise, makeProgramme, makeRecording, makeSegment } = factories;

type Patient = typeof schema.patients.$inferSelect;

function makePatient(clinicId: string, name: string, timeZone = 'Europe/London'): Patient {
	return factories.makePatient(clinicId, name, { timeZone, emailDomain: 'sessions-test.example' });
}

function log(itemId: string, overrides: Record<string, unknown> = {}) {
	return sessionLogSchema.parse({
		clientId: crypto.randomUUID(),
		programmeItemId: itemId,
		doneAt: '2026-03-05T10:00:00.000Z',
		setsDone: 2,
		repsDone: 8,
		pain: 3,
		note: '  felt tight at the end  ',
		...overrides
	});
}

const NOW = Date.parse('2026-03-05T12:00:00Z');

let clinic: { id: string };
let otherClinic: { id: string };
let walter: Patient;
let edna: Patient;
let greta: Patient;
let walterItems: { id: string }[];
let ednaItem: { id: string };
let gretaItem: { id: string };

beforeAll(() => {
	clinic = makeClinic('Sessions Test Clinic');
	otherClinic = makeClinic('Other Sessions Clinic');
	walter = makePatient(clinic.id, 'Walter Test');
	edna = makePatient(clinic.id, 'Edna Test');
	greta = makePatient(otherClinic.id, 'Greta Test');
	const heel = makeExercise(clinic.id, 'Heel slides', {
		safetyNotes: '**Stop** if the knee swells.'
	});
	const pumps = makeExercise(clinic.id, 'Ankle pumps');
	walterItems = makeProgramme(walter, [heel.id, pumps.id]).items;
	ednaItem = makeProgramme(edna, [pumps.id]).items[0];
	gretaItem = makeProgramme(greta, [makeExercise(otherClinic.id, 'Other').id]).items[0];
});

describe('session logs', () => {
	it('store a log once per device-made clientId, answering the stored one on a resend', () => {
		const entry = log(walterItems[0].id);
		const first = sessions.recordSession(walter, entry, NOW);
		expect(first.created).toBe(true);
		expect(first.log).toMatchObject({
			setsDone: 2,
			repsDone: 8,
			pain: 3,
			note: 'felt tight at the end'
		});

		// The same clientId again — even with other figures — stores nothing new.
		const again = sessions.recordSession(walter, { ...entry, pain: 9 }, NOW);
		expect(again.created).toBe(false);
		expect(again.log).toEqual(first.log);
		const rows = db()
			.select()
			.from(schema.sessionLogs)
			.where(
				and(
					eq(schema.sessionLogs.patientId, walter.id),
					eq(schema.sessionLogs.clientId, entry.clientId)
				)
			)
			.all();
		expect(rows).toHaveLength(1);
		expect(rows[0].clinicId).toBe(clinic.id);
	});

	it("file a log under the patient's own calendar day, in their time zone", () => {
		// 2026-03-02T06:30Z is 06:30 in London, 22:30 the evening before in Los Angeles (PST,
		// UTC−8) and 19:30 in Auckland (NZDT, UTC+13) — offsets from memory, computed by Intl.
		const instant = '2026-03-02T06:30:00.000Z';
		const cases: [string, string][] = [
			['Europe/London', '2026-03-02'],
			['America/Los_Angeles', '2026-03-01'],
			['Pacific/Auckland', '2026-03-02']
		];
		for (const [timeZone, expected] of cases) {
			const patient = makePatient(clinic.id, `Zone ${timeZone}`, timeZone);
			const { items } = makeProgramme(patient, [makeExercise(clinic.id, 'Zone exercise').id]);
			const { log: stored } = sessions.recordSession(
				patient,
				log(items[0].id, { doneAt: instant }),
				NOW
			);
			expect(stored.localDate, timeZone).toBe(expected);
		}
		// An offset in the device's time is read as the instant it names.
		const late = sessions.recordSession(
			walter,
			log(walterItems[1].id, { doneAt: '2026-03-05T23:30:00-08:00' }),
			Date.parse('2026-03-06T12:00:00Z')
		);
		expect(late.log.localDate).toBe('2026-03-06');
		expect(late.log.doneAt).toBe('2026-03-06T07:30:00.000Z');
	});

	it("refuse another patient's exercise as not found, whichever clinic", () => {
		for (const itemId of [ednaItem.id, gretaItem.id, crypto.randomUUID()]) {
			expect(() => sessions.recordSession(walter, log(itemId), NOW)).toThrowError(
				expect.objectContaining({ status: 404 })
			);
		}
	});

	it('keep one clientId apart per patient', () => {
		const clientId = crypto.randomUUID();
		const a = sessions.recordSession(walter, log(walterItems[0].id, { clientId }), NOW);
		const b = sessions.recordSession(edna, log(ednaItem.id, { clientId }), NOW);
		expect(a.created && b.created).toBe(true);
		expect(a.log.id).not.toBe(b.log.id);
	});

	it('refuse a draft programme, but keep logs for an ended one (made offline before it ended)', () => {
		const patient = makePatient(clinic.id, 'Draft Ended');
		const exercise = makeExercise(clinic.id, 'Draft exercise');
		const draft = makeProgramme(patient, [exercise.id], { status: 'draft' }).items[0];
		const ended = makeProgramme(patient, [exercise.id], { status: 'ended' }).items[0];
		expect(() => sessions.recordSession(patient, log(draft.id), NOW)).toThrowError(
			expect.objectContaining({ status: 404 })
		);
		expect(sessions.recordSession(patient, log(ended.id), NOW).created).toBe(true);
	});

	it('refuse a time more than a day ahead of the server, with a sentence to act on', () => {
		expect(() =>
			sessions.recordSession(
				walter,
				log(walterItems[0].id, { doneAt: '2026-03-07T12:00:01Z' }),
				NOW
			)
		).toThrowError(/in the future/);
	});
});

describe('the replay item', () => {
	it("is found only in the patient's own published programme", () => {
		const found = sessions.findReplayItem(walter.id, walterItems[0].id);
		expect(found?.exercise.title).toBe('Heel slides');
		expect(sessions.findReplayItem(walter.id, ednaItem.id)).toBeUndefined();
		expect(sessions.findReplayItem(edna.id, walterItems[0].id)).toBeUndefined();
		expect(sessions.findReplayItem(walter.id, gretaItem.id)).toBeUndefined();
		const patient = makePatient(clinic.id, 'Only Draft');
		const draft = makeProgramme(patient, [makeExercise(clinic.id, 'D').id], { status: 'draft' });
		expect(sessions.findReplayItem(patient.id, draft.items[0].id)).toBeUndefined();
	});

	it("has today's dosage from the item's progression at the programme week", () => {
		const found = sessions.findReplayItem(walter.id, walterItems[0].id)!;
		expect(sessions.dosageOn(found.programme, found.item, '2026-03-02').reps).toBe(8);
		// Week 2 from 2026-03-09: two reps more; the ceiling of 15 holds later.
		expect(sessions.dosageOn(found.programme, found.item, '2026-03-09').reps).toBe(10);
		expect(sessions.dosageOn(found.programme, found.item, '2026-06-01').reps).toBe(15);
	});

	it('records the safety acknowledgement once', () => {
		const { exercise } = sessions.findReplayItem(walter.id, walterItems[0].id)!;
		expect(sessions.hasAcknowledged(walter.id, exercise.id)).toBe(false);
		sessions.acknowledgeSafety(walter.id, exercise.id);
		sessions.acknowledgeSafety(walter.id, exercise.id);
		expect(sessions.hasAcknowledged(walter.id, exercise.id)).toBe(true);
		expect(sessions.hasAcknowledged(edna.id, exercise.id)).toBe(false);
	});
});

describe('Today', () => {
	it('counts sessions done and due and names the next one', () => {
		const patient = makePatient(clinic.id, 'Today Counts');
		const a = makeExercise(clinic.id, 'Quad sets');
		const b = makeExercise(clinic.id, 'Straight leg raise');
		const { items } = makeProgramme(patient, [a.id, b.id]);
		const at = (iso: string) => log(items[0].id, { doneAt: iso });
		sessions.recordSession(patient, at('2026-03-05T08:00:00Z'), NOW);
		sessions.recordSession(patient, at('2026-03-05T11:00:00Z'), NOW);
		// Yesterday's session does not count today.
		sessions.recordSession(patient, log(items[1].id, { doneAt: '2026-03-04T18:00:00Z' }), NOW);

		const view = sessions.todayFor(patient, NOW);
		expect(view.today).toBe('2026-03-05');
		expect(view.programme?.week).toBe(1);
		expect(view.items.map((i) => i.status)).toEqual([
			{ kind: 'due', done: 2, of: 3 },
			{ kind: 'due', done: 0, of: 3 }
		]);
		expect(view.summary).toEqual({ done: 2, due: 6, next: { number: 1, of: 3, minutes: 540 } });
		expect(view.items[0].dosageWords).toBe(
			'2 sets of 8 reps, rest 30 seconds between sets; 3 times a day, every day.'
		);
	});

	it('says a paused day is paused and asks for nothing', () => {
		const patient = makePatient(clinic.id, 'Paused Today');
		const { programme } = makeProgramme(patient, [makeExercise(clinic.id, 'P').id]);
		db()
			.insert(schema.programmePauses)
			.values({
				programmeId: programme.id,
				fromDate: '2026-03-04',
				toDate: '2026-03-06',
				reason: 'Review visit'
			})
			.run();
		const view = sessions.todayFor(patient, NOW);
		expect(view.restDay).toEqual({ kind: 'paused', reason: 'Review visit', resumes: '2026-03-07' });
		expect(view.summary).toEqual({ done: 0, due: 0, next: null });
	});

	it("draws each exercise in its own clip's shape, and says no shape for one without a clip", () => {
		const patient = makePatient(clinic.id, 'Clip Shapes');
		const upright = makeRecording(clinic.id, { width: 180, height: 320 });
		const wide = makeRecording(clinic.id, { width: 640, height: 360 });
		const withUpright = makeExercise(clinic.id, 'Upright clip', {
			segmentId: makeSegment(upright).id
		});
		const withWide = makeExercise(clinic.id, 'Wide clip', { segmentId: makeSegment(wide).id });
		const withoutClip = makeExercise(clinic.id, 'No clip');
		makeProgramme(patient, [withUpright.id, withWide.id, withoutClip.id]);
		expect(sessions.todayFor(patient, NOW).items.map((i) => [i.title, i.shape])).toEqual([
			['Upright clip', { width: 180, height: 320 }],
			['Wide clip', { width: 640, height: 360 }],
			['No clip', { width: null, height: null }]
		]);
	});

	it('shows nothing for a patient without a published programme', () => {
		const patient = makePatient(clinic.id, 'No Programme');
		makeProgramme(patient, [makeExercise(clinic.id, 'N').id], { status: 'draft' });
		expect(sessions.todayFor(patient, NOW).programme).toBeNull();
		expect(sessions.calendarInputFor(patient, 'http://localhost:3000', NOW)).toBeNull();
	});
});

describe('caption style and reminders', () => {
	it('keep the default until the patient saves a style', () => {
		expect(sessions.captionStyleOf(walter)).toEqual(DEFAULT_CAPTION_STYLE);
		const style = { sizePercent: 250, color: '#ffe14d', background: '#000000' };
		sessions.saveCaptionStyle(walter.id, style);
		const reread = db()
			.select()
			.from(schema.patients)
			.where(eq(schema.patients.id, walter.id))
			.get()!;
		expect(sessions.captionStyleOf(reread)).toEqual(style);
		expect(
			sessions.captionStyleOf({ ...reread, captionStyle: { ...style, color: '#111111' } })
		).toEqual(DEFAULT_CAPTION_STYLE);
	});

	it("make a calendar of the patient's programme from today", () => {
		const input = sessions.calendarInputFor(walter, 'http://localhost:3000', NOW)!;
		expect(input.today).toBe('2026-03-05');
		expect(input.items.map((i) => i.title)).toEqual(['Heel slides', 'Ankle pumps']);
		const file = calendarFile(input);
		expect(file).toContain('DTSTART:20260305T090000Z');
		expect(file).toContain('SUMMARY:Home exercises: session 1 of 3');
	});
});
