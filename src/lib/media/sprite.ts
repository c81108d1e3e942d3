/**
 * A recording's thumbnail strip: one sprite sheet of `count` tiles in reading order, `columns`
 * across and `rows` down, tile i showing the picture at i × `intervalSeconds`. Made by the media
 * job, stored on the recording, and read by the timelines to pick the tile for a time.
 */
export interface SpriteLayout {
	columns: number;
	rows: number;
	intervalSeconds: number;
	tileWidth: number;
	tileHeight: number;
	count: number;
}
