/**
 * `npm run bench:authoring`: the whole authoring, from a narrated recording to a published
 * programme, driven through the real pages of the production build in Chromium as the demo
 * clinician, counting the clinician's actions and the wall time of each stage.
 *
 *   upload      choose the file, open the recording, wait until its web version is ready
 *   captions    make the captions track, "Draft cues from the speech", Accept, type each cue's words
 *   segments    accept the suggested boundaries, name any part left unnamed, confirm, wait for the cuts
 *   exercises   "Make exercises from these segments": settle the ranges, correct what the narration
 *               got wrong against what was said, make the drafts
 *   ready       mark each exercise ready on its page
 *   programme   a new programme for a demo patient, the three exercises added, published
 *
 * The recording is made first (authoring-media.ts: espeak-ng speaks an invented script, ffmpeg
 * draws a card per exercise). A click or a key press is one action, filling or choosing a field
 * one action; the words typed into cues are counted apart (the speech stand-in recognises no
 * words, so every cue's words are typed). Goal: no more than 40 actions besides typing words.
 * It also scores the narration's proposals for the made exercises against the script
 * (src/lib/authoring/accuracy.ts).
 *
 * Its own storage, mail and speech stand-ins, database and ports (app 4277) in a temporary
 * folder, removed afterwards, so it never meets an end-to-end run. A measurement, not a test:
 * it exits 0 whether or not the goal is met, and non-zero when the flow breaks (an element not
 * found, a wait that never ends), leaving a screenshot in .data/bench/.
 *
 *   npm run bench:authoring -- [--build] [--list] [--headed]
 *
 * `--build` rebuilds the app first (otherwise an existing build/ is used as it is); `--list`
 * prints every counted action; `--headed` shows the browser.
 */
import { mkdirSync } from 'node:fs';
import { loadavg } from 'node:os';
import { join } from 'node:path';
import { chromium, type Browser, type Page } from '@playwright/test';
import Database from 'better-sqlite3';
import { compareDraft, DRAFT_FIELDS, type DraftField } from '../lib/authoring/accuracy';
import { draftExercise } from '../lib/authoring/exercise-draft';
import { matchingForm } from '../lib/authoring/transcript';
import { vocabularyFor } from '../lib/authoring/vocabulary';
import { parseTypedTime } from '../lib/captions/edit';
import type { Cue } from '../lib/captions/types';
import { DOSAGE_FIELDS } from '../lib/dosage/types';
import { makeNarratedRecording, type SpokenPhrase } from './bench/authoring-media';
import { EXERCISES, type NarratedExercise } from './bench/authoring-script';
import { Clinician, until, type StageRecord } from './bench/clinician';
import {
	BENCH_CLINICIAN,
	buildIfAsked,
	copyBuild,
	ROOT,
	runBench,
	seedClinician,
	startApp,
	startFakes,
	startHelper,
	startRun,
	type BenchRun
} from './bench/stack';

const PORTS = { app: 4277, storage: 4773, smtp: 2733, mailApi: 2734 };
const SPEECH_PORT = 4774;
const SPEECH_KEY = 'bench-speech-key';
const GOAL_ACTIONS = 40;
const LANGUAGE = 'en-GB';
/** A seeded demo patient (src/scripts/demo/seed.ts). */
const PATIENT = 'Walter Brindle';
const FILE_NAME = 'Home exercises.mp4';
/** The e2e config's flags (tests/e2e/playwright.config.ts). */
const CHROMIUM_ARGS = [
	'--no-sandbox',
	'--disable-gpu',
	'--disable-quic',
	'--no-first-run',
	'--disable-background-networking',
	'--disable-component-update',
	'--disable-sync'
];
const MINUTES = 60_000;
const TYPING_WORDS_PER_MINUTE = 40;

