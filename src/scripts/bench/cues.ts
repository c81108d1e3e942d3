/**
 * A long narrated track for the caption benchmarks: invented physiotherapy narration, one cue every
 * few seconds, with the small slips a real draft has (a short gap, a long line, a quick cue, an
 * italic aside, a speaker tag) so the checks have findings to report, not only clean cues.
 */
import type { Cue } from '../../lib/captions/types';

const EXERCISES = [
	'heel slides',
	'straight leg raises',
	'quadriceps sets',
	'ankle pumps',
	'seated knee extension',
	'sit to stand',
	'standing hip abduction',
	'tandem stance',
	'single leg stance',
	'step ups'
];

// Each fits a 32-character line, so only the deliberately joined ones are too long.
const LINES = [
	'Lie supine, legs straight.',
	'Slide your heel towards you.',
	'Hold for five seconds.',
	'Breathe out as you lift.',
	'Keep the knee straight.',
	'Lower slowly, count to three.',
	'Rest between sets.',
	'Stop if the pain rises.',
	'Use the chair for balance.',
	'Ten reps, two sets.',
	'<i>Keep your back flat.</i>',
	'<v Clinician>Good, once more.</v>',
	'Stand tall, look ahead.',
	'Only as far as is comfortable.'
];

/** A cue script with an announcing cue at each boundary and narration in between. */
export interface CueScript {
	cues: Cue[];
	/** Where each announced exercise begins, in seconds (the first is at 0). */
	boundaries: number[];
}

/**
 * `count` cues spread over `durationSeconds` with `exercises` announced sections; the same
 * arguments always give the same cues. Every ninth cue has a long line.
 */
export function makeCueScript(
	count: number,
	durationSeconds: number,
	exercises = Math.max(1, Math.round(durationSeconds / 60))
): CueScript {
	const step = durationSeconds / count;
	const perSection = Math.max(1, Math.floor(count / exercises));
	const cues: Cue[] = [];
	const boundaries: number[] = [];
	for (let i = 0; i < count; i++) {
		const section = Math.min(exercises - 1, Math.floor(i / perSection));
		const opensSection = i % perSection === 0 && i / perSection < exercises;
		const start = Math.round(i * step * 1000) / 1000;
		// Cues run on into the next one; every tenth leaves a pause of a third of its slot, every
		// 13th a flickering 0.3 s gap, and every 17th is shown too briefly.
		let end = start + step;
		if (i % 10 === 9) end = start + step * (2 / 3);
		if (i % 13 === 12) end = start + step - 0.3;
		if (i % 17 === 16) end = start + Math.min(0.6, step * 0.5);
		let text: string;
		if (opensSection) {
			boundaries.push(start);
			const name = EXERCISES[section % EXERCISES.length];
			text = section === 0 ? `First, ${name}.` : `Next exercise: ${name}.`;
		} else if (i % 9 === 8) {
			text = `${LINES[i % LINES.length]} ${LINES[(i + 3) % LINES.length]}`;
		} else {
			text = LINES[i % LINES.length];
			if (i % 4 === 1) text = `${text}\n${LINES[(i + 6) % LINES.length]}`;
		}
		cues.push({ id: `cue-${i + 1}`, start, end: Math.round(end * 1000) / 1000, text });
	}
	return { cues, boundaries };
}
