/**
 * The demo figure: its body, the props it rests on, and the pose at each moment of each
 * exercise. Pure geometry; drawing.ts puts it on a canvas.
 */
import type { DemoExercise, DemoSetting } from './scripts';

// Figure geometry. World units: standing height about 1, y up, the figure faces +x (the viewer
// sees its left side, so the near leg is the left leg). Angles in degrees, 0 = +x, 90 = up.

export const L = {
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
export const STAND_HIP = L.ankleHeight + L.thigh + L.shin;

export type Vec = [number, number];

export interface Leg {
	/** Direction from hip to knee. */
	thigh: number;
	/** Knee bend; the shin points thigh − knee. */
	knee: number;
	/** Dorsiflexion from a right angle with the shin (toes toward the shin is positive). */
	ankle: number;
}

export interface Arm {
	upper: number;
	elbow: number;
}

export interface Pose {
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
export const add = (p: Vec, a: number, len: number): Vec => {
	const d = dir(a);
	return [p[0] + d[0] * len, p[1] + d[1] * len];
};
const lerp = (a: number, b: number, f: number) => a + (b - a) * f;
export const smooth = (f: number) => {
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

export const shoulderOf = (p: Pose): Vec => add(p.hip, p.trunk, L.trunk);

// Where the props stand, so poses can rest on them.
export const BED_TOP = 0.2;
export const MATTRESS_TOP = BED_TOP + 0.025;
const SUPINE_HIP: Vec = [0.02, BED_TOP + 0.045];
export const SEAT_TOP = 0.24;
const SEAT_HIP: Vec = [0, SEAT_TOP + 0.045];
export const COUNTER = { front: 0.16, top: 0.57 };
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

export interface RepState {
	/** Which rep (0-based), or -1 before the first and reps after the last. */
	index: number;
	/** Out-and-back amount, 0 at rest, 1 at the end of range (held). */
	amount: number;
	/** Phase through the rep, 0–1, for motions that oscillate. */
	phase: number;
	holding: boolean;
}

export function repState(exercise: DemoExercise, local: number): RepState {
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

export function poseFor(exercise: DemoExercise, rep: RepState, t: number): Pose {
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
