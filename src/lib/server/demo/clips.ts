/**
 * Demonstration clips for the invented demo clinic (DESIGN.md §6), generated rather than filmed so
 * that no real footage or person appears: an animated side-view figure drawn frame by frame with
 * @napi-rs/canvas, a synthetic soundtrack, encoded by ffmpeg to H.264/AAC MP4.
 *
 * The clips double as test media for segment suggestion, so their structure is deliberate: every
 * exercise opens with a hard cut to a title card (a scene change), a chime and an announcing line;
 * narration is a quiet voice-like tone under each cue; and the rest between exercises is digital
 * silence, so that silence detection and the scene score both find the boundaries the script knows.
 */
import { spawn } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync } from 'node:fs';
import { mkdir, mkdtemp, readdir, readFile, rename, rm, writeFile } from 'node:fs/promises';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createCanvas, GlobalFonts, type SKRSContext2D } from '@napi-rs/canvas';

const require = createRequire(import.meta.url);

export type DemoSetting = 'supine' | 'seated' | 'standing';

export type DemoMotion =
	| 'ankle-pump'
	| 'quad-set'
	| 'heel-slide'
	| 'straight-leg-raise'
	| 'seated-knee-extension'
	| 'sit-to-stand'
	| 'hamstring-curl'
	| 'feet-together'
	| 'tandem-stance'
	| 'weight-shift'
	| 'marching';

export interface DemoExercise {
	title: string;
	setting: DemoSetting;
	motion: DemoMotion;
	/** Spoken first, while the title card is up. */
	announce: string;
	/** Spoken one after another while the figure demonstrates; each becomes one caption cue. */
	cues: string[];
	/** Repetitions the figure shows; narration is stretched if the reps need longer. */
	reps: number;
	/** Seconds per repetition, hold included: slow and controlled. */
	repSeconds: number;
	holdSeconds?: number;
}

export interface DemoClip {
	id: string;
	title: string;
	/** Shown on the opening card; invented. */
	clinic: string;
	/** Spoken over the opening card; may be empty for a clip that starts with its first exercise. */
	intro: string[];
	exercises: DemoExercise[];
	/** Silent rest between sections, in seconds. */
	pauseSeconds: number;
}

export interface DemoCue {
	start: number;
	end: number;
	/** At most two lines, joined by a line feed. */
	text: string;
}

export interface DemoSection {
	kind: 'intro' | 'exercise';
	title: string;
	/** Index into clip.exercises, or -1 for the intro. */
	exercise: number;
	/** Where the section's picture starts (a cut, except at 0). */
	start: number;
	/** Where its narration ends; the pause follows. */
	narrationEnd: number;
	/** Where the next section starts, or the clip's end. */
	end: number;
	motionStart: number;
}

export interface DemoPlan {
	durationSeconds: number;
	cues: DemoCue[];
	sections: DemoSection[];
	/** Scripted silences, start at the last narration's end. */
	pauses: { start: number; end: number }[];
	/** Section starts after 0: where the picture cuts. */
	boundaries: number[];
}

export interface RenderOptions {
	width?: number;
	height?: number;
	fps?: number;
	onProgress?: (fraction: number) => void;
}

export interface DemoRenderResult {
	durationSeconds: number;
	cues: DemoCue[];
	sections: DemoSection[];
}

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
const CARD_HOLD = 2;
const CARD_FADE = 0.8;
const ANNOUNCE_DELAY = 0.7;
const TAIL_SECONDS = 1.5;
// Voice sits inside each cue so a caption never shows before its words or lingers long after.
const VOICE_IN = 0.15;
const VOICE_OUT = 0.1;
const SAMPLE_RATE = 48000;
// Bump when the drawing or sound changes, so cached clips are rendered again.
const RENDERER_VERSION = 6;

const CLINIC = 'Alder Street Community Clinic';

