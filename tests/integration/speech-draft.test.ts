import { fakesDirectory, testEnv } from './env';
import { execFile } from 'node:child_process';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

// A database of this file's own, chosen before any app module reads the configuration.
process.env.DATABASE_PATH = join(fakesDirectory, `speech-draft-${process.pid}.db`);

const { db, schema } = await import('$lib/server/db');
const captions = await import('$lib/server/captions');
const { ffmpegPath } = await import('$lib/server/media/ffmpeg');
const { readConfig } = await import('$lib/server/config');
const { checkCues, profiles } = await import('$lib/captions/checks');
const speech = await import('$lib/server/speech');
const { makeClinic, makeRecording } = await import('./factories');
const { storeMedia } = await import('./media-support');

type Recording = import('$lib/server/db/schema').Recording;
type SpeechDraft = import('$lib/captions/speech-draft').SpeechDraft;
type Settings = import('$lib/server/speech').SpeechToTextSettings;

/*
 * Real ffmpeg on a clip this file makes (tones for speech, digital silence for pauses, at known
 * times), read from the storage fake, and the speech stand-in reached through the openai SDK.
 */

const run = promisify(execFile);
let dir: string;

// 14 s: quiet, "speech" 0.5–3 s, a 1.5 s pause, speech 4.5–8.5 s, a 0.5 s pause, speech 9–12 s,
// quiet to the end. 4.5–12 s is 7.5 s, over the BBC's 7 s: cut at the 0.5 s pause.
const SOUND: [kind: 'tone' | 'quiet', seconds: number][] = [
	['quiet', 0.5],
	['tone', 2.5],
	['quiet', 1.5],
	['tone', 4],
	['quiet', 0.5],
	['tone', 3],
	['quiet', 2]
];
const SECONDS = 14;
const EXPECTED = [
	[0.5, 3],
	[4.5, 9],
	[9, 12]
];
// MP3 encoding and silencedetect's frame steps move an edge by a few hundredths of a second.
const TOLERANCE = 0.1;

async function makeClip(path: string, withSound = true): Promise<void> {
	const sound = withSound
		? SOUND.flatMap(([kind, seconds], i) =>
				kind === 'tone'
					? ['-f', 'lavfi', '-i', `sine=f=${300 + 100 * i}:sample_rate=48000:d=${seconds}`]
					: // This build's anullsrc has no duration option; -t limits the input instead.
						['-f', 'lavfi', '-t', String(seconds), '-i', 'anullsrc=r=48000:cl=mono']
			)
		: [];
	const audio = SOUND.map((_, i) => `[${i + 1}:a]`).join('');
	await run(ffmpegPath(), [
		'-hide_banner',
		'-loglevel',
		'error',
		'-y',
		'-f',
		'lavfi',
		'-i',
		`testsrc=s=160x120:r=10:d=${SECONDS}`,
		...sound,
		...(withSound
			? [
					'-filter_complex',
					`${audio}concat=n=${SOUND.length}:v=0:a=1[a]`,
					'-map',
					'0:v',
					'-map',
					'[a]'
				]
			: []),
		'-c:v',
		'libx264',
		'-preset',
		'ultrafast',
		'-pix_fmt',
		'yuv420p',
		...(withSound ? ['-c:a', 'aac'] : []),
		'-movflags',
		'+faststart',
		path
	]);
}

let clinic: { id: string };

/** A ready recording of one of makeClip's clips (its figures), under `title`. */
const insertRecording = (title: string, changes: Parameters<typeof makeRecording>[1] = {}) =>
	makeRecording(clinic.id, {
		title,
		durationSeconds: SECONDS,
		width: 160,
		height: 120,
		audioCodec: 'aac',
		frameRate: 10,
		hasAudio: true,
		...changes
	});

async function recordingWithClip(title: string, clip: string): Promise<Recording> {
	const recording = insertRecording(title);
	await storeMedia(recording, clip);
	return recording;
}

const emptyTrack = (recording: Recording, kind: 'captions' | 'chapters' = 'captions') =>
	captions.createTrack(recording, { kind, language: 'en-GB' });

const configured: Settings = {
	url: testEnv.SPEECH_TO_TEXT_URL,
	apiKey: testEnv.SPEECH_TO_TEXT_API_KEY,
	model: testEnv.SPEECH_TO_TEXT_MODEL,
	timeoutSeconds: 30
};
const noService: Settings = { ...configured, url: '' };

async function ready(
	recording: Recording,
	track: import('$lib/server/captions').CaptionTrack,
	settings: Settings
): Promise<SpeechDraft> {
	const answer = await speech.speechDraftFor(recording, track, { waitMs: 60_000, settings });
	if (answer.state !== 'ready') throw new Error('the draft should be ready within a minute');
	return answer;
}

