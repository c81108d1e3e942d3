/** Draws one frame of a demo clip with @napi-rs/canvas: room, props, figure, cards. */
import { createRequire } from 'node:module';
import { createCanvas, GlobalFonts, type SKRSContext2D } from '@napi-rs/canvas';
import type { DemoClip, DemoExercise, DemoSetting, DemoPlan } from './scripts';
import {
	add,
	BED_TOP,
	COUNTER,
	L,
	MATTRESS_TOP,
	poseFor,
	repState,
	SEAT_TOP,
	shoulderOf,
	smooth,
	type Arm,
	type Leg,
	type Pose,
	type RepState,
	type Vec
} from './figure';
import { planDemoClip } from './timeline';

const require = createRequire(import.meta.url);

// The title card holds, then fades into the exercise.
const CARD_HOLD = 2;
const CARD_FADE = 0.8;

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

	// The picture counts the reps it shows, never a total: the dosage is the clinician's, and the
	// player's counter beside the clip counts against it (a "Rep 1 of 8" here once disagreed with
	// a prescribed 10).
	const shown = Math.min(Math.max(rep.index + 1, 0), exercise.reps);
	const label = rep.index < 0 ? 'Demonstration' : `Shown: rep ${shown}`;
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

/**
 * Draws the frames of one clip at one size into a single reused canvas; each call answers the
 * frame at `seconds` as raw RGBA bytes, for ffmpeg's `-f rawvideo -pix_fmt rgba`.
 */
export function rgbaFrames(
	clip: DemoClip,
	plan: DemoPlan,
	width: number,
	height: number
): (seconds: number) => Buffer {
	ensureFonts();
	const canvas = createCanvas(width, height);
	const view: View = { ctx: canvas.getContext('2d'), w: width, h: height, s: height, ox: 0, oy: 0 };
	return (seconds) => {
		drawFrame(view, clip, plan, seconds);
		// Copied, because the canvas's own memory is redrawn before the pipe may have sent it.
		return Buffer.from(canvas.data());
	};
}
