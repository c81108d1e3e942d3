/** Lays a clip's script out in time: cues, sections and pauses. Pure. */
import type { DemoClip, DemoCue, DemoPlan, DemoSection } from './scripts';

// Caption limits from the BBC Subtitle Guidelines (REFERENCES.md): 37 characters a line, 2 lines,
// reading rate at most 160 words a minute; 1.5 s is our own floor so short lines stay readable.
export const CAPTION_LIMITS = {
	charsPerLine: 37,
	lines: 2,
	maxWordsPerMinute: 160,
	minSeconds: 1.5
} as const;

// 0.45 s a word plus a lead-in keeps every cue near 130 wpm, well under the limit above.
const SECONDS_PER_WORD = 0.45;
const CUE_LEAD_SECONDS = 0.4;
const INTRO_START = 0.5;
const ANNOUNCE_DELAY = 0.7;
const TAIL_SECONDS = 1.5;

export function wordCount(text: string): number {
	return text.split(/\s+/).filter((w) => /[\p{L}\p{N}]/u.test(w)).length;
}

/** Breaks a line for captions, as evenly as the limits allow; throws so a bad script fails early. */
export function wrapCaption(text: string): string {
	const { charsPerLine } = CAPTION_LIMITS;
	const clean = text.replace(/\s+/g, ' ').trim();
	if (clean.length <= charsPerLine) return clean;
	let best: [string, string] | null = null;
	for (let i = clean.indexOf(' '); i !== -1; i = clean.indexOf(' ', i + 1)) {
		const pair: [string, string] = [clean.slice(0, i), clean.slice(i + 1)];
		if (pair[0].length > charsPerLine || pair[1].length > charsPerLine) continue;
		const worse = (p: [string, string]) => Math.max(p[0].length, p[1].length);
		if (!best || worse(pair) < worse(best)) best = pair;
	}
	if (!best) throw new Error(`Caption too long for two lines of ${charsPerLine}: “${clean}”`);
	return best.join('\n');
}

function speechSeconds(text: string): number {
	return Math.max(CAPTION_LIMITS.minSeconds, wordCount(text) * SECONDS_PER_WORD + CUE_LEAD_SECONDS);
}

const ms = (t: number) => Math.round(t * 1000) / 1000;

/** Lays the script out in time; pure, so tests and the seeder know the boundaries without rendering. */
export function planDemoClip(clip: DemoClip): DemoPlan {
	const cues: DemoCue[] = [];
	const sections: DemoSection[] = [];
	const pauses: { start: number; end: number }[] = [];
	let t = 0;

	const speak = (lines: string[], from: number, stretchTo = 0): number => {
		const lengths = lines.map(speechSeconds);
		const natural = lengths.reduce((a, b) => a + b, 0);
		const factor = stretchTo > natural ? stretchTo / natural : 1;
		let at = from;
		lines.forEach((line, i) => {
			const end = at + lengths[i] * factor;
			cues.push({ start: ms(at), end: ms(end), text: wrapCaption(line) });
			at = end;
		});
		return ms(at);
	};

	if (clip.intro.length > 0) {
		const narrationEnd = speak(clip.intro, INTRO_START);
		sections.push({
			kind: 'intro',
			title: clip.title,
			exercise: -1,
			start: 0,
			narrationEnd,
			end: 0,
			motionStart: narrationEnd
		});
		t = narrationEnd;
	}

	clip.exercises.forEach((exercise, index) => {
		if (sections.length > 0) {
			pauses.push({ start: t, end: ms(t + clip.pauseSeconds) });
			t = ms(t + clip.pauseSeconds);
			sections[sections.length - 1].end = t;
		}
		const start = t;
		const motionStart = speak([exercise.announce], start + ANNOUNCE_DELAY);
		// The reps end just before the last words, so the figure is at rest when the pause begins.
		const repsSpan = exercise.reps * exercise.repSeconds + 0.5;
		const narrationEnd = speak(exercise.cues, motionStart, repsSpan);
		sections.push({
			kind: 'exercise',
			title: exercise.title,
			exercise: index,
			start,
			narrationEnd,
			end: 0,
			motionStart
		});
		t = narrationEnd;
	});

	// Whole half-seconds divide evenly into every usual frame rate, so the frames end on the script.
	const durationSeconds = Math.ceil((t + TAIL_SECONDS) * 2) / 2;
	if (sections.length > 0) sections[sections.length - 1].end = durationSeconds;
	return {
		durationSeconds,
		cues,
		sections,
		pauses,
		boundaries: sections.slice(1).map((s) => s.start)
	};
}