function expectTimes(draft: SpeechDraft) {
	expect(draft.cues).toHaveLength(EXPECTED.length);
	draft.cues.forEach((cue, i) => {
		expect(Math.abs(cue.start - EXPECTED[i][0]), `cue ${i + 1} start ${cue.start}`).toBeLessThan(
			TOLERANCE
		);
		expect(Math.abs(cue.end - EXPECTED[i][1]), `cue ${i + 1} end ${cue.end}`).toBeLessThan(
			TOLERANCE
		);
	});
}

let clip: string;
let narrated: Recording;
let narratedTrack: import('$lib/server/captions').CaptionTrack;

beforeAll(async () => {
	dir = await mkdtemp(join(tmpdir(), 'kinelume-speech-draft-'));
	clinic = makeClinic('Speech draft clinic');
	clip = join(dir, 'narrated.mp4');
	await makeClip(clip);
	narrated = await recordingWithClip('Heel slides, narrated', clip);
	narratedTrack = emptyTrack(narrated);
}, 60_000);

afterAll(async () => {
	await rm(dir, { recursive: true, force: true });
});

describe('drafts timed from the sound (no speech-to-text service)', () => {
	it('times blank cues to the speech, cut at the pause to the BBC’s 7 s, and saves nothing', async () => {
		speech.forgetSpeechDrafts();
		const draft = await ready(narrated, narratedTrack, noService);
		expectTimes(draft);
		expect(draft).toMatchObject({ words: 'none', timing: 'measured' });
		expect(draft.guideline).toBe('BBC Subtitle Guidelines');
		expect(draft.cues.every((c) => c.text === '')).toBe(true);
		expect(draft.notes.join(' ')).toContain('No speech-to-text service is set up');
		// The checks treat the draft like any cues: only the missing words are errors.
		expect(new Set(checkCues(draft.cues, profiles.bbc).map((f) => f.kind))).toEqual(
			new Set(['empty'])
		);
		expect(captions.findTrack(clinic.id, narratedTrack.id)?.currentVersion).toBe(0);
	}, 60_000);

	it('uses the silences stored for segment suggestions when every stretch fits, reading no media', async () => {
		// No rendition in storage at all: only the stored silences can make this draft.
		const recording = insertRecording('Stored silences only');
		// Written as segment detection stores them (no factory makes these rows).
		db()
			.insert(schema.recordingSignals)
			.values({
				recordingId: recording.id,
				renditionReadyAt: recording.readyAt!,
				settings: 'silence -45 dB 1.5 s; scene 0.3',
				silences: [
					{ start: 0, end: 0.5 },
					{ start: 3, end: 4.5 },
					{ start: 8.5, end: 10 },
					{ start: 12, end: SECONDS }
				],
				sceneChanges: []
			})
			.run();
		const draft = await ready(recording, emptyTrack(recording), noService);
		expect(draft.timing).toBe('stored');
		expect(draft.cues.map((c) => [c.start, c.end])).toEqual([
			[0.5, 3],
			[4.5, 8.5],
			[10, 12]
		]);
		expect(draft.notes[0]).toContain('the pauses found earlier for segment suggestions');
	});

	it('measures again when a stored stretch is longer than one cue', async () => {
		// Written as segment detection stores them, but from a coarser detector.
		db()
			.insert(schema.recordingSignals)
			.values({
				recordingId: narrated.id,
				renditionReadyAt: narrated.readyAt!,
				settings: 'silence -45 dB 1.5 s; scene 0.3',
				// The 1.5 s detector misses the 0.5 s pause: 4.5–12 s would be one 7.5 s stretch.
				silences: [
					{ start: 0, end: 0.5 },
					{ start: 3, end: 4.5 },
					{ start: 12, end: SECONDS }
				],
				sceneChanges: []
			})
			.run();
		const draft = await ready(narrated, narratedTrack, noService);
		expect(draft.timing).toBe('measured');
		expectTimes(draft);
	}, 60_000);
});

