import { testEnv } from './env';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import type { ExerciseInput } from '$lib/exercises/schema';

// A database of this file's own, so other files' rows cannot change what is counted here.
process.env.DATABASE_PATH = join(mkdtempSync(join(tmpdir(), 'kinelume-programmes-')), 'p.db');

const { db, schema } = await import('../../src/lib/server/db');
const { loadPrincipal } = await import('../../src/lib/server/auth/principal');
const exercisesModule = await import('../../src/lib/server/exercises');
const programmesModule = await import('../../src/lib/server/programmes');
const { ownItemByCode, programmeSheet } = await import('../../src/lib/server/programmes/sheet');
const { replayCode } = await import('../../src/lib/programmes/replay-code');
const { builderCatalogue, builderState } = await import('../../src/lib/server/programmes/builder');
const { saveDraft } = await import('../../src/lib/server/programmes/save');
const { listInbox, readInboxMessage } = await import('../../src/lib/server/mail/inbox');
const { ExerciseError, createExercise, findExercise, listExercises, setExerciseStatus } =
	exercisesModule;
const { ProgrammeError, createProgramme, findProgramme, publishProgramme, saveProgramme } =
	programmesModule;

const factories = await import('./factories');
const { makeClinic, makeSessionLog } = factories;

type Principal = NonNullable<ReturnType<typeof loadPrincipal>>;

const makeClinician = (clinicId: string, email: string): Principal =>
	loadPrincipal(factories.makeStaff(clinicId, 'clinician', { email }).id)!;

const makePatient = (
	clinicId: string,
	email: string,
	over: Parameters<typeof factories.makePatient>[2] = {}
) => factories.makePatient(clinicId, 'Nell Harrow', { email, ...over });

/** A segment (0–40 s) on a ready recording of the clinic (rows only; no media is needed here). */
function makeSegment(clinicId: string, title: string, status: 'ready' | 'cutting' = 'ready') {
	const recording = factories.makeRecording(clinicId, {
		title: `${title} recording`,
		durationSeconds: 60
	});
	return factories.makeSegment(recording, { title, endSeconds: 40, status });
}

function input(over: Partial<ExerciseInput> = {}): ExerciseInput {
	return {
		title: 'Heel slides',
		description: 'Lying on the back, slide the heel towards you.',
		bodyRegion: 'Knee',
		side: 'either',
		position: 'supine',
		movementType: 'active-assisted',
		equipment: ['Towel'],
		phase: 2,
		coachingCues: [{ text: 'Slide slowly', atSeconds: 3 }],
		safetyNotes: 'Stop if the pain is **sharp**.',
		precautionTags: [],
		dosage: {
			sets: 1,
			reps: 8,
			holdSeconds: 0,
			restSeconds: 30,
			sessionsPerDay: 3,
			daysPerWeek: 7
		},
		bounds: {},
		progression: { kind: 'none' },
		secondsPerRep: null,
		segmentId: null,
		status: 'draft',
		...over
	};
}

const dose = {
	sets: 1,
	reps: 8,
	holdSeconds: 0,
	restSeconds: 30,
	sessionsPerDay: 3,
	daysPerWeek: 7
};

let alder: { id: string };
let harbour: { id: string };
let clinician: Principal;
let otherClinician: Principal;
let segmentId: string;

beforeAll(() => {
	expect(testEnv.DEV_INBOX_URL).toMatch(/^http/);
	alder = makeClinic('Invented Alder Test Clinic');
	harbour = makeClinic('Invented Harbour Test Clinic');
	clinician = makeClinician(alder.id, 'pt@alder-programmes.example');
	otherClinician = makeClinician(harbour.id, 'pt@harbour-programmes.example');
	segmentId = makeSegment(alder.id, 'Heel slides').id;
});

