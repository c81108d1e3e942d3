/**
 * What a person types before the page's script has started is never wiped. On an older phone on
 * a slow connection the page is usable (server-rendered) seconds before its script runs; a field
 * whose value hydration resets loses what was typed, and the form then seems broken.
 *
 * For every form page below: the page's scripts are held back, every field of its forms is
 * filled as a person would, the scripts are let go, and once the page has started every field
 * must still hold what was typed. A new form page is one line in FORM_PAGES.
 */
import { expect, test, type Page, type Route } from '@playwright/test';
import { seedExercise, seedSubmission, seedCollection } from './library-support';
import { seedProgramme, seedSignInPatient } from './programme-fixtures';
import { seedReadySegment } from './segments-support';
import {
	ACCOUNTS,
	database,
	seedCaptionTrack,
	seedReadyRecording,
	signInWithPassword,
	type MatrixRole
} from './support';

interface Seeded {
	recordingId: string;
	trackId: string;
	exerciseId: string;
	submissionId: string;
	collectionId: string;
	patientId: string;
	programmeId: string;
	draftProgrammeId: string;
	replayItemId: string;
	replayPatient: string;
	inviteToken: string;
}

interface FormPage {
	name: string;
	/** Who opens it; 'replay-patient' is the seeded patient whose programme has a clip. */
	as: MatrixRole | 'replay-patient';
	path: (s: Seeded) => string;
}

const FORM_PAGES: FormPage[] = [
	{ name: 'sign-in', as: 'public', path: () => '/signin' },
	{ name: 'invitation', as: 'public', path: (s) => `/invite/${s.inviteToken}` },
	{
		name: 'session log and caption style',
		as: 'replay-patient',
		path: (s) => `/replay/${s.replayItemId}`
	},
	{ name: 'account', as: 'patient', path: () => '/account' },
	{ name: 'clinic: invite, time zone', as: 'admin', path: () => '/clinic' },
	{ name: 'patients: invite', as: 'clinician', path: () => '/patients' },
	{
		name: 'patient: details, range of motion',
		as: 'clinician',
		path: (s) => `/patients/${s.patientId}`
	},
	{ name: 'new exercise', as: 'clinician', path: () => '/exercises/new' },
	{ name: 'exercise', as: 'clinician', path: (s) => `/exercises/${s.exerciseId}` },
	{ name: 'library submission', as: 'clinician', path: (s) => `/exercises/${s.exerciseId}/submit` },
	{ name: 'new programme', as: 'clinician', path: (s) => `/programmes/new?patient=${s.patientId}` },
	{ name: 'programme builder', as: 'clinician', path: (s) => `/programmes/${s.draftProgrammeId}` },
	{
		name: 'captions: new track',
		as: 'clinician',
		path: (s) => `/recordings/${s.recordingId}/captions`
	},
	{
		name: 'recording: rename, import captions',
		as: 'clinician',
		path: (s) => `/recordings/${s.recordingId}`
	},
	{ name: 'caseload search', as: 'clinician', path: () => '/caseload' },
	{ name: 'recordings search', as: 'clinician', path: () => '/recordings' },
	{ name: 'review', as: 'educator', path: (s) => `/curate/submissions/${s.submissionId}` },
	{ name: 'collections', as: 'educator', path: () => '/curate/collections' },
	{ name: 'collection', as: 'educator', path: (s) => `/curate/collections/${s.collectionId}` },
	{ name: 'library search', as: 'public', path: () => '/library/search' }
];

/** One form control as the filler sees it. */
interface Control {
	index: number;
	/** Stable across hydration: name, id, a choice's value, and which occurrence of those. */
	key: string;
	tag: 'input' | 'select' | 'textarea';
	type: string;
	name: string;
	value: string;
	checked: boolean;
	min: string;
	max: string;
	options: { value: string; disabled: boolean }[];
	multiple: boolean;
}

const CONTROLS = 'main form :is(input, select, textarea)';
const SKIPPED_TYPES = new Set(['hidden', 'submit', 'button', 'reset', 'file', 'image']);

