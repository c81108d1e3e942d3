/** A demonstration segment as the exercise form offers it. */
export interface SegmentChoice {
	id: string;
	title: string;
	recordingTitle: string;
	durationSeconds: number | null;
	posterUrl: string | null;
	clipUrl: string;
	captionsUrl: string;
	/** True for the exercise's own segment when a newer cut has replaced it. */
	superseded?: boolean;
	/** The clip's picture size, so its still and player take its shape. */
	width?: number | null;
	height?: number | null;
}