export const DEMO_CLIPS: DemoClip[] = [
	{
		id: 'knee-first-week',
		title: 'Knee replacement — first week at home',
		clinic: CLINIC,
		pauseSeconds: 5,
		intro: [
			'Welcome from Alder Street Community Clinic.',
			'These are your first-week knee exercises.',
			'Move slowly and breathe normally.',
			'Stop if pain is sharp or getting worse.',
			'Always follow your clinician’s advice.'
		],
		exercises: [
			{
				title: 'Ankle pumps',
				setting: 'supine',
				motion: 'ankle-pump',
				announce: 'Exercise one: ankle pumps.',
				cues: [
					'Lie on your back with both legs straight.',
					'Point your toes away from you.',
					'Then pull them up toward your shins.',
					'Keep the pace slow and controlled.',
					'Both ankles move; your knees stay still.',
					'A gentle stretch in the calf is normal.'
				],
				reps: 8,
				repSeconds: 2.5
			},
			{
				title: 'Quadriceps sets',
				setting: 'supine',
				motion: 'quad-set',
				announce: 'Exercise two: quadriceps sets.',
				cues: [
					'Rest a small rolled towel under your operated knee.',
					'Tighten the muscle on the front of your thigh.',
					'Press the back of your knee down into the towel.',
					'Hold for a count of four, then relax.',
					'Only the operated leg works. Breathe normally.',
					'Stop if pain is sharp or getting worse.'
				],
				reps: 5,
				repSeconds: 6,
				holdSeconds: 4
			},
			{
				title: 'Heel slides',
				setting: 'supine',
				motion: 'heel-slide',
				announce: 'Exercise three: heel slides.',
				cues: [
					'Lie on your back, operated leg straight.',
					'Slowly slide your heel toward your bottom.',
					'Bend the knee as far as is comfortable.',
					'Pause, then slide the heel back down.',
					'Tightness at the end of the bend is normal.',
					'Sharp or worsening pain means stop.'
				],
				reps: 5,
				repSeconds: 6,
				holdSeconds: 1
			},
			{
				title: 'Straight-leg raise',
				setting: 'supine',
				motion: 'straight-leg-raise',
				announce: 'Exercise four: straight-leg raise.',
				cues: [
					'Bend your other knee, foot flat on the bed.',
					'Tighten your thigh so the operated knee is straight.',
					'Lift the straight leg to the height of the other knee.',
					'Hold for two seconds, then lower it slowly.',
					'Keep your back relaxed against the bed.',
					'Follow your clinician’s advice on how many.'
				],
				reps: 5,
				repSeconds: 6,
				holdSeconds: 2
			}
		]
	},
	{
		id: 'knee-weeks-2-6',
		title: 'Knee replacement — weeks 2 to 6, seated and standing',
		clinic: CLINIC,
		pauseSeconds: 5,
		intro: [
			'Welcome back from Alder Street Community Clinic.',
			'These exercises are for weeks two to six.',
			'Use a sturdy chair without wheels.',
			'Stop if pain is sharp or getting worse.',
			'Your clinician may adjust these for you.'
		],
		exercises: [
			{
				title: 'Seated knee extension',
				setting: 'seated',
				motion: 'seated-knee-extension',
				announce: 'Exercise one: seated knee extension.',
				cues: [
					'Sit tall, well back in the chair.',
					'Slowly straighten your operated knee.',
					'Pull your toes up as the leg straightens.',
					'Hold for two seconds, then lower slowly.',
					'Your other foot stays flat on the floor.',
					'Some effort in the thigh is normal.'
				],
				reps: 5,
				repSeconds: 6,
				holdSeconds: 2
			},
			{
				title: 'Sit to stand',
				setting: 'seated',
				motion: 'sit-to-stand',
				announce: 'Exercise two: sit to stand.',
				cues: [
					'Sit near the front edge of the chair.',
					'Feet flat, slightly behind your knees.',
					'Lean forward, nose over your toes.',
					'Push through both legs to stand up.',
					'Stand tall, then reach back and sit slowly.',
					'Use your hands on the chair if you need to.',
					'Stop if you feel dizzy or pain is sharp.'
				],
				reps: 4,
				repSeconds: 7,
				holdSeconds: 1
			},
			{
				title: 'Standing hamstring curl',
				setting: 'standing',
				motion: 'hamstring-curl',
				announce: 'Exercise three: standing hamstring curl.',
				cues: [
					'Stand facing a counter and hold on lightly.',
					'Keep your knees side by side.',
					'Slowly bend your operated knee, heel to bottom.',
					'Hold for two seconds, then lower slowly.',
					'Stand tall; do not lean forward.',
					'A pull behind the thigh is normal.',
					'Sharp or worsening pain means stop.'
				],
				reps: 5,
				repSeconds: 6,
				holdSeconds: 2
			}
		]
	},
	{
		id: 'balance-steady-standing',
		title: 'Balance class — steady standing',
		clinic: CLINIC,
		pauseSeconds: 5,
		intro: [
			'Welcome to the Alder Street balance class.',
			'Stand at a kitchen counter or sturdy rail.',
			'Keep a chair behind you in case you tire.',
			'Stop if you feel dizzy, unsteady or in pain.',
			'Follow your clinician’s advice at all times.'
		],
		exercises: [
			{
				title: 'Feet-together stance',
				setting: 'standing',
				motion: 'feet-together',
				announce: 'Exercise one: feet-together stance.',
				cues: [
					'Stand close to the counter, hands resting on it.',
					'Bring your feet together, side by side.',
					'Stand tall and look straight ahead.',
					'Hold for ten seconds, breathing normally.',
					'A little sway is normal; that is balance working.',
					'Lighten your grip only if you feel steady.',
					'Rest, then repeat once more.'
				],
				reps: 2,
				repSeconds: 13,
				holdSeconds: 10
			},
			{
				title: 'Tandem stance',
				setting: 'standing',
				motion: 'tandem-stance',
				announce: 'Exercise two: tandem stance.',
				cues: [
					'Hold the counter with both hands.',
					'Place one foot directly in front of the other.',
					'The front heel touches the back toes.',
					'Hold for up to ten seconds.',
					'Step back to feet apart and rest.',
					'Grip firmly if you feel unsteady.'
				],
				reps: 2,
				repSeconds: 13,
				holdSeconds: 9
			},
			{
				title: 'Weight shifts',
				setting: 'standing',
				motion: 'weight-shift',
				announce: 'Exercise three: weight shifts.',
				cues: [
					'Stand with your feet hip-width apart.',
					'Slowly shift your weight toward your toes.',
					'Then shift back toward your heels.',
					'Keep your body straight; move from the ankles.',
					'Slow and controlled; no need to go far.',
					'Stop if you feel you might fall.'
				],
				reps: 5,
				repSeconds: 5
			},
			{
				title: 'Marching in place',
				setting: 'standing',
				motion: 'marching',
				announce: 'Exercise four: marching in place.',
				cues: [
					'Hold the counter with both hands.',
					'Lift one knee toward hip height.',
					'Lower it, then lift the other knee.',
					'Keep a slow and steady rhythm.',
					'Stand tall and keep breathing.',
					'Sit and rest if your legs feel tired.',
					'Stop if you feel dizzy or pain is sharp.'
				],
				reps: 10,
				repSeconds: 2.5
			}
		]
	}
];

// ---------------------------------------------------------------------------------------------
// Timeline

