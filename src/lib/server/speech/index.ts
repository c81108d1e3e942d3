/**
 * Timing drafts from the narration: for a captions track with no cues, cues already timed to the
 * recording's speech, carrying the words of a speech-to-text service when one is set
 * (SPEECH_TO_TEXT_URL). A draft is only ever returned, never saved: the studio puts it into the
 * editor when the clinician accepts it, and the autosave stores it like any other edit.
 *
 * Where the speech is comes from ffmpeg's silencedetect: the silences already stored for segment
 * suggestions (recording_signals, quiet of 1.5 s or more) when every stretch of speech between
 * them fits in one cue, else the recording's own pauses measured for the draft (0.3 s or more).
 */
import { createHash } from 'node:crypto';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { eq } from 'drizzle-orm';
import { profiles, type GuidelineProfile } from '$lib/captions/checks';
import {
	draftCues,
	draftLimits,
	speechRegions,
	timeCues,
	type DraftLimits,
	type DraftWords,
	type SpeechDraft,
	type SpeechDraftAnswer,
	type TimeSpan
} from '$lib/captions/speech-draft';
import { getVersion, type CaptionTrack } from '../captions';
import { getClinicCaptionProfile } from '../clinics';
import { config } from '../config';
import { db } from '../db';
import { recordingSignals, type Recording } from '../db/schema';
import { detectSilences } from '../media/detect';
import { presignRead } from '../storage';
import { recordingKeys } from '../storage/keys';
import { extractSpeechAudio } from './audio';
import {
	isoLanguage,
	serviceName,
	SpeechToTextError,
	transcribe,
	type SpeechToTextSettings,
	type Transcript
} from './transcribe';

export type { SpeechDraft, SpeechDraftAnswer, SpeechToTextSettings };

/** A refusal the caller can show as it is; `status` is the HTTP status an endpoint answers. */
export class SpeechDraftError extends Error {
	constructor(
		readonly status: number,
		message: string
	) {
		super(message);
		this.name = 'SpeechDraftError';
	}
}

/**
 * A pause in speech: quieter than -40 dBFS for at least 0.3 s. Our choice, not a published
 * figure: a breath between phrases is about that long, and a quiet room stays well below -40 dB.
 */
export const SPEECH_NOISE_DB = -40;
export const SPEECH_MIN_PAUSE_SECONDS = 0.3;

/** The speech-to-text settings from the configuration; an empty `url` means none. */
export function speechToTextSettings(): SpeechToTextSettings {
	const c = config();
	return {
		url: c.SPEECH_TO_TEXT_URL,
		apiKey: c.SPEECH_TO_TEXT_API_KEY,
		model: c.SPEECH_TO_TEXT_MODEL,
		timeoutSeconds: c.SPEECH_TO_TEXT_TIMEOUT_SECONDS
	};
}

/** What was heard in one rendition: its silences and, when a service was asked, its words. */
interface Heard {
	hasSound: boolean;
	silences: TimeSpan[];
	timing: SpeechDraft['timing'];
	transcript: Transcript | null;
	/** Why a service that is set gave no words. */
	wordsProblem: string | null;
}

// Reading the sound takes an ffmpeg pass over the rendition and, with a service, an upload and
// its recognition: minutes for a long recording. What was heard is kept by rendition, timing
// source, service and language, so asking again (a reload, the page's polling) waits on the same
// run or reads the result. A failure is kept for a minute, so polling meets it instead of
// starting again; a service that failed is asked again after that minute.
const FAILURE_KEPT_MS = 60_000;
const KEPT_RESULTS = 32;
interface Run {
	promise: Promise<Heard>;
	expiresAt: number;
}
const runs = new Map<string, Run>();
// One run at a time: each keeps a core busy, and the service gets one upload at a time from us.
let listening: Promise<unknown> = Promise.resolve();

/** Silences stored for segment suggestions for this very rendition, or null. */
function storedSilences(recording: Recording): TimeSpan[] | null {
	// A file without sound stores no silences, which would read as speech throughout.
	if (!recording.hasAudio) return null;
	const row = db()
		.select({ silences: recordingSignals.silences, readyAt: recordingSignals.renditionReadyAt })
		.from(recordingSignals)
		.where(eq(recordingSignals.recordingId, recording.id))
		.get();
	if (!row || row.readyAt.getTime() !== (recording.readyAt?.getTime() ?? 0)) return null;
	return row.silences;
}

