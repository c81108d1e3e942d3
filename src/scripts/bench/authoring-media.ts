/**
 * The narrated recording of the authoring benchmark, made on this machine: espeak-ng speaks each
 * phrase of the script to a WAV, ffmpeg joins them with silences (a short one between phrases, a
 * long one between exercises) and draws a coloured card per section with its number as white
 * bars (no fonts needed), cutting to the next card where an exercise starts, and muxes a 720p
 * H.264/AAC MP4 of the narration's length. Returns where each phrase is spoken, which is how the
 * benchmark knows the words of each cue the speech draft times.
 */
import { execFile } from 'node:child_process';
import { mkdir } from 'node:fs/promises';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { runFfmpeg, runFfprobe } from '../../lib/server/media/ffmpeg';
import { EXERCISES, WELCOME, type NarratedSection } from './authoring-script';

const run = promisify(execFile);
/** Through the app's runner; the input is made before any stack runs, so no machine slot. */
const encode = (args: string[]) => runFfmpeg(args, { slot: false });

/** Quiet before the first word. */
const LEAD_SECONDS = 0.6;
/**
 * Between two phrases of one section. espeak-ng ends each phrase with about 0.4 s of quiet of its
 * own, so the pause heard is about 1.2 s: longer than a cue gap (1 s), shorter than the silence
 * that hints at a new segment (1.5 s).
 */
const PHRASE_GAP_SECONDS = 0.8;
/** Between sections: a clear pause, and the picture cuts at its end. */
const SECTION_PAUSE_SECONDS = 3;
/** From the cut to the announcing words. */
const ANNOUNCE_DELAY_SECONDS = 0.4;
const TAIL_SECONDS = 1.5;
const FPS = 25;
const VOICE = process.env.BENCH_VOICE ?? 'en-gb';
const WORDS_PER_MINUTE = '150';

export interface SpokenPhrase {
	/** 0 for the welcome, then 1, 2, 3 for the exercises. */
	section: number;
	text: string;
	start: number;
	end: number;
}

export interface NarratedRecording {
	path: string;
	durationSeconds: number;
	phrases: SpokenPhrase[];
	/** Where each exercise's picture starts. */
	sectionStarts: number[];
}

/** Fails with a sentence saying how to install espeak-ng when it is missing. */
async function checkEspeak(): Promise<void> {
	try {
		await run('espeak-ng', ['--version']);
	} catch {
		throw new Error(
			'espeak-ng is not installed; it speaks the recording this benchmark uploads. ' +
				'On Debian or Ubuntu: sudo apt-get install -y espeak-ng'
		);
	}
}

async function secondsOf(file: string): Promise<number> {
	const { stdout } = await runFfprobe([
		'-show_entries',
		'format=duration',
		'-of',
		'default=noprint_wrappers=1:nokey=1',
		'-i',
		file
	]);
	const seconds = Number(stdout.trim());
	if (!(seconds > 0)) throw new Error(`ffprobe found no length in ${file}`);
	return seconds;
}

/** A frame-exact time, so the pictures and the sound stay the same length. */
const onFrame = (seconds: number) => Math.round(seconds * FPS) / FPS;

/** White bars in the card's middle: one per exercise number, a wide one for the welcome. */
function marks(number: number): string[] {
	if (number === 0) return ['drawbox=x=440:y=330:w=400:h=60:color=white:t=fill'];
	const width = 60;
	const gap = 40;
	const left = 640 - (number * width + (number - 1) * gap) / 2;
	return Array.from(
		{ length: number },
		(_, k) => `drawbox=x=${left + k * (width + gap)}:y=240:w=${width}:h=240:color=white:t=fill`
	);
}

/** Makes the MP4 `fileName` (and the WAVs it is made from) in `dir`. */
export async function makeNarratedRecording(
	dir: string,
	fileName = 'narrated.mp4'
): Promise<NarratedRecording> {
	await checkEspeak();
	await mkdir(dir, { recursive: true });
	const sections: NarratedSection[] = [WELCOME, ...EXERCISES];

	// Speak every phrase, then lay the phrases and the silences out on one timeline.
	const pieces: ({ silence: number } | { file: string })[] = [];
	const phrases: SpokenPhrase[] = [];
	const sectionStarts: number[] = [];
	let t = 0;
	const silence = (seconds: number) => {
		const s = onFrame(seconds);
		pieces.push({ silence: s });
		t += s;
	};
	silence(LEAD_SECONDS);
	for (const [number, section] of sections.entries()) {
		if (number > 0) {
			sectionStarts.push(t);
			silence(ANNOUNCE_DELAY_SECONDS);
		}
		for (const [k, text] of section.phrases.entries()) {
			if (k > 0) silence(PHRASE_GAP_SECONDS);
			const file = join(dir, `phrase-${number}-${k}.wav`);
			await run('espeak-ng', ['-v', VOICE, '-s', WORDS_PER_MINUTE, '-w', file, text]);
			const seconds = await secondsOf(file);
			pieces.push({ file });
			phrases.push({ section: number, text, start: t, end: t + seconds });
			t += seconds;
		}
		silence(number < sections.length - 1 ? SECTION_PAUSE_SECONDS : TAIL_SECONDS);
	}

	const narration = join(dir, 'narration.wav');
	const audioInputs = pieces.flatMap((p) =>
		'file' in p
			? ['-i', p.file]
			: ['-f', 'lavfi', '-t', p.silence.toFixed(3), '-i', 'anullsrc=r=22050:cl=mono']
	);
	const audioGraph =
		pieces.map((_, i) => `[${i}:a]aresample=48000,aformat=channel_layouts=mono[a${i}]`).join(';') +
		`;${pieces.map((_, i) => `[a${i}]`).join('')}concat=n=${pieces.length}:v=0:a=1[out]`;
	await encode([
		'-y',
		...audioInputs,
		'-filter_complex',
		audioGraph,
		'-map',
		'[out]',
		'-c:a',
		'pcm_s16le',
		narration
	]);
	const durationSeconds = onFrame(await secondsOf(narration));

	// One card per section, from its start (a hard cut) to the next section's start.
	const starts = [0, ...sectionStarts];
	const spans = starts.map((start, i) => (starts[i + 1] ?? durationSeconds) - start);
	const videoInputs = sections.flatMap((s, i) => [
		'-f',
		'lavfi',
		'-i',
		`color=c=${s.colour}:s=1280x720:r=${FPS}:d=${spans[i].toFixed(3)}`
	]);
	const videoGraph =
		sections.map((_, i) => `[${i}:v]${marks(i).join(',')},format=yuv420p[v${i}]`).join(';') +
		`;${sections.map((_, i) => `[v${i}]`).join('')}concat=n=${sections.length}:v=1:a=0[v]`;
	const path = join(dir, fileName);
	await encode([
		'-y',
		...videoInputs,
		'-i',
		narration,
		'-filter_complex',
		videoGraph,
		'-map',
		'[v]',
		'-map',
		`${sections.length}:a`,
		'-c:v',
		'libx264',
		'-preset',
		'veryfast',
		'-pix_fmt',
		'yuv420p',
		'-g',
		String(FPS),
		'-c:a',
		'aac',
		'-b:a',
		'128k',
		'-t',
		durationSeconds.toFixed(3),
		'-movflags',
		'+faststart',
		path
	]);
	return { path, durationSeconds, phrases, sectionStarts };
}