describe('exercises', () => {
	it('are created in the clinician’s clinic and found only there', () => {
		const exercise = createExercise(clinician, input({ segmentId, status: 'ready' }));
		expect(exercise.clinicId).toBe(alder.id);
		expect(findExercise(alder.id, exercise.id)?.segment).toMatchObject({
			id: segmentId,
			posterUrl: `/api/segments/${segmentId}/poster-0.jpg`,
			durationSeconds: 40
		});
		expect(findExercise(harbour.id, exercise.id)).toBeNull();
		expect(exercisesModule.updateExercise(otherClinician, exercise.id, input())).toBeNull();
		expect(setExerciseStatus(otherClinician, exercise.id, 'retired')).toBeNull();
	});

	it('refuse a segment of another clinic, or one not cut yet', () => {
		const foreign = makeSegment(harbour.id, 'Elsewhere').id;
		const cutting = makeSegment(alder.id, 'Still cutting', 'cutting').id;
		expect(() => createExercise(clinician, input({ segmentId: foreign }))).toThrow(ExerciseError);
		expect(() => createExercise(clinician, input({ segmentId: cutting }))).toThrow(ExerciseError);
	});

	it('are listed with search and filters', () => {
		createExercise(
			clinician,
			input({ title: 'Sit to stand', position: 'seated', equipment: ['Chair'], phase: 4 })
		);
		createExercise(clinician, input({ title: 'Quad sets', equipment: ['Rolled towel'] }));
		createExercise(otherClinician, input({ title: 'Sit to stand elsewhere' }));
		const titles = (f: Parameters<typeof listExercises>[1]) =>
			listExercises(alder.id, f).map((e) => e.title);
		expect(titles({ search: 'stand' })).toEqual(['Sit to stand']);
		expect(titles({ equipment: 'chair' })).toEqual(['Sit to stand']);
		expect(titles({ position: 'seated' })).toEqual(['Sit to stand']);
		expect(titles({ phase: 4 })).toEqual(['Sit to stand']);
		expect(titles({ status: 'ready' })).toEqual(['Heel slides']);
		expect(titles({ search: '100%_' })).toEqual([]);
		expect(titles({})).toEqual(['Heel slides', 'Quad sets', 'Sit to stand']);
	});

	it('cannot be marked ready without a demonstration', () => {
		const draft = createExercise(clinician, input({ title: 'No video yet' }));
		expect(() => setExerciseStatus(clinician, draft.id, 'ready')).toThrow(ExerciseError);
	});
});