/** Text compared without case, punctuation or spacing differences. */
const comparable = (text: string) =>
	matchingForm(text)
		.replace(/[^\p{L}\p{N}' ]+/gu, ' ')
		.replace(/\s+/g, ' ')
		.trim();

interface Correction {
	exercise: string;
	field: string;
	from: string;
	to: string;
}

interface Outcome {
	recordingId: string;
	durationSeconds: number;
	draftedCues: number;
	removedCues: number;
	clearedPlaceholders: number;
	suggestions: number;
	namedParts: number;
	corrections: Correction[];
	proposals: Record<DraftField, ProposalScore>;
}

async function main(): Promise<void> {
	const run = await startRun('bench-authoring', PORTS);
	Object.assign(process.env, {
		SPEECH_TO_TEXT_URL: `http://127.0.0.1:${SPEECH_PORT}/v1`,
		SPEECH_TO_TEXT_API_KEY: SPEECH_KEY,
		SPEECH_TO_TEXT_MODEL: 'stand-in'
	});
	// startRun names a scratch folder for the media work; uploads need it to exist.
	mkdirSync(process.env.MEDIA_WORK_DIR!, { recursive: true });
	const loadStart = loadavg()[0];
	await runBench(run, async () => {
		await buildIfAsked(run);
		const buildCopy = copyBuild(run);
		console.log('Making the narrated recording (espeak-ng and ffmpeg)…');
		const recording = await makeNarratedRecording(join(run.dataDir, 'recording'), FILE_NAME);
		console.log(
			`  ${recording.durationSeconds.toFixed(1)} s, ${recording.phrases.length} phrases, ` +
				`exercises from ${recording.sectionStarts.map((s) => `${s.toFixed(1)} s`).join(', ')}`
		);
		console.log('Starting the stand-ins, seeding the demo clinic, starting the app…');
		await startFakes(run);
		await startHelper(run, 'speech-fake.ts', [String(SPEECH_PORT), SPEECH_KEY], 'speech');
		await seedClinician();
		const { closeDatabase } = await import('../lib/server/db');
		closeDatabase();
		const app = await startApp(run, buildCopy);

		const browser = await chromium.launch({
			executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
			args: CHROMIUM_ARGS,
			headless: !process.argv.includes('--headed')
		});
		try {
			const { clinician, outcome } = await Promise.race([
				drive(browser, run, recording.path, recording.phrases, recording.durationSeconds),
				app.exited
			]);
			report(clinician.stages, outcome, loadStart);
		} finally {
			await browser.close();
		}
	});
}

async function drive(
	browser: Browser,
	run: BenchRun,
	file: string,
	phrases: SpokenPhrase[],
	durationSeconds: number
): Promise<{ clinician: Clinician; outcome: Outcome }> {
	const context = await browser.newContext({ baseURL: run.origin });
	const page = await context.newPage();
	page.setDefaultTimeout(20_000);
	const c = new Clinician(page);
	try {
		await signIn(page);
		console.log('Driving the authoring in Chromium:');
		const outcome = await author(c, page, file, phrases, durationSeconds);
		c.finish();
		return { clinician: c, outcome };
	} catch (error) {
		const dir = join(ROOT, '.data/bench');
		mkdirSync(dir, { recursive: true });
		const shot = join(dir, 'authoring-failure.png');
		await page.screenshot({ path: shot, fullPage: true }).catch(() => {});
		const stage = c.stages.at(-1)?.name ?? 'sign-in';
		throw new Error(
			`The flow broke in the ${stage} stage at ${page.url()} (screenshot: ${shot}): ${(error as Error).message}`,
			{ cause: error }
		);
	} finally {
		await context.close();
	}
}

/** Signs in through the sign-in page; not counted (a clinician at work is signed in already). */
async function signIn(page: Page): Promise<void> {
	const { DEMO_PASSWORD } = await import('./demo/seed');
	await page.goto('/signin');
	await page.locator('html[data-started]').waitFor({ state: 'attached' });
	const form = page.locator('form[action="?/password"]');
	await form.getByLabel('E-mail address').fill(BENCH_CLINICIAN);
	await form.getByLabel('Password').fill(DEMO_PASSWORD);
	await form.getByRole('button', { name: 'Sign in' }).click();
	await page.waitForURL((url) => !url.pathname.startsWith('/signin'));
}

async function author(
	c: Clinician,
	page: Page,
	file: string,
	phrases: SpokenPhrase[],
	durationSeconds: number
): Promise<Outcome> {
	const nav = page.getByRole('navigation', { name: 'Main' });

	// --- upload ---------------------------------------------------------------------------------
	c.begin('upload');
	await c.click(nav.getByRole('link', { name: 'Recordings', exact: true }), 'Recordings (menu)');
	await c.chooseFile(page.getByText('Choose video files'), file, 'Choose video files');
	const upload = page.getByRole('listitem', { name: `Upload of ${FILE_NAME}` });
	await c.wait(() =>
		upload
			.getByTestId('upload-phase')
			.filter({ hasText: /^Uploaded$/ })
			.waitFor({ timeout: 5 * MINUTES })
	);
	await c.click(upload.getByRole('link', { name: 'Open the recording' }), 'Open the recording');
	await page.waitForURL(/\/recordings\/[0-9a-f-]{36}$/);
	const recordingId = new URL(page.url()).pathname.split('/')[2];
	await c.wait(() => page.getByTestId('player').waitFor({ timeout: 10 * MINUTES }));

	// --- captions -------------------------------------------------------------------------------
	c.begin('captions');
	// No track yet: the recording page's one button makes it and opens the editor.
	await c.click(page.getByRole('button', { name: 'Caption editor' }), 'Caption editor');
	await c.wait(() => page.locator('[data-testid="studio"][data-ready="true"]').waitFor());
	const trackId = new URL(page.url()).searchParams.get('track');
	if (!trackId) throw new Error('The studio opened without ?track=.');
	await c.click(
		page.getByRole('button', { name: 'Draft cues from the speech' }),
		'Draft cues from the speech'
	);
	await c.wait(() =>
		page
			.getByTestId('speech-draft-status')
			.filter({ hasText: /^Draft ready: \d+ cues?/ })
			.waitFor({ timeout: 5 * MINUTES })
	);
	await c.click(
		page.getByRole('button', { name: /^Accept: put \d+ cues? in the editor$/ }),
		'Accept'
	);

	const cueList = page.getByRole('list', { name: 'Cues' });
	await cueList.locator('textarea').first().waitFor();
	const drafted = await readCues(page);
	const words = wordsForCues(drafted, phrases);
	// A cue timed to no phrase (a breath, a click) goes: the clinician removes it.
	let removedCues = 0;
	for (let k = drafted.length - 1; k >= 0; k--) {
		if (words[k] !== '') continue;
		await c.click(page.getByRole('button', { name: `Remove cue ${k + 1}` }), `Remove cue ${k + 1}`);
		removedCues++;
	}
	const texts = words.filter((w) => w !== '');
	const field = (k: number) => page.getByLabel(`Words of cue ${k + 1}`, { exact: true });
	await c.click(field(0), 'Words of cue 1');
	let clearedPlaceholders = 0;
	for (const [k, text] of texts.entries()) {
		if ((await field(k).inputValue()) !== '') {
			await c.press('Control+A', 'Ctrl+A (select the placeholder words)');
			clearedPlaceholders++;
		}
		await c.typeWords(text);
		if (k < texts.length - 1) {
			await c.press('Alt+ArrowDown', 'Alt+↓ (next cue)');
			await until(`the words of cue ${k + 2} to take the focus`, () =>
				field(k + 1).evaluate((el) => (el === document.activeElement ? true : null))
			);
		}
	}
	// The autosave stores the words a few seconds after the last key.
	await c.wait(() =>
		until('the typed words to be saved', async () => {
			const res = await page.request.get(`/api/tracks/${trackId}/versions`);
			if (!res.ok()) return null;
			const body = (await res.json()) as { current: { cues: Cue[] } };
			const saved = body.current.cues.map((cue) => cue.text.replace(/\s+/g, ' ').trim());
			return saved.length === texts.length && saved.every((s, i) => s === texts[i]) ? true : null;
		})
	);

	// --- segments -------------------------------------------------------------------------------
	c.begin('segments');
	// Straight from the caption editor to the segments.
	await c.click(page.getByRole('link', { name: 'Exercise segments' }), 'Exercise segments');
	const acceptAll = page.getByRole('button', { name: 'Accept all suggestions' });
	await c.wait(() => acceptAll.waitFor({ timeout: 5 * MINUTES }));
	const suggestions = await page.getByTestId('suggestion').count();
	await c.click(acceptAll, 'Accept all suggestions');
	const parts = page.getByTestId('plan').getByRole('listitem');
	const included: number[] = [];
	for (let i = 0; i < (await parts.count()); i++) {
		if (await parts.nth(i).getByRole('checkbox').isChecked()) included.push(i);
	}
	if (included.length !== EXERCISES.length) {
		const described = await parts.allInnerTexts();
		throw new Error(
			`Accepting the ${suggestions} suggestions gave ${included.length} parts to cut, not ${EXERCISES.length}; ` +
				`moving boundaries by hand is not scripted here. Parts: ${described.map((d) => d.replace(/\s+/g, ' ')).join(' | ')}`
		);
	}
	let namedParts = 0;
	for (const [n, i] of included.entries()) {
		const name = page.getByLabel(`Name of part ${i + 1}`, { exact: true });
		if ((await name.inputValue()).trim() !== '') continue;
		await c.fill(name, EXERCISES[n].expected.title, `Name of part ${i + 1}`);
		namedParts++;
	}
	await c.click(page.getByRole('button', { name: 'Confirm segments' }), 'Confirm segments');
	const confirmed = page.getByTestId('confirmed-segment');
	await c.wait(async () => {
		await page
			.getByText(`Confirmed ${EXERCISES.length} segments`)
			.waitFor({ timeout: 2 * MINUTES });
		await until(
			'the segments to be cut',
			async () => {
				const states = await confirmed.evaluateAll((els) =>
					els.map((el) => el.getAttribute('data-status'))
				);
				if (states.includes('failed')) throw new Error('A segment cut failed.');
				return states.length === EXERCISES.length && states.every((s) => s === 'ready')
					? true
					: null;
			},
			10 * MINUTES,
			1000
		);
	});

	// --- exercises ------------------------------------------------------------------------------
	c.begin('exercises');
	await c.click(
		page.getByRole('link', { name: 'Make exercises from these segments' }),
		'Make exercises from these segments'
	);
	await page.locator('#row-0-title').waitFor();
	const corrections: Correction[] = [];
	for (const [i, exercise] of EXERCISES.entries()) {
		corrections.push(...(await review(c, page, i, exercise)));
	}
	// Made ready on the same page: one tick instead of a visit to each exercise.
	await c.check(
		page.getByRole('checkbox', { name: 'Make them ready for programmes now' }),
		'Ready now'
	);
	await c.click(
		page.getByRole('button', { name: 'Make the ticked exercises' }),
		'Make the ticked exercises'
	);
	const made = page.getByText(/exercises? made, ready for programmes:/);
	const refused = page.getByText(/Nothing was made/);
	await c.wait(() => made.or(refused).waitFor());
	if (await refused.isVisible()) {
		const problems = await page.locator('fieldset p.text-berry').allInnerTexts();
		throw new Error(`The exercises were refused: ${problems.join(' ')}`);
	}
	const titles = EXERCISES.map((e) => e.expected.title);

	// --- programme ------------------------------------------------------------------------------
	c.begin('programme');
	await c.click(nav.getByRole('link', { name: 'Patients', exact: true }), 'Patients (menu)');
	await c.click(
		page.getByRole('link', { name: `New programme for ${PATIENT}` }),
		`New programme for ${PATIENT}`
	);
	await c.click(page.getByRole('button', { name: 'Start building' }), 'Start building');
	await page.waitForURL(/\/programmes\/[0-9a-f-]{36}$/);
	for (const title of titles) {
		await c.click(page.getByRole('button', { name: `Add ${title}`, exact: true }), `Add ${title}`);
	}
	await until('the three exercises in the programme', async () =>
		(await page.locator('ol > li h3').count()) === titles.length ? true : null
	);
	await c.click(
		page.getByRole('button', { name: `Publish and e-mail ${PATIENT.split(' ')[0]}` }),
		'Publish and e-mail'
	);
	await c.wait(() => page.getByText(`Published and e-mailed to ${PATIENT}.`).waitFor());
	c.finish();

	return {
		recordingId,
		durationSeconds,
		draftedCues: drafted.length,
		removedCues,
		clearedPlaceholders,
		suggestions,
		namedParts,
		corrections,
		proposals: await proposalScores(page, recordingId)
	};
}

/** The cues in the studio's list as they stand: times from the time fields, words from the text. */
async function readCues(page: Page): Promise<{ start: number; end: number }[]> {
	const rows = page.getByRole('list', { name: 'Cues' }).locator(':scope > li');
	const cues: { start: number; end: number }[] = [];
	for (let k = 0; k < (await rows.count()); k++) {
		const start = parseTypedTime(await rows.nth(k).locator('input[id^="start-"]').inputValue());
		const end = parseTypedTime(await rows.nth(k).locator('input[id^="end-"]').inputValue());
		if (start === null || end === null) throw new Error(`Cue ${k + 1} shows no readable times.`);
		cues.push({ start, end });
	}
	return cues;
}

/**
 * The words the clinician hears during each cue: each phrase of the script goes to the cues it
 * overlaps, its words shared by the time each cue covers of it (a slight overlap, under 0.25 s,
 * takes no words when a larger one exists). A phrase no cue covers goes to the nearest cue.
 */
function wordsForCues(
	cues: readonly { start: number; end: number }[],
	phrases: readonly SpokenPhrase[]
): string[] {
	const words = cues.map(() => [] as string[]);
	for (const phrase of phrases) {
		const list = phrase.text.split(/\s+/).filter(Boolean);
		const raw = cues.map((c) =>
			Math.max(0, Math.min(c.end, phrase.end) - Math.max(c.start, phrase.start))
		);
		const largest = Math.max(...raw);
		const overlaps = raw.map((o) => (o >= 0.25 || o === largest ? o : 0));
		const total = overlaps.reduce((a, b) => a + b, 0);
		if (total === 0) {
			const middle = (phrase.start + phrase.end) / 2;
			const distance = cues.map((c) => Math.abs((c.start + c.end) / 2 - middle));
			words[distance.indexOf(Math.min(...distance))].push(...list);
			continue;
		}
		let given = 0;
		let covered = 0;
		overlaps.forEach((o, i) => {
			if (o === 0) return;
			covered += o;
			const upTo = Math.round((list.length * covered) / total);
			words[i].push(...list.slice(given, upTo));
			given = upTo;
		});
	}
	return words.map((w) => w.join(' '));
}

/**
 * One row of the review page as a careful clinician leaves it: what it asks to settle is
 * settled, and a proposal that differs from what was said is corrected (each change one action).
 */
async function review(
	c: Clinician,
	page: Page,
	row: number,
	exercise: NarratedExercise
): Promise<Correction[]> {
	const { expected } = exercise;
	const corrections: Correction[] = [];
	const at = (field: string) => page.locator(`#row-${row}-${field}`);
	const change = async (
		field: string,
		label: string,
		want: string,
		same: (have: string) => boolean,
		kind: 'fill' | 'select'
	) => {
		const have = await at(field).inputValue();
		if (same(have)) return;
		const what = `${label} of row ${row + 1}`;
		if (kind === 'fill') await c.fill(at(field), want, what);
		else await c.select(at(field), want, what);
		corrections.push({ exercise: expected.title, field: label, from: have, to: want });
	};
	const sameText = (want: string) => (have: string) => comparable(have) === comparable(want);
	await change('title', 'Title', expected.title, sameText(expected.title), 'fill');
	await change(
		'bodyRegion',
		'Body region',
		expected.bodyRegion,
		sameText(expected.bodyRegion),
		'fill'
	);
	if (expected.position) {
		await change(
			'position',
			'Position',
			expected.position,
			(h) => h === expected.position,
			'select'
		);
	}
	if (expected.movementType) {
		const want = expected.movementType;
		await change('movementType', 'Movement type', want, (h) => h === want, 'select');
	}
	if (expected.side) {
		await change('side', 'Side', expected.side, (h) => h === expected.side, 'select');
	}
	const equipment = expected.equipment ?? [];
	const setOf = (list: string) =>
		[...new Set(list.split(',').map(comparable).filter(Boolean))].sort().join('|');
	await change(
		'equipment',
		'Equipment',
		equipment.join(', '),
		(have) => setOf(have) === setOf(equipment.join(',')),
		'fill'
	);
	for (const field of DOSAGE_FIELDS) {
		const said = expected.dosage?.[field];
		if (said === undefined) continue;
		const want = typeof said === 'number' ? said : exercise.settleTo?.[field];
		if (want === undefined) throw new Error(`No number to settle ${field} of ${expected.title}.`);
		await change(`dosage-${field}`, field, String(want), (h) => h.trim() === String(want), 'fill');
	}
	const quotes = expected.safetyNotes ?? [];
	const notes = await at('safetyNotes').inputValue();
	const missing = quotes.filter((q) => !comparable(notes).includes(comparable(q)));
	if (missing.length > 0) {
		const want = [notes.trim(), ...missing.map((q) => `- ${q[0].toUpperCase()}${q.slice(1)}.`)]
			.filter(Boolean)
			.join('\n');
		await c.fill(at('safetyNotes'), want, `Safety notes of row ${row + 1}`);
		corrections.push({ exercise: expected.title, field: 'Safety notes', from: notes, to: want });
	}
	return corrections;
}

// --- the report ---------------------------------------------------------------------------------

const seconds = (ms: number) => `${(ms / 1000).toFixed(1)} s`;

interface ProposalScore {
	right: number;
	wrong: number;
	missed: number;
	expected: number;
}

/** Proposal accuracy: the narration's draft of each made exercise's segment against the script. */
async function proposalScores(
	page: Page,
	recordingId: string
): Promise<Record<DraftField, ProposalScore>> {
	const scores = Object.fromEntries(
		DRAFT_FIELDS.map((f) => [f, { right: 0, wrong: 0, missed: 0, expected: 0 }])
	) as Record<DraftField, ProposalScore>;
	const listed = await page.request.get(`/api/recordings/${recordingId}/segments`);
	const { segments } = (await listed.json()) as { segments: { id: string }[] };
	if (segments.length !== EXERCISES.length) {
		throw new Error(`The recording has ${segments.length} segments, not ${EXERCISES.length}.`);
	}
	for (const [i, segment] of segments.entries()) {
		const res = await page.request.get(`/api/segments/${segment.id}/transcript.json`);
		if (!res.ok()) throw new Error(`The transcript of segment ${i + 1} answered ${res.status()}.`);
		const { lines } = (await res.json()) as { lines: Cue[] };
		const draft = draftExercise(lines, vocabularyFor(LANGUAGE));
		const expected = EXERCISES[i].expected;
		const counts = compareDraft(draft, expected);
		for (const field of DRAFT_FIELDS) {
			const c = counts[field];
			const s = scores[field];
			s.right += c.truePositives;
			s.wrong += c.falsePositives;
			s.missed += c.falseNegatives;
			s.expected += c.truePositives + c.falseNegatives;
		}
	}
	return scores;
}

/** The made exercises and the programme as stored: a check that the flow wrote what it meant to. */
function storedState(outcome: Outcome): string {
	const db = new Database(process.env.DATABASE_PATH!, { readonly: true });
	try {
		const rows = db
			.prepare(
				`select e.title, e.status from exercise e join segment s on s.id = e.segment_id
				 where s.recording_id = ?`
			)
			.all(outcome.recordingId) as { title: string; status: string }[];
		const programme = db
			.prepare(
				`select p.status, count(i.id) as items from programme p
				 join programme_item i on i.programme_id = p.id
				 join exercise e on e.id = i.exercise_id
				 join segment s on s.id = e.segment_id
				 where s.recording_id = ? group by p.id`
			)
			.get(outcome.recordingId) as { status: string; items: number } | undefined;
		const ready = rows.filter((r) => r.status === 'ready').length;
		return (
			`${rows.length} exercises made from the recording, ${ready} ready; ` +
			(programme
				? `programme ${programme.status} with ${programme.items} exercises`
				: 'no programme uses them')
		);
	} finally {
		db.close();
	}
}

function printProposals(scores: Record<DraftField, ProposalScore>): void {
	const shown = DRAFT_FIELDS.filter((f) => scores[f].expected + scores[f].wrong > 0);
	const cell = (f: DraftField) => {
		const s = scores[f];
		return `${s.right}/${s.expected}${s.wrong ? ` (${s.wrong} wrong)` : ''}`;
	};
	const sum = (pick: (s: ProposalScore) => number) =>
		DRAFT_FIELDS.reduce((a, f) => a + pick(scores[f]), 0);
	const right = sum((s) => s.right);
	const wrong = sum((s) => s.wrong);
	const expected = sum((s) => s.expected);
	const percent = (part: number, whole: number) =>
		whole === 0 ? '—' : `${Math.round((part / whole) * 100)}%`;
	console.log(
		`\nProposal accuracy (the narration's draft of each made exercise against the script; ` +
			`right/said per field, each equipment item and caution counted):`
	);
	console.log(`  ${shown.map((f) => `${f} ${cell(f)}`).join(', ')}`);
	console.log(
		`  In all ${right} of ${expected} said values proposed right (recall ${percent(right, expected)}), ` +
			`${wrong} wrong proposals (precision ${percent(right, right + wrong)}).`
	);
}

function report(stages: StageRecord[], outcome: Outcome, loadStart: number): void {
	const kinds = (s: StageRecord, kind: string) => s.actions.filter((a) => a.kind === kind).length;
	const rows = stages.map((s) => {
		const wall = (s.endedAt ?? performance.now()) - s.startedAt;
		return [
			s.name,
			String(s.actions.length),
			String(kinds(s, 'click')),
			String(kinds(s, 'key')),
			String(kinds(s, 'field')),
			s.typedWords ? `${s.typedWords} / ${s.typedCharacters}` : '—',
			seconds(wall),
			seconds(s.waitedMs)
		];
	});
	const total = (pick: (s: StageRecord) => number) => stages.reduce((a, s) => a + pick(s), 0);
	const actions = total((s) => s.actions.length);
	const typedWords = total((s) => s.typedWords);
	const typedCharacters = total((s) => s.typedCharacters);
	const wall = total((s) => (s.endedAt ?? 0) - s.startedAt);
	rows.push([
		'in all',
		String(actions),
		String(total((s) => kinds(s, 'click'))),
		String(total((s) => kinds(s, 'key'))),
		String(total((s) => kinds(s, 'field'))),
		`${typedWords} / ${typedCharacters}`,
		seconds(wall),
		seconds(total((s) => s.waitedMs))
	]);
	const header = [
		'stage',
		'actions',
		'clicks',
		'keys',
		'fields',
		'typed words / chars',
		'wall time',
		'waiting for app'
	];
	const widths = header.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
	const line = (cells: string[]) =>
		cells.map((v, i) => (i === 0 ? v.padEnd(widths[i]) : v.padStart(widths[i]))).join('  ');

	console.log(
		`\nAuthoring benchmark: a ${outcome.durationSeconds.toFixed(0)} s narrated recording of ` +
			`${EXERCISES.length} exercises to a published programme, in Chromium\n`
	);
	console.log(line(header));
	console.log(widths.map((w) => '-'.repeat(w)).join('  '));
	for (const [i, r] of rows.entries()) {
		if (i === rows.length - 1) console.log(widths.map((w) => '-'.repeat(w)).join('  '));
		console.log(line(r));
	}
	if (process.argv.includes('--list')) {
		for (const s of stages) {
			console.log(`\n${s.name}: ${s.actions.map((a) => a.what).join(' · ')}`);
		}
	}
	const captions = stages.find((s) => s.name === 'captions');
	console.log(
		`\nCaption typing, counted apart: ${typedWords} words, ${typedCharacters} characters in ` +
			`${outcome.draftedCues - outcome.removedCues} cues (the speech draft timed ` +
			`${outcome.draftedCues}; ${outcome.removedCues} removed).`
	);
	if (captions) {
		console.log(
			`  Of the ${captions.actions.length} caption actions, ${outcome.clearedPlaceholders} are Ctrl+A to ` +
				'clear the stand-in’s placeholder words and ' +
				`${captions.actions.filter((a) => a.what.startsWith('Alt+')).length} are Alt+↓ to the next cue.`
		);
	}
	const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;
	console.log(
		`Segments: ${plural(outcome.suggestions, 'suggestion')} accepted in one click, ` +
			`${plural(outcome.namedParts, 'part')} named by hand.`
	);
	console.log(
		`Review page: ${outcome.corrections.length} fields changed` +
			(outcome.corrections.length
				? `: ${outcome.corrections.map((k) => `${k.exercise} ${k.field} “${k.from.replace(/\s+/g, ' ')}” → “${k.to.replace(/\s+/g, ' ')}”`).join('; ')}`
				: '')
	);
	console.log(`Stored: ${storedState(outcome)}.`);
	printProposals(outcome.proposals);
	const met = actions <= GOAL_ACTIONS;
	console.log(
		`\nActions besides typing words: ${actions}. Wall time: ${seconds(wall)} ` +
			`(${seconds(total((s) => s.waitedMs))} of it waiting for the app).`
	);
	// The browser clicks and types without a person's pauses; this says what the typing alone
	// would add at a steady typing speed (our assumption, not a measurement).
	console.log(
		`  Machine time: the words are typed at once. At ${TYPING_WORDS_PER_MINUTE} words a minute ` +
			`the typing alone would take a person about ${(typedWords / TYPING_WORDS_PER_MINUTE).toFixed(1)} min.`
	);
	console.log(
		`Goal: ≤ ${GOAL_ACTIONS} actions besides typing words — ${met ? 'met' : `missed (by ${actions - GOAL_ACTIONS})`}`
	);
	const [loadEnd] = loadavg();
	console.log(
		`Load average ${loadStart.toFixed(2)} at the start, ${loadEnd.toFixed(2)} at the end` +
			(loadStart > 0.5 ? ' (other work was running: the times are less reliable).' : '.')
	);
}

await main();