/** The value a person would plausibly type into a control, different from what it holds. */
function typedValue(c: Control): string | null {
	if (c.tag === 'select') {
		const other = [...c.options].reverse().find((o) => !o.disabled && o.value !== c.value);
		return other ? other.value : null;
	}
	if (c.tag === 'textarea') return `Typed before the script ${c.index}.\nA second line.`;
	switch (c.type) {
		case 'email':
			return `typed${c.index}@early.example`;
		case 'password':
			return `typed-early-${c.index}-password`;
		case 'number':
		case 'range': {
			const min = c.min === '' ? 0 : Number(c.min);
			const max = c.max === '' ? min + 10 : Number(c.max);
			const pick = Math.min(max, min + 2);
			return String(Number(c.value) === pick ? (pick === max ? min : max) : pick);
		}
		case 'date': {
			const candidate = c.max && c.max < '2026-11-20' ? c.max : '2026-11-20';
			return candidate === c.value
				? c.min && c.min > '2026-11-19'
					? c.min
					: '2026-11-19'
				: candidate;
		}
		case 'time':
			return c.value === '07:45' ? '08:15' : '07:45';
		case 'color':
			return c.value === '#123456' ? '#654321' : '#123456';
		case 'url':
			return 'https://example.org/typed-early';
		case 'tel':
			return '01632 960123';
		default:
			return `Typed early ${c.index}`;
	}
}

type Read = Control & { usable: boolean };

async function readControls(page: Page): Promise<Read[]> {
	return page.locator(CONTROLS).evaluateAll((elements) => {
		const seen = new Map<string, number>();
		return elements.map((el, index) => {
			const input = el as HTMLInputElement;
			const select = el as HTMLSelectElement;
			const isSelect = el.tagName === 'SELECT';
			const choice = input.type === 'radio' || input.type === 'checkbox' ? input.value : '';
			const base = `${input.name}|${input.id}|${choice}`;
			const nth = seen.get(base) ?? 0;
			seen.set(base, nth + 1);
			return {
				index,
				key: `${base}|${nth}`,
				tag: el.tagName.toLowerCase() as 'input' | 'select' | 'textarea',
				type: el.tagName === 'INPUT' ? input.type : el.tagName.toLowerCase(),
				name: input.name || input.id,
				value: input.value,
				checked: el.tagName === 'INPUT' ? input.checked : false,
				min: input.min ?? '',
				max: input.max ?? '',
				options: isSelect
					? [...select.options].map((o) => ({ value: o.value, disabled: o.disabled }))
					: [],
				multiple: isSelect ? select.multiple : false,
				// Only what a person can reach: enabled, writable, on the page (a choice drawn as a
				// label with its input visually hidden counts).
				usable:
					!(input.disabled || input.readOnly) &&
					((el as HTMLElement).checkVisibility({ visibilityProperty: true }) ||
						// a choice drawn as a label, its input visually hidden (but not removed)
						((input.type === 'radio' || input.type === 'checkbox') &&
							(el as HTMLElement).getClientRects().length > 0))
			};
		});
	});
}

type Expected = Map<string, { value?: string; checked?: boolean }>;

/** Fills every usable control as a person would; returns what each should hold afterwards. */
async function fillEverything(page: Page): Promise<Expected> {
	const expected: Expected = new Map();
	const radiosDone = new Set<string>();
	for (const control of await readControls(page)) {
		if (!control.usable || SKIPPED_TYPES.has(control.type) || control.multiple) continue;
		const locator = page.locator(CONTROLS).nth(control.index);
		if (control.type === 'checkbox' || control.type === 'radio') {
			if (control.type === 'radio' && (control.checked || radiosDone.has(control.name))) continue;
			radiosDone.add(control.name);
			// A click event toggles a choice natively, script or not.
			await locator.dispatchEvent('click', undefined, { timeout: 5000 });
			const checked = await locator.isChecked();
			expect(checked, `${control.key} took the click`).toBe(!control.checked);
			expected.set(control.key, { checked });
		} else {
			const value = typedValue(control);
			if (value === null) continue;
			if (control.tag === 'select') await locator.selectOption(value, { timeout: 5000 });
			else await locator.fill(value, { timeout: 5000 });
			expected.set(control.key, { value: await locator.inputValue() });
		}
	}
	return expected;
}

async function holdScripts(page: Page): Promise<() => Promise<void>> {
	const held: Route[] = [];
	let released = false;
	const scripts = '**/_app/immutable/**/*.js';
	await page.route(scripts, (route) => {
		if (released) void route.continue();
		else held.push(route);
	});
	return async () => {
		await expect.poll(() => held.length, 'the page asked for its scripts').toBeGreaterThan(0);
		released = true;
		for (const route of held) await route.continue();
		await page.unroute(scripts);
	};
}

