/** The demo clips' soundtrack: a chime at each cut and a hummed stand-in for each spoken cue. */
import { createHash } from 'node:crypto';
import type { DemoPlan } from './scripts';
import { wordCount } from './timeline';

// Voice sits inside each cue so a caption never shows before its words or lingers long after.
const VOICE_IN = 0.15;
const VOICE_OUT = 0.1;
/** Mono 16-bit PCM at this rate (`-f s16le -ac 1`). */
export const SAMPLE_RATE = 48000;

function seeded(text: string) {
	let x = createHash('sha256').update(text).digest().readUInt32LE(0) || 1;
	return () => {
		x ^= x << 13;
		x ^= x >>> 17;
		x ^= x << 5;
		return ((x >>> 0) % 100000) / 100000;
	};
}

function addChime(out: Float32Array, at: number) {
	const start = Math.round(at * SAMPLE_RATE);
	const length = Math.round(1.4 * SAMPLE_RATE);
	const partials = [
		[587.33, 1],
		[880, 0.55],
		[1174.66, 0.2]
	];
	for (let i = 0; i < length && start + i < out.length; i++) {
		const s = i / SAMPLE_RATE;
		const attack = Math.min(1, s / 0.01);
		const release = Math.min(1, (length - i) / (0.05 * SAMPLE_RATE));
		const env = attack * release * Math.exp(-s / 0.32);
		let v = 0;
		for (const [f, g] of partials) v += g * Math.sin(2 * Math.PI * f * s);
		out[start + i] += 0.16 * env * v;
	}
}

/** A hummed stand-in for speech: a gliding pitch with harmonics, pulsed at a syllable rate. */
function addVoice(out: Float32Array, from: number, to: number, text: string) {
	const random = seeded(text);
	const start = Math.round(from * SAMPLE_RATE);
	const end = Math.min(out.length, Math.round(to * SAMPLE_RATE));
	const length = end - start;
	if (length <= 0) return;
	const syllables = Math.max(2, Math.round(wordCount(text) * 1.4));
	const bounds = [0];
	for (let i = 0; i < syllables; i++) bounds.push(bounds[i] + 0.7 + random() * 0.6);
	const scale = length / bounds[bounds.length - 1];
	const tilt = bounds.map(() => 0.6 + random() * 0.8);
	const base = 135 + random() * 40;
	let phase = 0;
	let syl = 0;
	for (let i = 0; i < length; i++) {
		while (syl < syllables - 1 && i >= bounds[syl + 1] * scale) syl++;
		const s0 = bounds[syl] * scale;
		const s1 = bounds[syl + 1] * scale;
		const within = (i - s0) / (s1 - s0);
		const pulse = 0.25 + 0.75 * Math.sin(Math.PI * Math.min(1, Math.max(0, within))) ** 2;
		const progress = i / length;
		const f0 =
			base *
			(1.08 - 0.16 * progress) *
			(1 + 0.04 * Math.sin(2 * Math.PI * 0.9 * (i / SAMPLE_RATE)));
		phase += f0 / SAMPLE_RATE;
		const k = tilt[syl];
		let v = 0;
		for (let h = 1; h <= 6; h++)
			v += (Math.sin(2 * Math.PI * h * phase) * (h === 2 || h === 3 ? k : 1)) / h ** 1.2;
		const edge = Math.min(1, i / (0.03 * SAMPLE_RATE), (length - i) / (0.04 * SAMPLE_RATE));
		out[start + i] += 0.07 * pulse * edge * v;
	}
}

/** The whole clip's sound as mono signed 16-bit little-endian PCM at SAMPLE_RATE. */
export function soundtrack(plan: DemoPlan): Buffer {
	const samples = Math.round(plan.durationSeconds * SAMPLE_RATE);
	const mix = new Float32Array(samples);
	for (const s of plan.sections) addChime(mix, s.start + (s.kind === 'intro' ? 0.05 : 0));
	for (const cue of plan.cues) addVoice(mix, cue.start + VOICE_IN, cue.end - VOICE_OUT, cue.text);
	const pcm = Buffer.alloc(samples * 2);
	for (let i = 0; i < samples; i++) {
		pcm.writeInt16LE(Math.round(Math.max(-1, Math.min(1, mix[i])) * 32767), i * 2);
	}
	return pcm;
}