describe('drafts with words from the speech stand-in, through the openai SDK', () => {
	it('carries the stand-in’s placeholder words in the same times, and says they are placeholders', async () => {
		speech.forgetSpeechDrafts();
		const draft = await ready(narrated, narratedTrack, configured);
		expectTimes(draft);
		expect(draft.words).toBe('placeholder');
		for (const cue of draft.cues) expect(cue.text).toMatch(/placeholder|stand-in/);
		// One placeholder per stretch of sound; the long stretch's words are shared by its two cues.
		expect(draft.cues.map((c) => c.text.replace(/\n/g, ' ')).join(' ')).toBe(
			[
				'[placeholder words: no speech recognition in the local stand-in]',
				'[placeholder words: no speech recognition in the local stand-in]',
				'[placeholder words: no speech recognition in the local stand-in]'
			].join(' ')
		);
		expect(draft.notes.join(' ')).toContain('placeholders, not recognised speech');
		expect(draft.notes.join(' ')).toContain('recognises no words');
		// Lines are laid out to the guideline's 37 characters.
		for (const cue of draft.cues) {
			for (const line of cue.text.split('\n')) expect(line.length).toBeLessThanOrEqual(37);
		}
		expect(captions.findTrack(clinic.id, narratedTrack.id)?.currentVersion).toBe(0);
	}, 60_000);

	it('keeps the timed draft and says why when the service cannot be reached', async () => {
		// Port 9 (discard) is closed on loopback: the connection is refused at once.
		const draft = await ready(narrated, narratedTrack, {
			...configured,
			url: 'http://127.0.0.1:9/v1'
		});
		expectTimes(draft);
		expect(draft.words).toBe('none');
		expect(draft.cues.every((c) => c.text === '')).toBe(true);
		expect(draft.notes.join(' ')).toContain('No words: 127.0.0.1:9 could not be reached.');
	}, 60_000);

	it('says the key was refused when the service refuses it', async () => {
		const draft = await ready(narrated, narratedTrack, { ...configured, apiKey: 'not-the-key' });
		expectTimes(draft);
		expect(draft.words).toBe('none');
		expect(draft.notes.join(' ')).toMatch(/No words: 127\.0\.0\.1:\d+ refused the API key\./);
	}, 60_000);

	it('says when the address does not offer the endpoint', async () => {
		const draft = await ready(narrated, narratedTrack, {
			...configured,
			url: configured.url.replace(/\/v1$/, '/elsewhere')
		});
		expect(draft.words).toBe('none');
		expect(draft.notes.join(' ')).toContain('has no audio transcription endpoint at that address');
	}, 60_000);
});

describe('what a draft is not made for', () => {
	it('refuses a track that already has cues, a chapters track and a recording not ready', async () => {
		const recording = insertRecording('Already captioned');
		const track = emptyTrack(recording);
		captions.saveVersion(track, {
			baseVersion: 0,
			cues: [{ id: '', start: 1, end: 3, text: 'Lie on your back.' }]
		});
		const saved = captions.findTrack(clinic.id, track.id)!;
		await expect(speech.speechDraftFor(recording, saved, { settings: noService })).rejects.toThrow(
			'This track already has cues.'
		);
		await expect(
			speech.speechDraftFor(recording, emptyTrack(recording, 'chapters'), { settings: noService })
		).rejects.toMatchObject({ status: 409 });
		const waiting = insertRecording('Still processing', { status: 'processing' });
		await expect(
			speech.speechDraftFor(waiting, emptyTrack(waiting), { settings: noService })
		).rejects.toThrow('The recording is not ready yet');
	});

	it('answers a sentence when the rendition cannot be read', async () => {
		const missing = insertRecording('Rendition missing');
		await expect(
			speech.speechDraftFor(missing, emptyTrack(missing), { waitMs: 60_000, settings: noService })
		).rejects.toMatchObject({
			status: 422,
			message: expect.stringContaining('sound could not be read')
		});
	}, 60_000);

	it('makes no cues for a recording without sound, and says so', async () => {
		const silentClip = join(dir, 'silent.mp4');
		await makeClip(silentClip, false);
		const silent = await recordingWithClip('No sound', silentClip);
		const draft = await ready(silent, emptyTrack(silent), configured);
		expect(draft.cues).toEqual([]);
		expect(draft.notes).toEqual([
			'This recording has no sound, so there is no speech to time cues to.'
		]);
	}, 60_000);

	it('answers working while the sound is still being read, then the draft', async () => {
		speech.forgetSpeechDrafts();
		const first = await speech.speechDraftFor(narrated, narratedTrack, {
			waitMs: 0,
			settings: noService
		});
		expect(first).toEqual({ state: 'working' });
		const later = await ready(narrated, narratedTrack, noService);
		expectTimes(later);
	}, 60_000);
});

describe('speech-to-text settings', () => {
	it('are off unless set, and a URL without a model stops start-up with a sentence', () => {
		const defaults = readConfig({});
		expect(defaults.SPEECH_TO_TEXT_URL).toBe('');
		expect(defaults.SPEECH_TO_TEXT_TIMEOUT_SECONDS).toBe(600);
		expect(() => readConfig({ SPEECH_TO_TEXT_URL: 'http://127.0.0.1:4570/v1' })).toThrow(
			/SPEECH_TO_TEXT_MODEL .*must name the speech-to-text server’s transcription model/
		);
		expect(() =>
			readConfig({ SPEECH_TO_TEXT_URL: 'file:///tmp/v1', SPEECH_TO_TEXT_MODEL: 'm' })
		).toThrow(/SPEECH_TO_TEXT_URL is invalid/);
	});
});
