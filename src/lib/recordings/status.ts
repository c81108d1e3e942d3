/** Each recording status in words and a badge tone (never colour alone, DESIGN.md §6). */
export const RECORDING_STATUS = {
	processing: { label: 'Processing', tone: 'waiting' },
	ready: { label: 'Ready', tone: 'good' },
	failed: { label: 'Failed', tone: 'stopped' }
} as const;

/** A job stage as the page says it. */
export const STAGE_LABEL: Record<string, string> = {
	waiting: 'Waiting for its turn',
	'waiting to retry': 'Waiting to try again',
	'waiting for storage': 'Waiting for storage to answer again (nothing is lost)',
	starting: 'Starting',
	downloading: 'Fetching the original',
	rendition: 'Making the web version',
	posters: 'Making still pictures',
	sprite: 'Making the thumbnail strip',
	waveform: 'Reading the sound',
	storing: 'Saving',
	done: 'Done',
	cancelled: 'Cancelled'
};
