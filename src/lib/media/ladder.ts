/**
 * The bitrate ladder: every web video Kinelume makes (a recording's rendition, a segment's clip)
 * exists in a few capped versions, so a patient on a weak phone connection gets one it can carry.
 * Pure: the server plans what to encode from it, the player chooses from it.
 *
 * A version is named by its picture's short side (the height of a landscape picture, the width of
 * a portrait one). The largest version is the one every video already had, under its old address;
 * the smaller ones sit beside it and are asked for with `?v=<short side>`. Videos made before the
 * ladder have only the largest, which is what any `?v=` then gets.
 */

export interface Rung {
	/** The short side of the picture box: 360 fits 640 × 360 (or 360 × 640 upright). */
	short: number;
	/** Video bitrate cap (ffmpeg `-maxrate`, with a buffer of twice that). */
	videoKbps: number;
	audioKbps: number;
}

/**
 * Our choice, measured in `npm run bench:network`: the smallest fits a slow 3G-like link of
 * 400 kbit/s with room for its round trips (about 0.3 Mbit/s all told), the middle one a weak 4G
 * or busy Wi-Fi, the top one the 720p web version as before, now capped.
 */
export const LADDER: readonly Rung[] = [
	{ short: 360, videoKbps: 250, audioKbps: 48 },
	{ short: 540, videoKbps: 900, audioKbps: 96 },
	{ short: 720, videoKbps: 2200, audioKbps: 128 }
];

/** The box the largest version fits (as before the ladder): 1280 × 720, turned to the picture. */
export const TOP_LONG = 1280;
export const TOP_SHORT = 720;

/** A smaller version is made only when it is at most this share of the largest's short side. */
const STEP = 0.8;

export interface PlannedVersion extends Rung {
	/** True for the largest version (kept at the old address). */
	top: boolean;
}

/** The short side the largest version will have: the picture fitted to 1280 × 720, never enlarged. */
export function topShortSide(width: number, height: number): number {
	const long = Math.max(width, height);
	const short = Math.min(width, height);
	if (!(long > 0 && short > 0)) return TOP_SHORT;
	const factor = Math.min(1, TOP_LONG / long, TOP_SHORT / short);
	return Math.max(2, Math.round((short * factor) / 2) * 2);
}

/**
 * What to encode for a picture of `width` × `height` (as displayed): the ladder's rungs clearly
 * smaller than the largest version (never enlarged), then the largest, capped at the rate of the
 * smallest rung at least its size. Ascending.
 */
export function planVersions(width: number, height: number): PlannedVersion[] {
	const top = topShortSide(width, height);
	const smaller = LADDER.filter((r) => r.short <= top * STEP).map((r) => ({ ...r, top: false }));
	const cap = LADDER.find((r) => r.short >= top) ?? LADDER[LADDER.length - 1];
	return [...smaller, { ...cap, short: top, top: true }];
}

/** The `?v=` values an endpoint accepts: the ladder's short sides. */
export function parseVersionParam(value: string | null): number | null | 'invalid' {
	if (value === null || value === '') return null;
	const short = /^[1-9]\d{2,3}$/.test(value) ? Number(value) : NaN;
	return LADDER.some((r) => r.short === short) ? short : 'invalid';
}

/** A smaller version as stored beside the largest: its short side and size in bytes. */
export interface StoredVersion {
	short: number;
	size: number;
}

/**
 * Which stored key serves `?v=wanted`: the smaller version of that size when it was made, else
 * the largest (old videos, or a size this video has none of).
 */
export function servedVersion(
	wanted: number | null,
	stored: readonly StoredVersion[] | null | undefined
): number | null {
	if (wanted === null) return null;
	return stored?.some((v) => v.short === wanted) ? wanted : null;
}

/** One version as the player sees it. */
export interface PlayerVersion {
	/** Its address (the largest has no `?v=`). */
	src: string;
	/** Average bitrate, from its size and length. */
	kbps: number;
	short: number;
}

/**
 * The versions of a clip at `base`, ascending, with their average bitrates from their sizes.
 * A video made before the ladder has one.
 */
export function playerVersions(
	base: string,
	top: { short: number | null; size: number | null },
	smaller: readonly StoredVersion[] | null | undefined,
	durationSeconds: number | null
): PlayerVersion[] {
	const kbps = (size: number | null) =>
		size && durationSeconds && durationSeconds > 0
			? Math.round((size * 8) / durationSeconds / 1000)
			: 0;
	const list = [...(smaller ?? [])]
		.sort((a, b) => a.short - b.short)
		.map((v) => ({ src: `${base}?v=${v.short}`, kbps: kbps(v.size), short: v.short }));
	return [...list, { src: base, kbps: kbps(top.size), short: top.short ?? TOP_SHORT }];
}

/**
 * Share of the measured throughput a version may use: the rest is for round trips, the captions,
 * a poster and the jitter of a phone link, so playback keeps ahead.
 */
export const THROUGHPUT_SHARE = 0.7;

/**
 * The version to play on a link of `throughputKbps`: the largest whose bitrate fits its share,
 * else the smallest. Unknown throughput (null) starts with the smallest: it draws a first frame
 * quickly on any link, and the player steps up once it has measured. Save-Data keeps the smallest.
 */
export function chooseVersion(
	versions: readonly Pick<PlayerVersion, 'kbps'>[],
	throughputKbps: number | null,
	saveData = false
): number {
	if (versions.length === 0) return -1;
	if (throughputKbps === null || !(throughputKbps > 0) || saveData) return 0;
	let chosen = 0;
	for (const [index, v] of versions.entries()) {
		if (v.kbps <= throughputKbps * THROUGHPUT_SHARE) chosen = index;
	}
	return chosen;
}

/** What the player saw since it last decided. */
export interface PlaybackSample {
	/** Throughput measured or reported now, kbit/s; null when unknown. */
	throughputKbps: number | null;
	/** Seconds the picture has been waiting for data since the last decision (0 when none). */
	stalledSeconds: number;
	saveData?: boolean;
}

/** A stall longer than this steps down a version. */
export const STALL_STEP_DOWN_SECONDS = 1;

/**
 * Steps up or down from version `current`: down one after a stall (the link cannot carry it),
 * up to what the throughput carries (never more than one step at once, so a burst does not
 * jump to the top), and never up with Save-Data.
 */
export function nextVersion(
	versions: readonly Pick<PlayerVersion, 'kbps'>[],
	current: number,
	sample: PlaybackSample
): number {
	if (sample.stalledSeconds >= STALL_STEP_DOWN_SECONDS) return Math.max(0, current - 1);
	if (sample.saveData || sample.throughputKbps === null) return current;
	const fits = chooseVersion(versions, sample.throughputKbps);
	return fits > current ? current + 1 : current;
}

/**
 * Throughput from what the media element buffered: `bufferedSeconds` of a version of `kbps`
 * arrived in `wallSeconds`. Null when too little time passed to tell.
 */
export function bufferedThroughput(
	bufferedSeconds: number,
	wallSeconds: number,
	kbps: number
): number | null {
	if (!(wallSeconds >= 0.5) || !(bufferedSeconds > 0) || !(kbps > 0)) return null;
	return (bufferedSeconds * kbps) / wallSeconds;
}
