/**
 * What the narrator of the authoring benchmark's recording says: a short welcome, then three
 * exercises (a shoulder, a knee and a balance exercise), each announced, with its position,
 * equipment, who does the work, a dosage and a caution. The words and the exercise names were
 * written for this benchmark; they quote no recording, clinician or product.
 *
 * Each `expected` is the author's own reading of what a physiotherapist would fill in from the
 * exercise's narration alone (common practice, not a published source), in the shape
 * `src/lib/authoring/accuracy.ts` scores; a field left out is not said. `settleTo` is the number
 * the clinician picks for an amount said as a range.
 */
import type { ExpectedExercise } from '../../lib/authoring/accuracy';
import type { DosageField } from '../../lib/dosage/types';

export interface NarratedSection {
	/** The picture's colour behind the section (hex, for ffmpeg). */
	colour: string;
	/** One phrase per breath: the pauses between phrases are where the cues end. */
	phrases: string[];
}

export interface NarratedExercise extends NarratedSection {
	expected: ExpectedExercise & Required<Pick<ExpectedExercise, 'title' | 'bodyRegion'>>;
	settleTo?: Partial<Record<DosageField, number>>;
}

export const WELCOME: NarratedSection = {
	colour: '0x2f4858',
	phrases: ['Hello. Watch each of these home exercises before you try it.']
};

export const EXERCISES: NarratedExercise[] = [
	{
		colour: '0x33658a',
		phrases: [
			'The first exercise is the wand lift.',
			'Lie on your back on the bed, holding a walking stick with your arms straight.',
			'Your good arm does the work. Let the operated arm relax.',
			'Raise the stick slowly over your head, then bring it back down.',
			'Repeat it ten times, three times a day.',
			'Stop if your shoulder starts to hurt.'
		],
		expected: {
			title: 'Wand lift',
			bodyRegion: 'Shoulder',
			position: 'supine',
			equipment: ['Bed', 'Stick'],
			movementType: 'passive',
			side: 'either',
			dosage: { reps: 10, sessionsPerDay: 3 },
			safetyNotes: ['stop if your shoulder starts to hurt']
		}
	},
	{
		colour: '0x5b8c5a',
		phrases: [
			'The next exercise is the knee straightener.',
			'Sit up tall on a firm chair, away from the backrest.',
			'Straighten your operated knee by yourself until the leg is level.',
			'Hold it there for five seconds, then lower it slowly.',
			'Do two sets of twelve, twice a day.',
			'If the knee aches afterwards, do fewer next time.'
		],
		expected: {
			title: 'Knee straightener',
			bodyRegion: 'Knee',
			position: 'seated',
			equipment: ['Chair'],
			movementType: 'active',
			side: 'either',
			dosage: { sets: 2, reps: 12, holdSeconds: 5, sessionsPerDay: 2 },
			safetyNotes: ['if the knee aches afterwards']
		}
	},
	{
		colour: '0xb5651d',
		phrases: [
			'The next exercise is the narrow stance, for your standing balance.',
			'Stand at the kitchen table with your fingertips resting on it.',
			'Put one heel right in front of the other toes and stay still on your own.',
			'Hold for twenty seconds, then swap legs.',
			'Do this a few times a day, every day.',
			'If you feel unsteady, hold the table firmly until it passes.'
		],
		expected: {
			title: 'Narrow stance',
			bodyRegion: 'Balance',
			position: 'standing',
			equipment: ['Table'],
			movementType: 'active',
			side: 'both',
			dosage: { holdSeconds: 20, sessionsPerDay: { min: 3, max: 4 }, daysPerWeek: 7 },
			safetyNotes: ['if you feel unsteady']
		},
		settleTo: { sessionsPerDay: 3 }
	}
];
