import { expect, test } from '@playwright/test';
import { execFile } from 'node:child_process';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import {
	ACCOUNTS,
	expectNoAxeViolations,
	seedCaptionTrack,
	seedReadyRecording,
	signedInRequest,
	signInWithPassword,
	open,
	reload
} from './support';
import { FFMPEG } from '../integration/recordings-support';

/*
 * A recording with no captions gets cues timed to its narration: the stack's speech-to-text
 * setting points at the speech stand-in (stack.ts), so the draft's words are its placeholders.
 */

const run = promisify(execFile);
const shots = join(import.meta.dirname, '../.run/e2e-results');
const RUN = Date.now().toString(36);
const SECONDS = 14;
// Tones stand for speech: 0.5–3 s, 4.5–8.5 s and 9–12 s. The 7.5 s from 4.5 s to 12 s is over
// the BBC's 7 s, so it is cut at the 0.5 s pause: three cues.
const SOUND: [kind: 'tone' | 'quiet', seconds: number][] = [
	['quiet', 0.5],
	['tone', 2.5],
	['quiet', 1.5],
	['tone', 4],
	['quiet', 0.5],
	['tone', 3],
	['quiet', 2]
];
const EXPECTED = [
	[0.5, 3],
	[4.5, 9],
	[9, 12]
];

let dir: string;
let recordingId: string;

async function makeClip(path: string) {
	const inputs = SOUND.flatMap(([kind, seconds], i) =>
		kind === 'tone'
			? ['-f', 'lavfi', '-i', `sine=f=${300 + 100 * i}:sample_rate=48000:d=${seconds}`]
			: ['-f', 'lavfi', '-t', String(seconds), '-i', 'anullsrc=r=48000:cl=mono']
	);
	const audio = SOUND.map((_, i) => `[${i + 1}:a]`).join('');
	await run(FFMPEG, [
		'-hide_banner',
		'-loglevel',
		'error',
		'-y',
		'-f',
		'lavfi',
		'-i',
		`testsrc=s=320x240:r=25:d=${SECONDS}`,
		...inputs,
		'-filter_complex',
		`${audio}concat=n=${SOUND.length}:v=0:a=1[a]`,
		'-map',
		'0:v',
		'-map',
		'[a]',
		'-c:v',
		'libx264',
		'-preset',
		'ultrafast',
		'-pix_fmt',
		'yuv420p',
		'-c:a',
		'aac',
		'-movflags',
		'+faststart',
		path
	]);
}

test.beforeAll(async () => {
	dir = await mkdtemp(join(tmpdir(), 'kinelume-e2e-speech-'));
	const clip = join(dir, 'narrated.mp4');
	await makeClip(clip);
	recordingId = await seedReadyRecording(ACCOUNTS.clinician, {
		rendition: await readFile(clip),
		durationSeconds: SECONDS,
		title: `Bridging, narrated ${RUN}`
	});
});

test.afterAll(async () => {
	await rm(dir, { recursive: true, force: true });
});

test('an empty track gets cues timed to the narration, accepted, undoable and saved', async ({
	page
}) => {
	test.setTimeout(120_000);
	// A track whose saved version holds no cues, named for this run.
	const trackId = seedCaptionTrack(recordingId, [], { language: 'en-GB' });
	await signInWithPassword(page, ACCOUNTS.clinician);
	await open(page, `/recordings/${recordingId}/studio?track=${trackId}`);
	await expect(page.getByTestId('studio')).toHaveAttribute('data-ready', 'true');

	const offer = page.getByTestId('speech-draft');
	await expect(offer.getByRole('heading', { name: 'Cues from the narration' })).toBeVisible();
	await offer.getByRole('button', { name: 'Draft cues from the speech' }).click();
	await expect(page.getByTestId('speech-draft-status')).toHaveText(
		'Draft ready: 3 cues timed to the speech, not saved yet.',
		{ timeout: 60_000 }
	);
	await expect(page.getByTestId('speech-draft-words')).toContainText(
		'placeholders from a stand-in service, not recognised speech'
	);
	await expect(offer).toContainText('recognises no words');
	// Nothing is saved until the clinician accepts.
	await expect(page.getByTestId('save-state')).toHaveText('Saved as version 1');
	await expectNoAxeViolations(page);
	await page.screenshot({ path: join(shots, 'speech-draft-ready.png'), fullPage: true });

	await offer.getByRole('button', { name: 'Accept: put 3 cues in the editor' }).click();
	await expect(offer).toHaveCount(0);
	await expect(page.getByRole('heading', { name: /Cues of “Seeded” \(3\)/ })).toBeVisible();
	// Placeholders are shown in the draft but not put in as words: the cues are blank to type into.
	await expect(page.getByLabel('Words of cue 1')).toHaveValue('');
	await expect(page.getByTestId('studio-note')).toContainText('3 draft cues put into the editor');

	// One undoable change: Undo empties the track (and offers the draft again), Redo brings it back.
	await page.getByRole('button', { name: 'Undo', exact: true }).click();
	await expect(page.getByRole('heading', { name: /Cues of “Seeded” \(0\)/ })).toBeVisible();
	await expect(page.getByTestId('speech-draft')).toBeVisible();
	await page.getByRole('button', { name: 'Redo', exact: true }).click();
	await expect(page.getByRole('heading', { name: /Cues of “Seeded” \(3\)/ })).toBeVisible();

	// Saved by the autosave like any edit.
	await expect(page.getByTestId('save-state')).toHaveText(/Saved as version \d+/, {
		timeout: 20_000
	});
	await expect(page.getByTestId('save-state')).not.toHaveText('Saved as version 1');

	await reload(page);
	await expect(page.getByTestId('studio')).toHaveAttribute('data-ready', 'true');
	await expect(page.getByRole('heading', { name: /Cues of “Seeded” \(3\)/ })).toBeVisible();
	await expect(page.getByTestId('speech-draft')).toHaveCount(0);

	const clinician = await signedInRequest(ACCOUNTS.clinician);
	const body = (await (await clinician.get(`/api/tracks/${trackId}/versions`)).json()) as {
		current: { version: number; cues: { start: number; end: number; text: string }[] };
	};
	await clinician.dispose();
	const { cues } = body.current;
	expect(cues).toHaveLength(3);
	cues.forEach((cue, i) => {
		expect(Math.abs(cue.start - EXPECTED[i][0])).toBeLessThan(0.1);
		expect(Math.abs(cue.end - EXPECTED[i][1])).toBeLessThan(0.1);
	});
	expect(cues.map((c) => c.text)).toEqual(['', '', '']);
});
