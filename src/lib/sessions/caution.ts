/**
 * The standing caution on every patient page and the printed sheet: one wording, kept here.
 * Tightness at the end of a movement is expected in most stretching and range exercises (common
 * practice), so the caution says so instead of "stop if it hurts", which the safety notes would
 * then contradict; what means stop, and what needs urgent care, follow.
 */
export const CAUTION_HEADING = 'When to stop';

export const CAUTION_SENTENCES = [
	'Tightness or a stretch at the end of the movement is expected.',
	'Stop and contact your clinician if pain is sharp or getting worse, or if you notice new numbness, swelling or redness.',
	'Get urgent medical help for a hot, swollen calf, breathlessness, a fever or a leaking wound.',
	"This programme was prescribed for you and does not replace an assessment; follow your clinician's advice and your surgeon's protocol."
] as const;