async function listen(
	recording: Recording,
	stored: TimeSpan[] | null,
	language: string,
	settings: SpeechToTextSettings
): Promise<Heard> {
	let dir: string | undefined;
	try {
		let audio: string | null = null;
		if (!stored || settings.url !== '') {
			dir = await mkdtemp(join(config().MEDIA_WORK_DIR || tmpdir(), 'kinelume-speech-'));
			audio = join(dir, 'speech.mp3');
			// ffmpeg reads the rendition from storage itself; only the small audio file is written.
			const keys = recordingKeys(recording.clinicId, recording.id);
			const rendition = await presignRead(keys.rendition, config().MEDIA_JOB_TIMEOUT_SECONDS + 60);
			if (!(await extractSpeechAudio(rendition, audio))) {
				return {
					hasSound: false,
					silences: [],
					timing: 'measured',
					transcript: null,
					wordsProblem: null
				};
			}
		}
		const silences =
			stored ??
			(await detectSilences(audio!, {
				noiseDb: SPEECH_NOISE_DB,
				minSeconds: SPEECH_MIN_PAUSE_SECONDS,
				durationSeconds: recording.durationSeconds,
				hasAudio: true
			}));
		let transcript: Transcript | null = null;
		let wordsProblem: string | null = null;
		if (settings.url !== '' && audio) {
			try {
				transcript = await transcribe(audio, settings, { language: isoLanguage(language) });
			} catch (error) {
				if (!(error instanceof SpeechToTextError)) throw error;
				console.error(`[speech] words for ${recording.id}: ${error.message}`);
				wordsProblem = error.message;
			}
		}
		return {
			hasSound: true,
			silences: silences.map(({ start, end }) => ({ start, end })),
			timing: stored ? 'stored' : 'measured',
			transcript,
			wordsProblem
		};
	} catch (error) {
		console.error(`[speech] reading the sound of ${recording.id} failed:`, error);
		throw new SpeechDraftError(
			422,
			'The recording’s sound could not be read, so no draft could be made. Try again in a minute, or time the cues by hand.'
		);
	} finally {
		if (dir) await rm(dir, { recursive: true, force: true });
	}
}

function runFor(
	recording: Recording,
	stored: TimeSpan[] | null,
	language: string,
	settings: SpeechToTextSettings
): Promise<Heard> {
	const key = [
		recording.id,
		recording.readyAt?.getTime() ?? 0,
		stored ? 'stored' : 'measured',
		settings.url,
		settings.model,
		// A changed key is another chance for the service; the key itself is not kept in keys.
		createHash('sha256').update(settings.apiKey).digest('hex').slice(0, 16),
		language
	].join('|');
	const known = runs.get(key);
	if (known && known.expiresAt > Date.now()) return known.promise;
	const promise = listening.then(() => listen(recording, stored, language, settings));
	listening = promise.catch(() => undefined);
	const run: Run = { promise, expiresAt: Infinity };
	runs.delete(key);
	runs.set(key, run);
	promise.then(
		(heard) => {
			if (heard.wordsProblem) run.expiresAt = Date.now() + FAILURE_KEPT_MS;
		},
		() => (run.expiresAt = Date.now() + FAILURE_KEPT_MS)
	);
	// The oldest results go first; one still running stays reachable through its waiters.
	while (runs.size > KEPT_RESULTS) runs.delete(runs.keys().next().value!);
	return promise;
}

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

