/**
 * Narration scripts for the exercise-draft tests and `npm run bench:drafts`.
 *
 * Every script here is invented for these tests: the wording, the clinicians' styles and the
 * exercise names were written for Kinelume and quote no recording, product or person. Each
 * `expected` is the author's own reading of what a physiotherapist would fill in from that
 * narration alone (common practice, not a published source); a field left out means the narration
 * does not say it. Safety notes are expected as short quotes that a drafted bullet should contain.
 *
 * `set: 'check'` marks the held-out scripts: they were written together with the training ones,
 * before the vocabulary was tuned, and the vocabulary was never adjusted to them. Unit tests assert
 * exact answers on the training set only; the benchmark reports both sets apart.
 */
import type { Cue } from '$lib/captions/types';
import type { ExpectedExercise } from '../accuracy';

export interface NarrationScript {
	id: string;
	set: 'training' | 'check';
	/** How the invented clinician talks, for whoever reads a failing test. */
	style: string;
	cues: Cue[];
	expected: ExpectedExercise;
}

/** Cues from [start seconds, end seconds, text] rows, with ids as a caption file would number them. */
function cues(rows: readonly (readonly [number, number, string])[]): Cue[] {
	return rows.map(([start, end, text], i) => ({ id: String(i + 1), start, end, text }));
}

