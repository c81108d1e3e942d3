/** As in the segment table (db/schema/segments.ts), restated so pages need no server import. */
export type SegmentStatus = 'cutting' | 'ready' | 'failed';

/** Each segment status in words and a badge tone (never colour alone, DESIGN.md §6). */
export const SEGMENT_STATUS: Record<
	SegmentStatus,
	{ label: string; tone: 'good' | 'waiting' | 'stopped' }
> = {
	cutting: { label: 'Cutting', tone: 'waiting' },
	ready: { label: 'Ready', tone: 'good' },
	failed: { label: 'Failed', tone: 'stopped' }
};

/** A cut job's stage as the page says it. */
export const CUT_STAGE_LABEL: Record<string, string> = {
	waiting: 'Waiting for its turn',
	'waiting to retry': 'Waiting to try again',
	starting: 'Starting',
	cutting: 'Cutting the clip',
	posters: 'Making still pictures',
	storing: 'Saving',
	done: 'Done',
	cancelled: 'Cancelled'
};