function explain(
	heard: Heard,
	draft: ReturnType<typeof draftCues>,
	profile: GuidelineProfile,
	limits: DraftLimits,
	settings: SpeechToTextSettings
): { words: DraftWords; notes: string[] } {
	const notes: string[] = [];
	if (!heard.hasSound) {
		notes.push('This recording has no sound, so there is no speech to time cues to.');
		return { words: 'none', notes };
	}
	if (draft.cues.length === 0) {
		notes.push(
			`No speech was found: the sound stays quieter than ${SPEECH_NOISE_DB} dB throughout.`
		);
	} else {
		const from =
			heard.timing === 'stored'
				? 'the pauses found earlier for segment suggestions'
				: 'the pauses in the recording’s sound';
		notes.push(
			`Timed from ${from}, to the ${profile.label}: ${limits.minSeconds}–${limits.maxSeconds} s a cue, gaps of at least ${limits.minGapSeconds} s.`
		);
	}
	if (draft.evenCuts > 0) {
		notes.push(
			`${plural(draft.evenCuts, 'cut was', 'cuts were')} made at even times inside speech with no pause: check where those cues change.`
		);
	}
	const where = serviceName(settings.url);
	const heardWords = heard.transcript?.segments.some((s) => s.text !== '') ?? false;
	if (heard.transcript?.standIn) {
		notes.push(`The words are placeholders, not recognised speech: ${heard.transcript.standIn}`);
		return { words: 'placeholder', notes };
	}
	if (heard.transcript && heardWords) {
		notes.push(
			`The words were recognised by the speech-to-text service at ${where}: check each cue against the recording.`
		);
		return { words: 'recognised', notes };
	}
	if (heard.transcript) {
		notes.push(
			`The speech-to-text service at ${where} recognised no words, so the cues are blank: type the words into them.`
		);
	} else if (heard.wordsProblem) {
		notes.push(
			`No words: ${heard.wordsProblem}. The cues are timed but blank: type the words into them.`
		);
	} else {
		notes.push(
			'No speech-to-text service is set up, so the cues are blank: type the words into them.'
		);
	}
	return { words: 'none', notes };
}

/**
 * A draft for an empty captions or subtitles track, timed to its recording's speech and to the
 * clinic's guideline profile. Waits up to `waitMs` for the sound to be read; if it is still being
 * read, answers `working` and the caller asks again (the work carries on). Never saves anything.
 */
export async function speechDraftFor(
	recording: Recording,
	track: CaptionTrack,
	{
		waitMs = 15_000,
		settings = speechToTextSettings()
	}: { waitMs?: number; settings?: SpeechToTextSettings } = {}
): Promise<SpeechDraftAnswer> {
	if (track.recordingId !== recording.id) throw new SpeechDraftError(404, 'Not found.');
	if (track.kind !== 'captions' && track.kind !== 'subtitles') {
		throw new SpeechDraftError(
			409,
			'Drafts from the speech are made for captions and subtitles tracks, not chapters or descriptions.'
		);
	}
	if ((getVersion(track)?.cues.length ?? 0) > 0) {
		throw new SpeechDraftError(
			409,
			'This track already has cues. A draft from the speech is offered only for a track with none, so nothing is replaced.'
		);
	}
	if (recording.status !== 'ready') {
		throw new SpeechDraftError(
			409,
			'The recording is not ready yet: drafts can be made once its web version is.'
		);
	}
	const profile = profiles[getClinicCaptionProfile(recording.clinicId)];
	const limits = draftLimits(profile);
	const duration = recording.durationSeconds;
	// The stored silences serve when no stretch of speech between them is longer than one cue.
	const stored = storedSilences(recording);
	const storedServes =
		stored !== null && timeCues(speechRegions(stored, duration), duration, limits).evenCuts === 0;

	const promise = runFor(recording, storedServes ? stored : null, track.language, settings);
	let timer: ReturnType<typeof setTimeout> | undefined;
	const heard = await Promise.race([
		promise,
		new Promise<'waiting'>((resolve) => (timer = setTimeout(() => resolve('waiting'), waitMs)))
	]).finally(() => clearTimeout(timer));
	if (heard === 'waiting') return { state: 'working' };

	const draft = heard.hasSound
		? draftCues(
				{
					silences: heard.silences,
					durationSeconds: duration,
					segments: heard.transcript?.segments
				},
				limits
			)
		: { cues: [], evenCuts: 0 };
	const { words, notes } = explain(heard, draft, profile, limits, settings);
	return {
		state: 'ready',
		cues: draft.cues,
		words,
		timing: heard.timing,
		guideline: profile.label,
		notes
	};
}

/** Forgets what was heard (tests, and a fresh listen after a service came back). */
export function forgetSpeechDrafts(): void {
	runs.clear();
}