describe('programmes', () => {
	let readyId: string;
	let draftExerciseId: string;
	let patientId: string;

	beforeAll(() => {
		readyId = createExercise(
			clinician,
			input({
				title: 'Kneeling reach',
				segmentId,
				status: 'ready',
				precautionTags: ['kneeling'],
				phase: 4
			})
		).id;
		draftExerciseId = createExercise(clinician, input({ title: 'Unfinished' })).id;
		patientId = makePatient(alder.id, 'nell@patients.example', {
			operationDate: '2026-11-10',
			protocol: 'knee-replacement',
			precautions: ['no-kneeling']
		}).id;
	});

	it('are created only for a patient of the clinic', () => {
		const foreignPatient = makePatient(harbour.id, 'someone@harbour.example');
		expect(() =>
			createProgramme(clinician, foreignPatient.id, {
				title: 'x',
				startDate: '2026-11-17',
				endDate: null
			})
		).toThrow(ProgrammeError);
	});

	it('keep item ids when reordered, and refuse exercises that are not offered', () => {
		const programme = createProgramme(clinician, patientId, {
			title: 'Knee home programme',
			startDate: '2026-11-17',
			endDate: null
		});
		const heel = listExercises(alder.id, { search: 'Heel slides' })[0];
		const saved = saveProgramme(clinician, programme.id, {
			title: 'Knee home programme',
			startDate: '2026-11-17',
			endDate: null,
			note: '',
			items: [
				{ exerciseId: heel.id, dosage: dose, progression: { kind: 'none' } },
				{
					exerciseId: readyId,
					dosage: { ...dose, reps: 12 },
					progression: { kind: 'reps', addPerWeek: 2, ceiling: 15 }
				}
			]
		});
		const [a, b] = saved.items.map((i) => i.id);
		const reordered = saveProgramme(clinician, programme.id, {
			title: 'Knee home programme',
			startDate: '2026-11-17',
			endDate: null,
			note: 'Little and often.',
			items: [
				{
					id: b,
					exerciseId: readyId,
					dosage: { ...dose, reps: 12 },
					progression: { kind: 'none' }
				},
				{ id: a, exerciseId: heel.id, dosage: dose, progression: { kind: 'none' } }
			]
		});
		expect(reordered.items.map((i) => [i.id, i.position])).toEqual([
			[b, 0],
			[a, 1]
		]);
		expect(reordered.programme.note).toBe('Little and often.');

		const base = { title: 't', startDate: '2026-11-17', endDate: null, note: '' };
		expect(() =>
			saveProgramme(clinician, programme.id, {
				...base,
				items: [{ exerciseId: draftExerciseId, dosage: dose, progression: { kind: 'none' } }]
			})
		).toThrow(/not ready/);
		const foreignExercise = listExercises(harbour.id)[0];
		expect(() =>
			saveProgramme(clinician, programme.id, {
				...base,
				items: [{ exerciseId: foreignExercise.id, dosage: dose, progression: { kind: 'none' } }]
			})
		).toThrow(/not in your clinic/);
		expect(() => saveProgramme(otherClinician, programme.id, { ...base, items: [] })).toThrow(
			ProgrammeError
		);
		expect(findProgramme(harbour.id, programme.id)).toBeNull();
		// Nothing of the refused saves was written.
		expect(findProgramme(alder.id, programme.id)?.items.map((i) => i.id)).toEqual([b, a]);
	});

	it('never drop an item that has sessions logged', () => {
		const programme = createProgramme(clinician, patientId, {
			title: 'Logged',
			startDate: '2026-11-17',
			endDate: null
		});
		const saved = saveProgramme(clinician, programme.id, {
			title: 'Logged',
			startDate: '2026-11-17',
			endDate: null,
			note: '',
			items: [{ exerciseId: readyId, dosage: dose, progression: { kind: 'none' } }]
		});
		makeSessionLog({ id: patientId, clinicId: alder.id }, saved.items[0].id, {
			localDate: '2026-11-18',
			pain: 2
		});
		expect(() =>
			saveProgramme(clinician, programme.id, {
				title: 'Logged',
				startDate: '2026-11-17',
				endDate: null,
				note: '',
				items: []
			})
		).toThrow(/sessions logged/);
		expect(findProgramme(alder.id, programme.id)?.items[0].logCount).toBe(1);
	});

	it('answer a refused draft with every problem and write nothing', () => {
		const programme = createProgramme(clinician, patientId, {
			title: 'Refused',
			startDate: '2026-11-17',
			endDate: null
		});
		const outcome = saveDraft(clinician, programme.id, {
			title: '',
			startDate: '2026-11-17',
			endDate: '2026-11-01',
			note: '',
			items: [
				{
					key: 'k',
					id: '',
					exerciseId: readyId,
					dosage: {
						...Object.fromEntries(Object.entries(dose).map(([k, v]) => [k, String(v)])),
						reps: 'lots'
					},
					weekdays: [],
					rangeGuides: [],
					progression: { kind: 'none', addPerWeek: '', ceiling: '', addAfterWeeks: '', add: '' },
					logCount: 0
				}
			]
		});
		expect(outcome.ok).toBe(false);
		if (outcome.ok) return;
		// Field problems first; the dates are compared once every field reads.
		expect(outcome.problems.map((p) => p.path).sort()).toEqual(['items.0.dosage.reps', 'title']);
		const dates = saveDraft(clinician, programme.id, {
			title: 'Refused',
			startDate: '2026-11-17',
			endDate: '2026-11-01',
			note: '',
			items: []
		});
		expect(dates.ok || dates.problems).toEqual([
			{ path: 'endDate', message: 'The end date is before the start date.' }
		]);
		expect(findProgramme(alder.id, programme.id)?.items).toEqual([]);
	});

	it('publish: the patient gets an e-mail, and an earlier published programme ends', async () => {
		const patient = makePatient(alder.id, 'publish.me@patients.example', {
			operationDate: '2026-11-10',
			protocol: 'knee-replacement'
		});
		const first = createProgramme(clinician, patient.id, {
			title: 'First programme',
			startDate: '2026-11-17',
			endDate: null
		});
		await expect(publishProgramme(clinician, first.id)).rejects.toThrow(/at least one exercise/);
		saveProgramme(clinician, first.id, {
			title: 'First programme',
			startDate: '2026-11-17',
			endDate: null,
			note: '',
			items: [{ exerciseId: readyId, dosage: dose, progression: { kind: 'none' } }]
		});
		const since = Date.now();
		const published = await publishProgramme(clinician, first.id);
		expect(published.changed).toBe(false);
		expect(published.view.programme.status).toBe('published');

		const mails = (await listInbox(clinician.clinicId)).filter(
			(m) =>
				m.to.includes('publish.me@patients.example') && new Date(m.date).getTime() >= since - 1000
		);
		expect(mails.map((m) => m.subject)).toEqual([
			'Your home programme from Invented Alder Test Clinic is ready'
		]);
		const message = await readInboxMessage(clinician.clinicId, mails[0].id);
		expect(message?.text).toContain('Kneeling reach: 1 set of 8 reps');
		expect(message?.text).toContain('/today');
		expect(message?.text).toContain('first set up your account');
		expect(message?.text).toMatch(/stop and contact your clinician/i);

		const again = await publishProgramme(clinician, first.id);
		expect(again.changed).toBe(true);
		const subjects = (await listInbox(clinician.clinicId))
			.filter((m) => m.to.includes('publish.me@patients.example'))
			.map((m) => m.subject);
		expect(subjects).toContain('Your home programme from Invented Alder Test Clinic has changed');

		const second = programmesModule.copyProgramme(clinician, first.id, '2026-12-01');
		const replaced = await publishProgramme(clinician, second.id);
		expect(replaced.ended).toBe(1);
		const statusOf = (id: string) =>
			db().select().from(schema.programmes).where(eq(schema.programmes.id, id)).get()?.status;
		expect(statusOf(first.id)).toBe('ended');
		expect(statusOf(second.id)).toBe('published');
		await expect(publishProgramme(otherClinician, second.id)).rejects.toThrow(ProgrammeError);
	});

	it('print a sheet with a QR code to each item’s replay page', async () => {
		const programme = createProgramme(clinician, patientId, {
			title: 'Printed',
			startDate: '2026-11-17',
			endDate: null
		});
		const view = saveProgramme(clinician, programme.id, {
			title: 'Printed',
			startDate: '2026-11-17',
			endDate: null,
			note: 'Ice after.',
			items: [
				{
					exerciseId: readyId,
					dosage: { ...dose, holdSeconds: 5 },
					progression: { kind: 'reps', addPerWeek: 2, ceiling: 15 }
				}
			]
		});
		const sheet = await programmeSheet(view);
		const [item] = sheet.items;
		const code = await replayCode(view.items[0].id);
		expect(item.url).toBe(
			`${new URL(`/r/${code}`, process.env.ORIGIN ?? 'http://localhost:3000')}`
		);
		expect(item.typedUrl).toBe(item.url.replace(/^https:\/\//, ''));
		expect(item.qrSvg).toMatch(/^<svg[^>]*viewBox/);
		// People's dates and the patient's side in words, never a raw id.
		expect(sheet.startDate).toBe('Tuesday 17 Nov 2026');
		expect(item.side).toBe('Either leg.');
		expect(item.movement).toBe(
			'Your hands, a strap or a helper helps; the leg being treated does part of the work.'
		);
		expect(item.position).toBe('Lying on your back (supine)');
		expect(item.dosage).toBe('1 set of 8 reps, hold 5 seconds; 3 times a day, every day.');
		expect(item.progression).toBe('Add 2 reps each week, up to 15.');
		expect(item.safetyHtml).toBe('<p>Stop if the pain is <strong>sharp</strong>.</p>');
		expect(item.cues).toEqual(['Slide slowly']);
	});

	it('print the treated side in words and open a printed code only for its own patient', async () => {
		const patient = makePatient(alder.id, 'left.knee@patients.example', {
			affectedSide: 'left',
			operationDate: '2026-11-10'
		});
		const make = (title: string) => {
			const programme = createProgramme(clinician, patient.id, {
				title,
				startDate: '2026-11-17',
				endDate: '2026-12-20'
			});
			return saveProgramme(clinician, programme.id, {
				title,
				startDate: '2026-11-17',
				endDate: '2026-12-20',
				note: '',
				items: [{ exerciseId: readyId, dosage: dose, progression: { kind: 'none' } }]
			});
		};
		const draft = make('Not yet');
		const view = make('Left knee');
		await publishProgramme(clinician, view.programme.id);
		const sheet = await programmeSheet(view);
		expect(sheet.endDate).toBe('Sunday 20 Dec 2026');
		expect(sheet.items[0].side).toBe('Your left leg — the one being treated.');

		const itemId = view.items[0].id;
		const code = await replayCode(itemId);
		expect(await ownItemByCode(patient.id, code)).toBe(itemId);
		// Another patient's code, a draft's and a made-up one find nothing.
		expect(await ownItemByCode(patientId, code)).toBeUndefined();
		expect(await ownItemByCode(patient.id, await replayCode(draft.items[0].id))).toBeUndefined();
		expect(await ownItemByCode(patient.id, 'ZZZZZZZZ')).toBeUndefined();
	});

	it('offer the builder ready exercises and those already in the programme', () => {
		const programme = createProgramme(clinician, patientId, {
			title: 'Catalogue',
			startDate: '2026-11-17',
			endDate: null
		});
		saveProgramme(clinician, programme.id, {
			title: 'Catalogue',
			startDate: '2026-11-17',
			endDate: null,
			note: '',
			items: [{ exerciseId: readyId, dosage: dose, progression: { kind: 'none' } }]
		});
		setExerciseStatus(clinician, readyId, 'retired');
		const catalogue = builderCatalogue(alder.id, [readyId]);
		expect(catalogue.find((e) => e.id === readyId)?.status).toBe('retired');
		expect(catalogue.some((e) => e.id === draftExerciseId)).toBe(false);
		const state = builderState(findProgramme(alder.id, programme.id)!);
		expect(state.patient.precautions).toEqual(['no-kneeling']);
		expect(state.draft.items[0].dosage.reps).toBe('8');
		setExerciseStatus(clinician, readyId, 'ready');
	});
});
