/**
 * The scripts of the demo clinic's demonstration clips (DESIGN.md §6): invented words for an
 * invented clinic, and the shape a script takes. Pure data, so the seeders and the tests read
 * the scripts without loading the renderer.
 *
 * The clips double as test media for segment suggestion, so their structure is deliberate: every
 * exercise opens with a hard cut to a title card (a scene change), a chime and an announcing line;
 * narration is a quiet voice-like tone under each cue; and the rest between exercises is digital
 * silence, so that silence detection and the scene score both find the boundaries the script knows.
 */

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