let seeded: Seeded;

test.beforeAll(async () => {
	test.setTimeout(120_000);
	const recordingId = await seedReadyRecording(ACCOUNTS.clinician);
	const trackId = seedCaptionTrack(recordingId);
	const segmentId = await seedReadySegment(recordingId, {
		title: 'Heel slides',
		start: 0,
		end: 1,
		cues: [{ id: '1', start: 0, end: 1, text: 'Slide your heel.' }]
	});
	const exerciseId = seedExercise(segmentId, { title: 'Heel slides' });
	const submissionId = seedSubmission(exerciseId, ACCOUNTS.clinician);
	const { id: collectionId } = seedCollection(
		'Typed before the script',
		`typed-before-${crypto.randomUUID().slice(0, 8)}`,
		'draft',
		[]
	);
	const patient = await seedSignInPatient(ACCOUNTS.clinician, { name: 'Early Typist' });
	const replay = await seedSignInPatient(ACCOUNTS.clinician, { name: 'Replay Typist' });
	const {
		programmeId,
		itemIds: [replayItemId]
	} = seedProgramme(replay.patientId, [{ title: 'Heel slides', segmentId, sets: 2, reps: 5 }]);
	const { programmeId: draftProgrammeId } = seedProgramme(patient.patientId, [{ title: 'Quads' }], {
		status: 'draft',
		title: 'Draft programme'
	});
	// An invitation whose token we know: only its SHA-256 is stored, as the app does.
	const inviteToken = `typed-early-${crypto.randomUUID()}`;
	const db = database();
	try {
		const { clinicId, adminId } = db
			.prepare(
				'select m.clinic_id as clinicId, u.id as adminId from membership m join user u on u.id = m.user_id where u.email = ?'
			)
			.get(ACCOUNTS.admin) as { clinicId: string; adminId: string };
		const hash = new Uint8Array(
			await crypto.subtle.digest('SHA-256', new TextEncoder().encode(inviteToken))
		);
		db.prepare(
			`insert into invitation (id, clinic_id, email, role, token_hash, invited_by_user_id, expires_at, created_at)
			 values (?, ?, ?, 'clinician', ?, ?, ?, ?)`
		).run(
			crypto.randomUUID(),
			clinicId,
			`invited-${inviteToken.slice(-8)}@alder-street.example`,
			Buffer.from(hash).toString('hex'),
			adminId,
			Date.now() + 3_600_000,
			Date.now()
		);
	} finally {
		db.close();
	}
	seeded = {
		recordingId,
		trackId,
		exerciseId,
		submissionId,
		collectionId,
		patientId: patient.patientId,
		programmeId,
		draftProgrammeId,
		replayItemId,
		replayPatient: replay.email,
		inviteToken
	};
});

for (const formPage of FORM_PAGES) {
	test(`${formPage.name}: what is typed before the script starts survives it`, async ({ page }) => {
		if (formPage.as === 'replay-patient') await signInWithPassword(page, seeded.replayPatient);
		else if (formPage.as !== 'public') await signInWithPassword(page, ACCOUNTS[formPage.as]);
		const release = await holdScripts(page);
		await page.goto(formPage.path(seeded), { waitUntil: 'domcontentloaded' });
		expect(await page.locator('html').getAttribute('data-started')).toBeNull();
		// A person opens each folded section (no script needed) to type in it.
		await page.locator('main details').evaluateAll((all) => {
			for (const details of all as HTMLDetailsElement[]) details.open = true;
		});
		const expected = await fillEverything(page);
		expect(expected.size, 'fields filled on the page').toBeGreaterThan(0);
		await release();
		await page.locator('html[data-started]').waitFor({ state: 'attached' });
		const after = new Map((await readControls(page)).map((c) => [c.key, c]));
		const lost = [...expected.entries()].flatMap(([key, want]) => {
			const now = after.get(key);
			const kept = want.checked ?? want.value;
			const found = want.checked === undefined ? now?.value : now?.checked;
			return found === kept
				? []
				: [`${key}: typed ${JSON.stringify(kept)}, now ${JSON.stringify(found)}`];
		});
		expect(lost, `fields wiped on ${formPage.path(seeded)}`).toEqual([]);
	});
}
