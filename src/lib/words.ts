/**
 * Kinelume's glossary: one word per idea on every screen and in every e-mail. The label maps live
 * beside their domain and are gathered here, with the formats for lengths and dates, and the
 * words chosen where two were once used for one idea (`TERMS`; words.test.ts keeps the others
 * out of the code). The trade's words (set, rep, hold, phase, precaution) and WebVTT's (cue,
 * track) are kept as they are; "cue" means a caption cue only.
 */
export { INVITATION_STATUS, PATIENT_STATUS, type StatusWords } from './patient-status';
export { PROGRAMME_STATUS } from './programmes/status';
export {
	EXERCISE_STATUS,
	MOVEMENT_LABELS,
	POSITION_LABELS,
	SIDE_LABELS,
	phaseLabel
} from './exercises/vocabulary';
export {
	COLLECTION_STATUS,
	ENTRY_STATUS,
	SUBMISSION_STATUS,
	LICENCE_LABELS
} from './library/types';
export { SEGMENT_STATUS } from './segments/status';
export { RECORDING_STATUS } from './recordings/status';
export { formatDate, formatDateRange, formatDay, formatShortDate } from './format/dates';
export { formatInstant } from './format/instants';
export { formatLength } from './format/lengths';

export interface Term {
	/** The idea, in a few words. */
	idea: string;
	/** The one word or phrase people read for it. */
	word: string;
	/** Words once used for the same idea, which no screen or e-mail may use now. */
	not: string[];
	/** The old words are refused only as a whole label ("Movement"), not inside a longer phrase. */
	whole?: boolean;
}

export const TERMS: Term[] = [
	{
		idea: 'what to keep in mind while doing an exercise (coachingCues in the code)',
		word: 'Key points',
		not: ['Key cues', 'Points to remember', 'coaching cue']
	},
	{
		idea: 'make one caption cue or one segment of two neighbours',
		word: 'Join with next',
		not: ['Join next', 'Merge with next']
	},
	{ idea: 'undo one counted rep', word: 'Take a rep off', not: ['Take one off'] },
	{
		idea: 'the dosage an exercise starts a programme with',
		word: 'Starting dosage',
		not: ['Default dosage', 'Exercise default', 'Typical starting dosage', "exercise's default"]
	},
	{
		idea: 'why a patient is in rehabilitation',
		word: 'Operation or injury',
		not: ['Condition'],
		whole: true
	},
	{
		idea: 'passive, active-assisted, active or resisted',
		word: 'Movement type',
		not: ['Movement'],
		whole: true
	},
	{
		idea: 'an educator asks the clinician to change a submission',
		word: 'Changes requested',
		not: ['Sent back for changes']
	},
	{
		idea: 'an exercise taken out of use, or out of the public library, for good',
		word: 'Retired',
		not: ['withdrawn from the library', 'Withdrawn exercise']
	},
	{
		idea: 'the page that shows the e-mails sent on one machine',
		word: 'Development inbox',
		not: ['Dev inbox']
	},
	{
		idea: 'a picture taken from a clip',
		word: 'still picture',
		not: ['Posters', 'Cover poster', 'Making posters', 'the posters', 'clip and posters']
	},
	{ idea: 'how the picture is encoded', word: 'Picture format', not: ['Picture codec'] },
	{ idea: 'the language of captions', word: 'Language', not: ['Language tag'] },
	{
		idea: 'reminders for a phone or computer calendar',
		word: 'reminders for your calendar',
		not: ['.ics file']
	},
	{
		idea: 'how bold words and lists are written in safety notes',
		word: 'Write **words** for bold',
		not: ['Markdown']
	},
	{
		idea: 'the standing caution',
		word: 'does not replace an assessment',
		not: ['replaces no assessment']
	}
];