export const NARRATIONS: readonly NarrationScript[] = [
	{
		id: 'shoulder-stick-raises-supine',
		set: 'training',
		style: 'chatty, numbers in words, a negation, passive with a stick lying on the back',
		cues: cues([
			[0, 4, 'Right, the next exercise is stick raises.'],
			[4, 9, "You'll need a walking stick or a broom handle for this one."],
			[9, 14, 'Lie on your back on the bed with your knees bent.'],
			[14, 19, 'Hold the stick with both hands, shoulder width apart.'],
			[19, 25, 'Now use your good arm to push the stick up over your head.'],
			[25, 30, 'Your operated arm just comes along for the ride, let it relax.'],
			[30, 35, "Don't try to lift it yourself, the good arm does all the work."],
			[35, 40, 'Go up until you feel a gentle stretch, then bring it back down.'],
			[40, 45, "It shouldn't be painful, so only go as far as is comfortable."],
			[45, 51, 'Do ten of these, three times a day.']
		]),
		expected: {
			title: 'Stick raises',
			position: 'supine',
			equipment: ['Stick', 'Bed'],
			movementType: 'passive',
			side: 'either',
			bodyRegion: 'Shoulder',
			dosage: { reps: 10, sessionsPerDay: 3 },
			safetyNotes: ['gentle stretch', "shouldn't be painful", 'as far as is comfortable']
		}
	},
	{
		id: 'shoulder-external-rotation-towel',
		set: 'training',
		style: 'terse, digits, towel under the elbow, passive external rotation lying on the back',
		cues: cues([
			[0, 3, 'Exercise 3: external rotation with stick.'],
			[3, 7, 'Lying on your back. Rolled towel under the elbow.'],
			[7, 11, 'Elbow bent to 90, tucked in at your side.'],
			[11, 15, 'Good hand pushes the stick, turning the operated arm outwards.'],
			[15, 19, 'Keep the operated arm relaxed.'],
			[19, 23, 'Hold 5 seconds. 10 reps. 3 times a day.'],
			[23, 27, 'Stop if it hurts.']
		]),
		expected: {
			title: 'External rotation with stick',
			position: 'supine',
			equipment: ['Rolled towel', 'Stick'],
			movementType: 'passive',
			side: 'either',
			bodyRegion: 'Shoulder',
			dosage: { holdSeconds: 5, reps: 10, sessionsPerDay: 3 },
			safetyNotes: ['stop if it hurts']
		}
	},
	{
		id: 'shoulder-table-slides-seated',
		set: 'training',
		style: 'chatty, vague amounts, a later seated exercise where the operated arm helps',
		cues: cues([
			[0, 5, "Now we're going to do table slides, which you'll do sitting down."],
			[5, 10, 'Sit in a chair at the table with a small towel under your hand.'],
			[10, 16, 'Slide the towel forwards along the table,'],
			[16, 20, 'and let your good hand help the operated arm along.'],
			[20, 25, "Your operated arm does some of the work too, it's not just along for the ride."],
			[25, 30, 'This is a good one for getting your shoulder moving again.'],
			[30, 35, 'Slide as far as is comfortable, you may feel some tightness at the end.'],
			[35, 40, "That's fine, but don't push into pain."],
			[40, 46, 'Aim for eight to ten repetitions, a few times a day.']
		]),
		expected: {
			title: 'Table slides',
			position: 'seated',
			equipment: ['Chair', 'Table', 'Towel'],
			movementType: 'active-assisted',
			side: 'either',
			bodyRegion: 'Shoulder',
			dosage: { reps: { min: 8, max: 10 }, sessionsPerDay: { min: 3, max: 4 } },
			safetyNotes: ['as far as is comfortable', 'some tightness', "don't push into pain"]
		}
	},
	{
		id: 'knee-heel-slides',
		set: 'training',
		style: 'numbers in words, sentences split across cues, several cautions',
		cues: cues([
			[0, 3, 'The first exercise is heel slides.'],
			[3, 6, 'Lie on your'],
			[6, 9, 'back on the bed, legs out straight.'],
			[9, 13, 'Put a towel under your heel so it slides easily.'],
			[13, 18, 'Slowly bend your operated knee, sliding the heel up towards your bottom.'],
			[18, 23, 'Hold it there for a count of five, then slide it back down.'],
			[23, 28, 'Do two sets of fifteen, with a short rest between each set.'],
			[28, 32, 'Do this twice a day, every day.'],
			[32, 37, 'You might feel some pulling at the front of the knee.'],
			[37, 41, "That's normal, but if it's sharp pain, stop."],
			[41, 44, "And don't hold your breath."]
		]),
		expected: {
			title: 'Heel slides',
			position: 'supine',
			equipment: ['Bed', 'Towel'],
			movementType: 'active',
			side: 'either',
			bodyRegion: 'Knee',
			dosage: { holdSeconds: 5, sets: 2, reps: 15, sessionsPerDay: 2, daysPerWeek: 7 },
			safetyNotes: ['some pulling', 'sharp pain', 'hold your breath']
		}
	},
	{
		id: 'knee-seated-extension',
		set: 'training',
		style: 'terse, digits and abbreviations, explicit left side',
		cues: cues([
			[0, 3, 'Next up: seated knee extension.'],
			[3, 6, 'Sit on a firm chair, back supported.'],
			[6, 10, 'Straighten your left knee fully and tighten the thigh.'],
			[10, 13, 'Hold 10 sec, lower slowly.'],
			[13, 15, '3 x 10.'],
			[15, 18, 'Rest 30 seconds between sets.'],
			[18, 20, 'Twice daily.'],
			[20, 22, 'Should be pain free.']
		]),
		expected: {
			title: 'Seated knee extension',
			position: 'seated',
			equipment: ['Chair'],
			movementType: 'active',
			side: 'left',
			bodyRegion: 'Knee',
			dosage: { holdSeconds: 10, sets: 3, reps: 10, restSeconds: 30, sessionsPerDay: 2 },
			safetyNotes: ['pain free']
		}
	},
	{
		id: 'hip-side-lying-leg-lifts',
		set: 'training',
		style: 'chatty, numbers in words, a negation about equipment, caption markup',
		cues: cues([
			[0, 4, 'Alright, this one is called side-lying leg lifts.'],
			[4, 8, "You don't need any equipment for this, just your bed."],
			[8, 12, 'Lie on your side with the operated leg on top.'],
			[12, 16, 'Bend the bottom knee a little to keep you steady.'],
			[16, 21, 'Keep your top leg straight and lift it up towards the ceiling.'],
			[21, 25, '<i>Your own muscles</i> do the lifting here.'],
			[25, 29, "Don't roll backwards, keep your hips stacked."],
			[29, 34, 'Go up about a foot, hold for two seconds, and lower it down slowly.'],
			[34, 39, 'Ten of those, and do them two or three times a day.'],
			[39, 44, "It's normal to feel the muscles working on the side of your hip."],
			[44, 49, 'If you get any pain in the groin, stop and let us know.']
		]),
		expected: {
			title: 'Side-lying leg lifts',
			position: 'side-lying',
			equipment: ['Bed'],
			movementType: 'active',
			side: 'either',
			bodyRegion: 'Hip',
			dosage: { holdSeconds: 2, reps: 10, sessionsPerDay: { min: 2, max: 3 } },
			safetyNotes: ['pain in the groin']
		}
	},
	{
		id: 'ankle-pumps',
		set: 'training',
		style: 'short, offers a choice of position, no numbers',
		cues: cues([
			[0, 3, "Let's do ankle pumps."],
			[3, 7, 'You can do these lying down or sitting.'],
			[7, 12, 'Point your toes away from you, then pull them back towards you.'],
			[12, 15, 'Work both ankles together.'],
			[15, 18, 'Keep going for about thirty seconds.'],
			[18, 22, "Do this every hour or so while you're resting."],
			[22, 27, "These help the circulation, it shouldn't be uncomfortable."]
		]),
		expected: {
			title: 'Ankle pumps',
			movementType: 'active',
			side: 'both',
			bodyRegion: 'Ankle and foot',
			safetyNotes: ["shouldn't be uncomfortable"]
		}
	},
	{
		id: 'balance-single-leg',
		set: 'training',
		style: 'digits, standing balance with a chair, swaps legs',
		cues: cues([
			[0, 4, 'Exercise number five is single leg balance.'],
			[4, 9, 'Stand at the kitchen counter or next to a sturdy chair, with a hand resting on it.'],
			[9, 13, 'Lift one foot off the floor and balance on the other leg.'],
			[13, 16, 'Try to hold it for 30 seconds.'],
			[16, 21, 'Rest for 10 seconds, then repeat 3 times on each leg.'],
			[21, 25, 'Keep a hand on the counter if you feel wobbly.'],
			[25, 28, 'Then swap legs and do the other side.'],
			[28, 30, 'Do this once a day.']
		]),
		expected: {
			title: 'Single leg balance',
			position: 'standing',
			equipment: ['Chair'],
			movementType: 'active',
			side: 'both',
			bodyRegion: 'Balance',
			dosage: { holdSeconds: 30, restSeconds: 10, reps: 3, sessionsPerDay: 1 },
			safetyNotes: ['if you feel wobbly']
		}
	},
	{
		id: 'shoulder-band-external-rotation',
		set: 'training',
		style: 'digits and words mixed, resisted with a band, standing',
		cues: cues([
			[0, 4, 'OK, next exercise is band external rotation.'],
			[4, 9, 'Tie a resistance band to a door handle at elbow height.'],
			[9, 14, 'Stand side-on to the door, with your operated arm furthest from it.'],
			[
				14,
				20,
				'Keep your elbow tucked in, with a rolled-up towel between your elbow and your side.'
			],
			[20, 26, 'Pull the band outwards, against the resistance, then let it come back slowly.'],
			[26, 31, 'Do 2 sets of 12, once a day, five days a week.'],
			[31, 36, 'You should feel it working round the back of the shoulder,'],
			[36, 40, 'but it should never be painful.']
		]),
		expected: {
			title: 'Band external rotation',
			position: 'standing',
			equipment: ['Resistance band', 'Rolled towel'],
			movementType: 'resisted',
			side: 'either',
			bodyRegion: 'Shoulder',
			dosage: { sets: 2, reps: 12, sessionsPerDay: 1, daysPerWeek: 5 },
			safetyNotes: ['never be painful']
		}
	},
	{
		id: 'hip-bridges',
		set: 'training',
		style: 'vague amounts, a progression to ignore, several cautions in one sentence',
		cues: cues([
			[0, 2, "Now we'll do bridges."],
			[2, 6, 'Lie on your back, knees bent, feet flat on the bed.'],
			[6, 10, 'Squeeze your bottom and lift your hips up off the bed.'],
			[10, 15, 'Hold for three to five seconds at the top, then lower down slowly.'],
			[15, 18, 'Do a couple of sets of ten.'],
			[18, 24, "Don't arch your back, and don't push up so high that it hurts."],
			[24, 28, 'If you have any back pain, stop the exercise.'],
			[28, 33, 'Once it gets easy, you can progress to doing it on one leg.'],
			[33, 36, 'Every other day is enough for this one.']
		]),
		expected: {
			title: 'Bridges',
			position: 'supine',
			equipment: ['Bed'],
			movementType: 'active',
			bodyRegion: 'Hip',
			dosage: {
				holdSeconds: { min: 3, max: 5 },
				sets: { min: 2, max: 3 },
				reps: 10,
				daysPerWeek: { min: 3, max: 4 }
			},
			safetyNotes: ['so high that it hurts', 'back pain']
		}
	},
	{
		id: 'knee-sit-to-stand',
		set: 'training',
		style: 'starts seated and stands, an easier option to ignore, a range of reps',
		cues: cues([
			[0, 3, 'The next one is sit to stands.'],
			[3, 8, 'Sit towards the front of a firm chair, feet hip width apart.'],
			[8, 12, 'Lean forwards and stand up without using your hands.'],
			[12, 15, 'Then sit back down slowly, with control.'],
			[15, 20, "If that's too hard, push up from the arms of the chair to help."],
			[20, 24, 'Do eight to twelve, a few times a day.'],
			[24, 30, "Both legs work together here, so it's good strength work for your knees."],
			[30, 36, "Keep your knees in line with your toes, and make sure the chair can't slide."]
		]),
		expected: {
			title: 'Sit to stands',
			position: 'seated',
			equipment: ['Chair'],
			movementType: 'active',
			side: 'both',
			bodyRegion: 'Knee',
			dosage: { reps: { min: 8, max: 12 }, sessionsPerDay: { min: 3, max: 4 } },
			safetyNotes: ["chair can't slide"]
		}
	},
	{
		id: 'ankle-circles-right',
		set: 'training',
		style: 'chatty, explicit right side, seated on the bed',
		cues: cues([
			[0, 4, 'Our next exercise is ankle circles, for your right ankle.'],
			[4, 8, 'Sit on the edge of the bed with your foot off the floor.'],
			[8, 13, 'Move your ankle round in big slow circles, keeping the leg still.'],
			[13, 18, 'Go one way ten times, then the other way ten times.'],
			[
				18,
				24,
				'One set is plenty, and do it whenever you think of it, at least three times a day.'
			],
			[24, 30, "You may hear some clicking, which is fine, but it shouldn't be painful."]
		]),
		expected: {
			title: 'Ankle circles',
			position: 'seated',
			equipment: ['Bed'],
			movementType: 'active',
			side: 'right',
			bodyRegion: 'Ankle and foot',
			dosage: { reps: 10, sets: 1, sessionsPerDay: 3 },
			safetyNotes: ['clicking', "shouldn't be painful"]
		}
	},
	{
		id: 'check-shoulder-pendulum',
		set: 'check',
		style: 'chatty, passive, standing at a table, a range of sessions',
		cues: cues([
			[0, 4, 'Right then, the next exercise is the pendulum.'],
			[4, 9, 'Stand next to a table and lean on it with your good hand.'],
			[9, 14, 'Let your operated arm hang straight down, completely relaxed.'],
			[14, 19, 'Now gently rock your body so the arm swings in small circles.'],
			[19, 25, "Don't use your shoulder muscles to swing it, let your body do the work."],
			[25, 30, 'Go round ten times one way and ten times the other way.'],
			[30, 34, 'Do this four or five times a day.'],
			[34, 40, 'A bit of a dull ache is okay, but stop if the pain gets worse.']
		]),
		expected: {
			title: 'Pendulum',
			position: 'standing',
			equipment: ['Table'],
			movementType: 'passive',
			side: 'either',
			bodyRegion: 'Shoulder',
			dosage: { reps: 10, sessionsPerDay: { min: 4, max: 5 } },
			safetyNotes: ['dull ache', 'pain gets worse']
		}
	},
	{
		id: 'check-knee-straight-leg-raise',
		set: 'check',
		style: 'terse, digits with unit abbreviations, no side said',
		cues: cues([
			[0, 3, 'Exercise 4 - straight leg raise.'],
			[3, 6, 'On your back. Other knee bent.'],
			[6, 10, "Tighten thigh, lift leg 20 cm. Don't let the knee bend."],
			[10, 12, 'No help from your hands.'],
			[12, 16, 'Hold 3 s, lower. 3 sets of 8. Rest 1 min.'],
			[16, 19, 'Twice a day, 6 days a week.'],
			[19, 21, 'Stop if knee pain increases.']
		]),
		expected: {
			title: 'Straight leg raise',
			position: 'supine',
			movementType: 'active',
			bodyRegion: 'Knee',
			dosage: {
				holdSeconds: 3,
				sets: 3,
				reps: 8,
				restSeconds: 60,
				sessionsPerDay: 2,
				daysPerWeek: 6
			},
			safetyNotes: ['knee pain increases']
		}
	},
	{
		id: 'check-ankle-heel-raises',
		set: 'check',
		style: 'standing at a wall, a later step option to ignore, morning and evening',
		cues: cues([
			[0, 3, 'This exercise is called heel raises.'],
			[3, 8, 'Stand facing a wall with your fingertips on it for balance.'],
			[8, 13, 'Go up onto your toes with both feet, then slowly lower your heels.'],
			[13, 19, 'Later on you can do this on the edge of a step, letting your heels drop down.'],
			[19, 23, 'Aim for fifteen repetitions, two or three sets.'],
			[23, 26, 'Every day, morning and evening.'],
			[26, 32, "You'll feel your calf muscles working; a cramp is a sign to rest."]
		]),
		expected: {
			title: 'Heel raises',
			position: 'standing',
			equipment: ['Wall'],
			movementType: 'active',
			side: 'both',
			bodyRegion: 'Ankle and foot',
			dosage: { reps: 15, sets: { min: 2, max: 3 }, daysPerWeek: 7, sessionsPerDay: 2 },
			safetyNotes: ['cramp']
		}
	},
	{
		id: 'check-hip-seated-marching',
		set: 'check',
		style: 'chatty, seated, alternating legs, the knee named for a hip exercise',
		cues: cues([
			[0, 3, "Now we're going to do seated marching."],
			[3, 8, "Sit up tall in a chair without armrests, you won't need anything else."],
			[
				8,
				14,
				'Lift your operated knee up towards your chest, then put it down, then the other knee.'
			],
			[14, 17, 'Just like marching on the spot.'],
			[17, 21, 'Keep going for twenty lifts on each side.'],
			[21, 24, 'Do that three times a day.'],
			[24, 30, "Don't lean back to get the knee higher, it should feel easy and comfortable."]
		]),
		expected: {
			title: 'Seated marching',
			position: 'seated',
			equipment: ['Chair'],
			movementType: 'active',
			side: 'both',
			bodyRegion: 'Hip',
			dosage: { reps: 20, sessionsPerDay: 3 },
			safetyNotes: ["don't lean back"]
		}
	},
	{
		id: 'check-shoulder-stick-lifts-seated',
		set: 'check',
		style: 'seated later exercise, active-assisted with a stick, vague amounts',
		cues: cues([
			[0, 3, 'Exercise two: stick lifts in sitting.'],
			[3, 8, 'Sit in a chair and hold a stick in both hands, palms down.'],
			[8, 12, 'Lift the stick up in front of you as high as you can.'],
			[12, 17, 'Your good arm helps, but let the operated arm do as much as it can.'],
			[17, 20, 'Hold it up there for a few seconds.'],
			[20, 26, 'Repeat this several times, and do it a couple of times a day.'],
			[26, 31, 'You might feel some tightness at the top of the movement.'],
			[31, 35, "That's expected, but don't force it."]
		]),
		expected: {
			title: 'Stick lifts in sitting',
			position: 'seated',
			equipment: ['Chair', 'Stick'],
			movementType: 'active-assisted',
			side: 'either',
			dosage: {
				holdSeconds: { min: 3, max: 4 },
				reps: { min: 3, max: 5 },
				sessionsPerDay: { min: 2, max: 3 }
			},
			safetyNotes: ['some tightness', "don't force it"]
		}
	}
];