function wordCount(text: string): number {
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

// ---------------------------------------------------------------------------------------------
// Figure geometry. World units: standing height about 1, y up, the figure faces +x (the viewer
// sees its left side, so the near leg is the left leg). Angles in degrees, 0 = +x, 90 = up.

const L = {
	trunk: 0.3,
	neck: 0.045,
	head: 0.068,
	thigh: 0.245,
	shin: 0.245,
	foot: 0.12,
	heel: 0.03,
	upperArm: 0.165,
	forearm: 0.15,
	ankleHeight: 0.04
};
const STAND_HIP = L.ankleHeight + L.thigh + L.shin;

type Vec = [number, number];

interface Leg {
	/** Direction from hip to knee. */
	thigh: number;
	/** Knee bend; the shin points thigh − knee. */
	knee: number;
	/** Dorsiflexion from a right angle with the shin (toes toward the shin is positive). */
	ankle: number;
}

interface Arm {
	upper: number;
	elbow: number;
}

interface Pose {
	hip: Vec;
	trunk: number;
	legs: [Leg, Leg];
	arms: [Arm, Arm];
	/** 0–1 per leg: how strongly to show the working leg. */
	work: [number, number];
	/** 0–1: muscle tightening shown as a glow on the near thigh. */
	squeeze: number;
}

const rad = (d: number) => (d * Math.PI) / 180;
const deg = (r: number) => (r * 180) / Math.PI;
const dir = (a: number): Vec => [Math.cos(rad(a)), Math.sin(rad(a))];
const add = (p: Vec, a: number, len: number): Vec => {
	const d = dir(a);
	return [p[0] + d[0] * len, p[1] + d[1] * len];
};
const lerp = (a: number, b: number, f: number) => a + (b - a) * f;
const smooth = (f: number) => {
	const x = Math.min(1, Math.max(0, f));
	return x * x * (3 - 2 * x);
};

/** Two-link reach from root to target; `bend` +1 puts the middle joint counter-clockwise of the line. */
function reach(root: Vec, target: Vec, a: number, b: number, bend: 1 | -1): [number, number] {
	const dx = target[0] - root[0];
	const dy = target[1] - root[1];
	const d = Math.min(Math.hypot(dx, dy), a + b - 1e-4);
	const base = deg(Math.atan2(dy, dx));
	const inner = deg(Math.acos(Math.min(1, Math.max(-1, (a * a + d * d - b * b) / (2 * a * d)))));
	const first = base + bend * inner;
	const mid = add(root, first, a);
	const second = deg(Math.atan2(target[1] - mid[1], target[0] - mid[0]));
	return [first, second];
}

function legTo(hip: Vec, ankle: Vec): Leg {
	const [thigh, shin] = reach(hip, ankle, L.thigh, L.shin, 1);
	// Feet stay flat on the floor: shin + 90 + ankle = 0.
	return { thigh, knee: thigh - shin, ankle: -(shin + 90) };
}

function armTo(shoulder: Vec, hand: Vec): Arm {
	const [upper, fore] = reach(shoulder, hand, L.upperArm, L.forearm, -1);
	return { upper, elbow: fore - upper };
}

const shoulderOf = (p: Pose): Vec => add(p.hip, p.trunk, L.trunk);

// Where the props stand, so poses can rest on them.
const BED_TOP = 0.2;
const MATTRESS_TOP = BED_TOP + 0.025;
const SUPINE_HIP: Vec = [0.02, BED_TOP + 0.045];
const SEAT_TOP = 0.24;
const SEAT_HIP: Vec = [0, SEAT_TOP + 0.045];
const COUNTER = { front: 0.16, top: 0.57 };
const HAND_ON_COUNTER: Vec = [0.2, COUNTER.top + 0.015];

function straight(thigh: number, ankle = 0): Leg {
	return { thigh, knee: 0, ankle };
}

function restPose(setting: DemoSetting): Pose {
	if (setting === 'supine') {
		const arm: Arm = { upper: -8, elbow: 8 };
		return {
			hip: SUPINE_HIP,
			// A slight incline rests the head on the pillow, as on a bed at home.
			trunk: 176,
			legs: [straight(0), straight(0)],
			arms: [arm, arm],
			work: [0, 0],
			squeeze: 0
		};
	}
	if (setting === 'seated') {
		const leg: Leg = { thigh: 0, knee: 90, ankle: 0 };
		const arm: Arm = { upper: -68, elbow: 55 };
		return {
			hip: SEAT_HIP,
			trunk: 92,
			legs: [{ ...leg }, { ...leg }],
			arms: [arm, arm],
			work: [0, 0],
			squeeze: 0
		};
	}
	return standingLean(0, [0, 0], 2);
}

/** Standing, rotated about the ankles by `lean` degrees (forward positive), hands on the counter. */
function standingLean(lean: number, ankleX: [number, number], trunkForward = 2): Pose {
	const ankleMid = (ankleX[0] + ankleX[1]) / 2;
	const hip: Vec = [
		ankleMid + STAND_HIP * Math.sin(rad(lean)) - L.ankleHeight * Math.sin(rad(lean)),
		0
	];
	const halfSpread = Math.abs(ankleX[0] - ankleX[1]) / 2;
	const legSpan = L.thigh + L.shin - 0.002;
	hip[1] =
		L.ankleHeight + Math.sqrt(Math.max(0, legSpan ** 2 - halfSpread ** 2)) * Math.cos(rad(lean));
	const trunk = 90 - lean - trunkForward;
	const pose: Pose = {
		hip,
		trunk,
		legs: [legTo(hip, [ankleX[0], L.ankleHeight]), legTo(hip, [ankleX[1], L.ankleHeight])],
		arms: [
			{ upper: 0, elbow: 0 },
			{ upper: 0, elbow: 0 }
		],
		work: [0, 0],
		squeeze: 0
	};
	const shoulder = shoulderOf(pose);
	pose.arms = [
		armTo(shoulder, HAND_ON_COUNTER),
		armTo(shoulder, [HAND_ON_COUNTER[0] - 0.015, HAND_ON_COUNTER[1]])
	];
	return pose;
}

interface RepState {
	/** Which rep (0-based), or -1 before the first and reps after the last. */
	index: number;
	/** Out-and-back amount, 0 at rest, 1 at the end of range (held). */
	amount: number;
	/** Phase through the rep, 0–1, for motions that oscillate. */
	phase: number;
	holding: boolean;
}

function repState(exercise: DemoExercise, local: number): RepState {
	if (local < 0) return { index: -1, amount: 0, phase: 0, holding: false };
	const index = Math.floor(local / exercise.repSeconds);
	if (index >= exercise.reps) return { index: exercise.reps, amount: 0, phase: 0, holding: false };
	const within = local - index * exercise.repSeconds;
	const phase = within / exercise.repSeconds;
	const hold = exercise.holdSeconds ?? 0;
	const moving = exercise.repSeconds - hold;
	// Out over 40 % of the moving time, back over 40 %, then a short rest at the start position.
	const out = moving * 0.4;
	let amount: number;
	if (within < out) amount = smooth(within / out);
	else if (within < out + hold) amount = 1;
	else if (within < out + hold + out) amount = 1 - smooth((within - out - hold) / out);
	else amount = 0;
	const holding = hold > 0 && within >= out && within < out + hold;
	return { index, amount, phase, holding };
}

function poseFor(exercise: DemoExercise, rep: RepState, t: number): Pose {
	const a = rep.amount;
	const active = rep.index >= 0 && rep.index < exercise.reps;
	const pose = restPose(exercise.setting);
	const breathe = Math.sin(t * 1.6) * 0.6;
	switch (exercise.motion) {
		case 'ankle-pump': {
			// A pump goes point, then pull, then back to neutral: one sine per rep.
			const s = active ? Math.sin(rep.phase * Math.PI * 2) : 0;
			const ankle = s >= 0 ? -28 * s : -22 * s;
			pose.legs = [straight(0, ankle), straight(0, ankle)];
			pose.work = [1, 1];
			break;
		}
		case 'quad-set': {
			// The knee stays on its towel roll: tightening presses it down a little, the toes come up.
			pose.legs = [{ thigh: 12 - 2.5 * a, knee: 24 - 6 * a, ankle: 14 * a }, straight(0)];
			pose.work = [1, 0];
			pose.squeeze = a;
			break;
		}
		case 'heel-slide': {
			// Equal thigh and shin keep the heel on the bed: thigh up by x, shin down by x.
			const lift = 50 * a;
			pose.legs = [{ thigh: lift, knee: 2 * lift, ankle: 0 }, straight(0)];
			pose.work = [1, 0];
			break;
		}
		case 'straight-leg-raise': {
			pose.legs = [
				{ thigh: 34 * a, knee: 0, ankle: 12 },
				{ thigh: 48, knee: 96, ankle: -42 }
			];
			pose.work = [1, 0];
			pose.squeeze = active ? Math.min(1, a * 3) : 0;
			break;
		}
		case 'seated-knee-extension': {
			pose.legs[0] = { thigh: 4 * a, knee: 90 - 85 * a, ankle: 16 * a };
			pose.work = [1, 0];
			break;
		}
		case 'sit-to-stand': {
			const ankle: Vec = [0.2, L.ankleHeight];
			// Nose over toes before the hips lift, as the cues say: lean, lift off, then stand tall.
			const keys: { f: number; hip: Vec; trunk: number }[] = [
				{ f: 0, hip: SEAT_HIP, trunk: 92 },
				{ f: 0.3, hip: [0.02, SEAT_HIP[1]], trunk: 52 },
				{ f: 0.62, hip: [0.12, 0.42], trunk: 58 },
				{ f: 1, hip: [0.18, STAND_HIP - 0.005], trunk: 88 }
			];
			let k = 0;
			while (k < keys.length - 2 && a > keys[k + 1].f) k++;
			const f = smooth((a - keys[k].f) / (keys[k + 1].f - keys[k].f));
			const hip: Vec = [
				lerp(keys[k].hip[0], keys[k + 1].hip[0], f),
				lerp(keys[k].hip[1], keys[k + 1].hip[1], f)
			];
			pose.hip = hip;
			pose.trunk = lerp(keys[k].trunk, keys[k + 1].trunk, f);
			pose.legs = [legTo(hip, ankle), legTo(hip, [ankle[0] - 0.01, ankle[1]])];
			// Arms reach forward as a counterweight while leaning, then hang at the sides.
			const reachOut = Math.sin(Math.min(1, a * 1.25) * Math.PI);
			const arm: Arm = { upper: lerp(-70, -15, reachOut), elbow: lerp(55, 10, reachOut) };
			pose.arms = [arm, arm];
			if (a > 0.9)
				pose.arms = [
					{ upper: -88, elbow: 8 },
					{ upper: -88, elbow: 8 }
				];
			pose.work = [1, 1];
			break;
		}
		case 'hamstring-curl': {
			pose.legs[0] = { thigh: -90 - 4 * a, knee: 88 * a, ankle: -10 * a };
			pose.work = [1, 0];
			break;
		}
		case 'feet-together': {
			const sway = active && rep.amount > 0 ? Math.sin(t * 1.3) * 1.4 * a : 0;
			const spread = lerp(0.03, 0, a);
			const p = standingLean(sway, [spread, -spread]);
			p.work = [1, 1];
			return p;
		}
		case 'tandem-stance': {
			const step = a;
			const nearX = lerp(0.03, 0.075, step);
			const farX = lerp(-0.03, -0.075, step);
			const sway = rep.holding ? Math.sin(t * 1.7) * 1.2 : 0;
			const p = standingLean(sway, [nearX, farX]);
			// The stepping foot lifts through the middle of the step.
			const lift = Math.sin(step * Math.PI) * 0.05;
			if (lift > 0.001) p.legs[0] = legTo(p.hip, [nearX, L.ankleHeight + lift]);
			p.work = [1, 0];
			return p;
		}
		case 'weight-shift': {
			const lean = active ? Math.sin(rep.phase * Math.PI * 2) * 7 : 0;
			const p = standingLean(lean, [0.03, -0.03]);
			p.work = [1, 1];
			return p;
		}
		case 'marching': {
			const p = standingLean(0, [0.02, -0.02]);
			const side = rep.index % 2 === 0 ? 0 : 1;
			const s = active ? Math.sin(rep.phase * Math.PI) : 0;
			const lifted: Leg = { thigh: -90 + 62 * s, knee: 78 * s, ankle: -10 * s };
			if (active) p.legs[side] = lifted;
			p.work = active ? [side === 0 ? 1 : 0, side === 1 ? 1 : 0] : [0.5, 0.5];
			return p;
		}
	}
	pose.trunk += breathe * 0.3;
	return pose;
}

// ---------------------------------------------------------------------------------------------
// Drawing

const C = {
	ink: '#1c2230',
	paper: '#faf8f4',
	lichen: '#2d6a56',
	lichenDeep: '#1f4d3e',
	ember: '#b3471f',
	emberSoft: '#d4875f',
	emberGlow: '#f0b48f',
	dusk: '#3b4f7a',
	ochre: '#7a5c12',
	slate: '#5a6272',
	slateSoft: '#8a90a0',
	mist: '#e8eee9'
};

// One room per exercise in turn, so neighbouring exercises never share a backdrop.
const ROOMS = [
	{ wall: '#faf8f4', floor: '#ddd6c8', trim: '#c9c0ae' },
	{ wall: '#e8eee9', floor: '#c6d3ca', trim: '#a9bcaf' },
	{ wall: '#eceef4', floor: '#cdd2df', trim: '#b0b7c9' },
	{ wall: '#f4ede3', floor: '#dccdb8', trim: '#c6b497' }
];

const FONT = 'KinelumeSans';
let fontsReady = false;

function ensureFonts() {
	if (fontsReady) return;
	fontsReady = true;
	for (const weight of [400, 700]) {
		try {
			const file = require.resolve(
				`@fontsource/atkinson-hyperlegible/files/atkinson-hyperlegible-latin-${weight}-normal.woff2`
			);
			GlobalFonts.registerFromPath(file, FONT);
		} catch {
			// The system sans-serif stands in; the clip stays usable, only less on-brand.
		}
	}
}

const font = (weight: 400 | 700, px: number) => `${weight} ${Math.round(px)}px ${FONT}, sans-serif`;

interface View {
	ctx: SKRSContext2D;
	w: number;
	h: number;
	/** Pixels per world unit. */
	s: number;
	/** Screen position of world origin. */
	ox: number;
	oy: number;
}

const toScreen = (v: View, p: Vec): Vec => [v.ox + p[0] * v.s, v.oy - p[1] * v.s];

function frameFor(setting: DemoSetting, index: number, w: number, h: number) {
	// Alternating framing (figure left or right of centre, a little closer or wider) makes each
	// cut read as a new shot, not only a new colour.
	const odd = index % 2 === 1;
	if (setting === 'supine') {
		const s = h * (odd ? 1.0 : 0.9);
		return { s, ox: w * (odd ? 0.46 : 0.52), oy: h * 0.86 };
	}
	const s = h * (odd ? 0.74 : 0.68);
	const ox = setting === 'seated' ? w * (odd ? 0.5 : 0.4) : w * (odd ? 0.44 : 0.36);
	return { s, ox, oy: h * 0.9 };
}

function roundRect(ctx: SKRSContext2D, x: number, y: number, w: number, h: number, r: number) {
	ctx.beginPath();
	ctx.roundRect(x, y, w, h, r);
}

function drawRoom(v: View, index: number) {
	const { ctx, w, h } = v;
	const room = ROOMS[index % ROOMS.length];
	ctx.fillStyle = room.wall;
	ctx.fillRect(0, 0, w, h);
	const floorY = v.oy;
	ctx.fillStyle = room.floor;
	ctx.fillRect(0, floorY, w, h - floorY);
	ctx.fillStyle = room.trim;
	ctx.fillRect(0, floorY - h * 0.012, w, h * 0.012);
}

function drawProps(v: View, setting: DemoSetting, index: number) {
	const { ctx, s } = v;
	const room = ROOMS[index % ROOMS.length];
	if (setting === 'supine') {
		const [x0, y0] = toScreen(v, [-0.56, BED_TOP]);
		const [x1, y1] = toScreen(v, [0.72, 0]);
		ctx.fillStyle = C.slate;
		for (const x of [x0 + s * 0.06, x1 - s * 0.09]) ctx.fillRect(x, y0, s * 0.03, y1 - y0);
		ctx.fillStyle = C.dusk;
		roundRect(ctx, x0, y0 - s * 0.005, x1 - x0, s * 0.08, s * 0.03);
		ctx.fill();
		ctx.fillStyle = C.mist;
		roundRect(ctx, x0, y0 - s * 0.025, x1 - x0, s * 0.045, s * 0.02);
		ctx.fill();
		const [px, py] = toScreen(v, [-0.52, BED_TOP + 0.075]);
		ctx.fillStyle = C.paper;
		roundRect(ctx, px, py, s * 0.2, s * 0.075, s * 0.03);
		ctx.fill();
		ctx.strokeStyle = room.trim;
		ctx.lineWidth = Math.max(1, s * 0.004);
		ctx.stroke();
		return;
	}
	if (setting === 'seated') {
		ctx.strokeStyle = C.lichenDeep;
		ctx.lineCap = 'round';
		ctx.lineWidth = s * 0.028;
		const seg = (a: Vec, b: Vec) => {
			const p = toScreen(v, a);
			const q = toScreen(v, b);
			ctx.beginPath();
			ctx.moveTo(p[0], p[1]);
			ctx.lineTo(q[0], q[1]);
			ctx.stroke();
		};
		seg([-0.17, SEAT_TOP - 0.01], [0.12, SEAT_TOP - 0.01]);
		seg([-0.16, 0.0], [-0.16, SEAT_TOP]);
		seg([0.1, 0.0], [0.1, SEAT_TOP]);
		seg([-0.175, SEAT_TOP], [-0.2, 0.56]);
		return;
	}
	// Counter: a pale cupboard behind the figure's legs, so a lifted knee stays in view; the
	// worktop is drawn again over the figure by drawWorktop so the hands rest on it.
	const [cx, cy] = toScreen(v, [COUNTER.front, COUNTER.top]);
	const [, fy] = toScreen(v, [0, 0]);
	ctx.fillStyle = room.trim;
	ctx.fillRect(cx + s * 0.02, cy, v.w, fy - cy);
	ctx.strokeStyle = room.wall;
	ctx.lineWidth = Math.max(1, s * 0.005);
	ctx.strokeRect(cx + s * 0.06, cy + s * 0.07, s * 0.3, fy - cy - s * 0.12);
	drawWorktop(v);
}

function drawWorktop(v: View) {
	const [cx, cy] = toScreen(v, [COUNTER.front, COUNTER.top]);
	v.ctx.fillStyle = C.lichenDeep;
	roundRect(v.ctx, cx - v.s * 0.01, cy - v.s * 0.02, v.w, v.s * 0.035, v.s * 0.01);
	v.ctx.fill();
}

function limb(v: View, points: Vec[], width: number, color: string) {
	const { ctx } = v;
	ctx.strokeStyle = color;
	ctx.lineWidth = width * v.s;
	ctx.lineCap = 'round';
	ctx.lineJoin = 'round';
	ctx.beginPath();
	points.forEach((p, i) => {
		const [x, y] = toScreen(v, p);
		if (i === 0) ctx.moveTo(x, y);
		else ctx.lineTo(x, y);
	});
	ctx.stroke();
}

function legPoints(hip: Vec, leg: Leg): { knee: Vec; ankle: Vec; heel: Vec; toe: Vec } {
	const knee = add(hip, leg.thigh, L.thigh);
	const shin = leg.thigh - leg.knee;
	const ankle = add(knee, shin, L.shin);
	const footDir = shin + 90 + leg.ankle;
	return { knee, ankle, heel: add(ankle, footDir + 180, L.heel), toe: add(ankle, footDir, L.foot) };
}

/** `between` draws what lies between the far and near leg in depth, such as a towel roll. */
function drawFigure(v: View, pose: Pose, between?: () => void) {
	const shoulder = shoulderOf(pose);
	const neck = add(shoulder, pose.trunk, L.neck);
	const head = add(neck, pose.trunk, L.head);
	const arm = (a: Arm): Vec[] => {
		const elbow = add(shoulder, a.upper, L.upperArm);
		return [shoulder, elbow, add(elbow, a.upper + a.elbow, L.forearm)];
	};
	const leg = (i: 0 | 1) => {
		const p = legPoints(pose.hip, pose.legs[i]);
		return {
			thigh: [pose.hip, p.knee] as Vec[],
			rest: [p.knee, p.ankle, p.heel, p.toe] as Vec[],
			p
		};
	};
	const colour = (i: 0 | 1) => {
		const work = pose.work[i];
		if (i === 0) return work >= 0.9 ? C.ember : work > 0 ? C.emberSoft : C.ink;
		return work >= 0.9 ? C.emberSoft : work > 0 ? '#d9a58a' : C.slateSoft;
	};

	// Far side first, then the body, then the near side, like a real side view.
	limb(v, arm(pose.arms[1]), 0.05, C.slateSoft);
	const far = leg(1);
	limb(v, [...far.thigh, ...far.rest.slice(0, 2)], 0.062, colour(1));
	limb(v, [far.p.ankle, far.p.heel, far.p.toe], 0.045, colour(1));

	limb(v, [pose.hip, shoulder], 0.115, C.lichen);
	limb(v, [shoulder, neck], 0.05, C.ink);
	const [hx, hy] = toScreen(v, head);
	v.ctx.fillStyle = C.ink;
	v.ctx.beginPath();
	v.ctx.arc(hx, hy, L.head * v.s, 0, Math.PI * 2);
	v.ctx.fill();

	between?.();
	const near = leg(0);
	if (pose.squeeze > 0.01) {
		v.ctx.globalAlpha = 0.35 + 0.5 * pose.squeeze;
		limb(v, near.thigh, 0.065 + 0.05 * pose.squeeze, C.emberGlow);
		v.ctx.globalAlpha = 1;
	}
	limb(v, [...near.thigh, ...near.rest.slice(0, 2)], 0.068, colour(0));
	limb(v, [near.p.ankle, near.p.heel, near.p.toe], 0.05, colour(0));
	limb(v, arm(pose.arms[0]), 0.055, C.ink);
}

function pill(
	ctx: SKRSContext2D,
	x: number,
	y: number,
	text: string,
	px: number,
	bg: string,
	fg: string,
	alignRight: boolean
) {
	ctx.font = font(700, px);
	const tw = ctx.measureText(text).width;
	const pw = tw + px * 1.2;
	const ph = px * 1.7;
	const left = alignRight ? x - pw : x;
	ctx.fillStyle = bg;
	roundRect(ctx, left, y, pw, ph, ph / 2);
	ctx.fill();
	ctx.fillStyle = fg;
	ctx.textBaseline = 'middle';
	ctx.fillText(text, left + px * 0.6, y + ph / 2 + px * 0.04);
	ctx.textBaseline = 'alphabetic';
	return ph;
}

function drawHud(v: View, clip: DemoClip, exercise: DemoExercise, index: number, rep: RepState) {
	const { ctx, w, h } = v;
	const px = h * 0.045;
	const m = h * 0.04;
	ctx.fillStyle = C.ink;
	ctx.font = font(700, px);
	ctx.textBaseline = 'top';
	ctx.fillText(exercise.title, m, m);
	ctx.fillStyle = C.slate;
	ctx.font = font(400, px * 0.8);
	ctx.fillText(`Exercise ${index + 1} of ${clip.exercises.length}`, m, m + px * 1.3);
	ctx.textBaseline = 'alphabetic';

	const shown = Math.min(Math.max(rep.index + 1, 0), exercise.reps);
	const label = rep.index < 0 ? `${exercise.reps} reps` : `Rep ${shown} of ${exercise.reps}`;
	const ph = pill(ctx, w - m, m, label, px, C.lichenDeep, C.paper, true);
	if (rep.holding) pill(ctx, w - m, m + ph + px * 0.4, 'Hold', px * 0.9, C.ochre, C.paper, true);
}

function drawTitleCard(
	v: View,
	clip: DemoClip,
	exercise: DemoExercise,
	index: number,
	alpha: number
) {
	const { ctx, w, h } = v;
	ctx.globalAlpha = alpha;
	ctx.fillStyle = C.lichenDeep;
	ctx.fillRect(0, 0, w, h);
	ctx.fillStyle = C.ember;
	ctx.fillRect(w * 0.08, h * 0.3, w * 0.06, h * 0.014);
	ctx.fillStyle = C.mist;
	ctx.font = font(400, h * 0.055);
	ctx.fillText(`Exercise ${index + 1} of ${clip.exercises.length}`, w * 0.08, h * 0.42);
	ctx.fillStyle = C.paper;
	ctx.font = font(700, h * 0.11);
	ctx.fillText(exercise.title, w * 0.08, h * 0.58, w * 0.84);
	const where = {
		supine: 'Lying on your back',
		seated: 'Seated on a chair',
		standing: 'Standing at a counter'
	}[exercise.setting];
	ctx.fillStyle = C.mist;
	ctx.font = font(400, h * 0.05);
	ctx.fillText(
		`${where} · ${exercise.reps} reps, slow and controlled`,
		w * 0.08,
		h * 0.7,
		w * 0.84
	);
	ctx.globalAlpha = 1;
}

function drawIntroCard(v: View, clip: DemoClip, plan: DemoPlan) {
	const { ctx, w, h } = v;
	ctx.fillStyle = C.paper;
	ctx.fillRect(0, 0, w, h);
	ctx.fillStyle = C.lichen;
	ctx.fillRect(0, 0, w * 0.035, h);
	const x = w * 0.09;
	ctx.fillStyle = C.lichen;
	ctx.font = font(700, h * 0.05);
	ctx.fillText(clip.clinic, x, h * 0.24, w * 0.84);
	ctx.fillStyle = C.ink;
	ctx.font = font(700, h * 0.085);
	const [first, ...rest] = clip.title.split(' — ');
	ctx.fillText(first, x, h * 0.4, w * 0.84);
	if (rest.length) {
		ctx.font = font(400, h * 0.07);
		ctx.fillText(rest.join(' — '), x, h * 0.51, w * 0.84);
	}
	ctx.fillStyle = C.slate;
	ctx.font = font(400, h * 0.045);
	ctx.fillText(
		`${clip.exercises.length} exercises · about ${Math.round(plan.durationSeconds / 60)} minutes`,
		x,
		h * 0.64,
		w * 0.84
	);
	const boxY = h * 0.73;
	ctx.fillStyle = C.mist;
	roundRect(ctx, x, boxY, w * 0.82, h * 0.16, h * 0.02);
	ctx.fill();
	ctx.fillStyle = C.ochre;
	ctx.fillRect(x, boxY, w * 0.012, h * 0.16);
	ctx.fillStyle = C.ink;
	ctx.font = font(700, h * 0.042);
	ctx.fillText('Stop if pain is sharp or worsening.', x + w * 0.035, boxY + h * 0.068, w * 0.76);
	ctx.font = font(400, h * 0.042);
	ctx.fillText('Follow your clinician’s advice.', x + w * 0.035, boxY + h * 0.125, w * 0.76);
}

function drawTowelRoll(v: View, pose: Pose) {
	const knee = add(pose.hip, pose.legs[0].thigh, L.thigh);
	// Pressing the knee down squashes the roll a little, which shows the effort without sound.
	const squash = 1 - 0.25 * pose.squeeze;
	const r = 0.024;
	const [x, y] = toScreen(v, [knee[0], MATTRESS_TOP + r * squash]);
	v.ctx.fillStyle = C.paper;
	v.ctx.strokeStyle = C.slateSoft;
	v.ctx.lineWidth = Math.max(1, v.s * 0.005);
	v.ctx.beginPath();
	v.ctx.ellipse(x, y, v.s * r * 1.6, v.s * r * squash, 0, 0, Math.PI * 2);
	v.ctx.fill();
	v.ctx.stroke();
}

function drawFrame(v: View, clip: DemoClip, plan: DemoPlan, t: number) {
	let section = plan.sections[0];
	for (const s of plan.sections) if (t >= s.start) section = s;
	if (!section || section.kind === 'intro') {
		drawIntroCard(v, clip, plan);
		return;
	}
	const exercise = clip.exercises[section.exercise];
	const index = section.exercise;
	const framing = frameFor(exercise.setting, index, v.w, v.h);
	const view: View = { ...v, ...framing };
	const rep = repState(exercise, t - section.motionStart);
	drawRoom(view, index);
	const pose = poseFor(exercise, rep, t);
	drawProps(view, exercise.setting, index);
	drawFigure(
		view,
		pose,
		exercise.motion === 'quad-set' ? () => drawTowelRoll(view, pose) : undefined
	);
	if (exercise.setting === 'standing') {
		// The hands rest on the worktop's edge: worktop over the far hand, near arm over both.
		drawWorktop(view);
		const shoulder = shoulderOf(pose);
		const a = pose.arms[0];
		const elbow = add(shoulder, a.upper, L.upperArm);
		limb(view, [shoulder, elbow, add(elbow, a.upper + a.elbow, L.forearm)], 0.055, C.ink);
	}
	drawHud(view, clip, exercise, index, rep);
	const local = t - section.start;
	if (local < CARD_HOLD + CARD_FADE) {
		// A fade, not a cut, out of the card: only the cut into it should score as a scene change.
		const alpha = local < CARD_HOLD ? 1 : 1 - smooth((local - CARD_HOLD) / CARD_FADE);
		drawTitleCard(v, clip, exercise, index, alpha);
	}
}

// ---------------------------------------------------------------------------------------------
// Sound

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

function soundtrack(plan: DemoPlan): Buffer {
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

/** One frame as PNG, for checking a pose or making a poster without encoding the whole clip. */
export async function renderDemoFrame(
	clip: DemoClip,
	seconds: number,
	opts: { width?: number; height?: number } = {}
): Promise<Buffer> {
	ensureFonts();
	const width = opts.width ?? 640;
	const height = opts.height ?? 360;
	const canvas = createCanvas(width, height);
	const view: View = { ctx: canvas.getContext('2d'), w: width, h: height, s: height, ox: 0, oy: 0 };
	drawFrame(view, clip, planDemoClip(clip), seconds);
	return canvas.encode('png');
}

// ---------------------------------------------------------------------------------------------
// Encoding

export function ffmpegPath(): string {
	return (require('@ffmpeg-installer/ffmpeg') as { path: string }).path;
}

/** Renders one clip to an MP4 at outputPath; resolves with the timing the captions need. */
export async function renderDemoClip(
	clip: DemoClip,
	outputPath: string,
	opts: RenderOptions = {}
): Promise<DemoRenderResult> {
	const width = opts.width ?? 640;
	const height = opts.height ?? 360;
	const fps = opts.fps ?? 12;
	if (width % 2 || height % 2) throw new Error('Width and height must be even for 4:2:0 video.');
	ensureFonts();
	const plan = planDemoClip(clip);
	const frames = Math.round(plan.durationSeconds * fps);

	const scratch = await mkdtemp(join(tmpdir(), 'kinelume-demo-'));
	try {
		const audioPath = join(scratch, 'audio.s16le');
		await writeFile(audioPath, soundtrack(plan));

		const args = [
			'-hide_banner',
			'-loglevel',
			'error',
			'-y',
			'-f',
			'rawvideo',
			'-pix_fmt',
			'rgba',
			'-s',
			`${width}x${height}`,
			'-r',
			String(fps),
			'-i',
			'pipe:0',
			'-f',
			's16le',
			'-ar',
			String(SAMPLE_RATE),
			'-ac',
			'1',
			'-i',
			audioPath,
			'-map',
			'0:v',
			'-map',
			'1:a',
			'-c:v',
			'libx264',
			'-preset',
			'veryfast',
			'-tune',
			'animation',
			'-crf',
			'22',
			'-pix_fmt',
			'yuv420p',
			// Keyframes every 2 s keep later stream-copy cuts close to the asked-for times.
			'-g',
			String(fps * 2),
			'-c:a',
			'aac',
			'-b:a',
			'96k',
			'-metadata',
			`title=${clip.title}`,
			'-metadata',
			'comment=Kinelume generated demonstration; invented scenario',
			'-movflags',
			'+faststart',
			'-f',
			'mp4',
			outputPath
		];
		const child = spawn(ffmpegPath(), args, { stdio: ['pipe', 'ignore', 'pipe'] });
		let stderr = '';
		child.stderr.on('data', (d: Buffer) => {
			stderr = (stderr + d.toString()).slice(-4000);
		});
		const exited = new Promise<void>((resolve, reject) => {
			child.on('error', reject);
			child.on('close', (code) =>
				code === 0 ? resolve() : reject(new Error(`ffmpeg exited with ${code}: ${stderr.trim()}`))
			);
		});
		// Awaited below; this only keeps an early failure from counting as unhandled meanwhile.
		exited.catch(() => undefined);
		// An early ffmpeg failure surfaces through `exited`; a write error alone would be less clear.
		let broken = false;
		child.stdin.on('error', () => {
			broken = true;
		});

		const canvas = createCanvas(width, height);
		const ctx = canvas.getContext('2d');
		const view: View = { ctx, w: width, h: height, s: height, ox: 0, oy: 0 };
		for (let i = 0; i < frames && !broken; i++) {
			drawFrame(view, clip, plan, i / fps);
			// Copied, because the canvas's own memory is redrawn before the pipe may have sent it.
			const ok = child.stdin.write(Buffer.from(canvas.data()));
			// Racing the exit keeps a dead ffmpeg from leaving us waiting for a drain forever.
			if (!ok) await Promise.race([new Promise((r) => child.stdin.once('drain', r)), exited]);
			if (opts.onProgress && i % fps === 0) opts.onProgress(i / frames);
		}
		child.stdin.end();
		await exited;
		opts.onProgress?.(1);
		return { durationSeconds: plan.durationSeconds, cues: plan.cues, sections: plan.sections };
	} finally {
		await rm(scratch, { recursive: true, force: true });
	}
}

// ---------------------------------------------------------------------------------------------
// Cache

export interface EnsuredDemoClip extends DemoRenderResult {
	clip: DemoClip;
	path: string;
	/** Whether this call rendered it (false: it came from the cache). */
	rendered: boolean;
	seconds: number;
}

export function demoClipHash(clip: DemoClip, opts: Omit<RenderOptions, 'onProgress'> = {}): string {
	const key = JSON.stringify({
		v: RENDERER_VERSION,
		clip,
		width: opts.width ?? 640,
		height: opts.height ?? 360,
		fps: opts.fps ?? 12
	});
	return createHash('sha256').update(key).digest('hex').slice(0, 16);
}

/**
 * Renders each missing clip into dir, one at a time (two cores: ffmpeg already uses the second
 * while this process draws). Files are named by a hash of script and renderer, so a re-run with
 * nothing changed only reads the sidecar JSON; stale versions of a clip are removed.
 */
export async function ensureDemoClips(
	dir: string,
	opts: Omit<RenderOptions, 'onProgress'> & {
		clips?: DemoClip[];
		onProgress?: (clip: DemoClip, fraction: number) => void;
	} = {}
): Promise<EnsuredDemoClip[]> {
	await mkdir(dir, { recursive: true });
	const results: EnsuredDemoClip[] = [];
	for (const clip of opts.clips ?? DEMO_CLIPS) {
		const began = performance.now();
		const base = `${clip.id}-${demoClipHash(clip, opts)}`;
		const path = join(dir, `${base}.mp4`);
		const sidecar = join(dir, `${base}.json`);
		let result: DemoRenderResult | null = null;
		let rendered = false;
		if (existsSync(path) && existsSync(sidecar)) {
			try {
				result = JSON.parse(await readFile(sidecar, 'utf8')) as DemoRenderResult;
			} catch {
				result = null;
			}
		}
		if (!result) {
			const partial = join(dir, `${base}.partial-${process.pid}.mp4`);
			try {
				result = await renderDemoClip(clip, partial, {
					width: opts.width,
					height: opts.height,
					fps: opts.fps,
					onProgress: opts.onProgress ? (f) => opts.onProgress?.(clip, f) : undefined
				});
				await rename(partial, path);
			} finally {
				await rm(partial, { force: true });
			}
			await writeFile(sidecar, JSON.stringify(result, null, '\t'));
			rendered = true;
			const stale = new RegExp(`^${clip.id.replace(/[^\w-]/g, '')}-[0-9a-f]{16}\\.(mp4|json)$`);
			for (const name of await readdir(dir)) {
				if (stale.test(name) && !name.startsWith(base)) {
					await rm(join(dir, name), { force: true });
				}
			}
		}
		results.push({
			...result,
			clip,
			path,
			rendered,
			seconds: (performance.now() - began) / 1000
		});
	}
	return results;
}
