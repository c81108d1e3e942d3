/**
 * Where each stored object lives. Every key is built here so that ids never reach a key
 * unchecked: a `/` or `..` inside an id would let one clinic's key point into another's.
 *
 *   clinics/<clinic>/recordings/<recording>/original
 *   clinics/<clinic>/recordings/<recording>/rendition.mp4, rendition-<short>.mp4 (smaller versions)
 *   clinics/<clinic>/recordings/<recording>/posters/<n>.jpg
 *   clinics/<clinic>/recordings/<recording>/sprite.jpg, waveform.json   (the studio's timeline)
 *   clinics/<clinic>/recordings/<recording>/segments/<segment>.mp4
 *   clinics/<clinic>/recordings/<recording>/segments/<segment>/posters/<n>.jpg
 *   clinics/<clinic>/recordings/<recording>/segments/<segment>/clip-<short>.mp4 (smaller versions)
 *   library/<published-version>/rendition.mp4, posters/<n>.jpg, segments/<segment>.mp4,
 *     segments/<segment>/clip-<short>.mp4
 */

import { LADDER } from '../../media/ladder';

const ID_PATTERN = /^[A-Za-z0-9][A-Za-z0-9._-]{0,127}$/;

/** Returns the id unchanged, or throws if it could not safely be one path segment of a key. */
export function keySegment(id: string, what = 'id'): string {
	if (!ID_PATTERN.test(id) || id.includes('..')) {
		throw new Error(
			`Invalid ${what} for a storage key: ${JSON.stringify(id)} (letters, digits, '.', '_' and '-' only, no '..').`
		);
	}
	return id;
}

export interface MediaKeys {
	/** Ends with `/`: pass it to `deletePrefix` to remove everything below. */
	prefix: string;
	rendition: string;
	sprite: string;
	waveform: string;
	poster(index: number): string;
	segment(segmentId: string): string;
	segmentPoster(segmentId: string, index: number): string;
	/** A smaller version of the rendition (the ladder's short side). */
	renditionVersion(short: number): string;
	/** A smaller version of a segment's clip. */
	segmentVersion(segmentId: string, short: number): string;
	/** Ends with `/`: the segment's posters and smaller versions. */
	segmentFolder(segmentId: string): string;
}

export interface RecordingKeys extends MediaKeys {
	original: string;
}

function posterIndex(index: number): number {
	if (!Number.isSafeInteger(index) || index < 0) {
		throw new Error(`Invalid poster index for a storage key: ${index}.`);
	}
	return index;
}

function versionShort(short: number): number {
	if (!LADDER.some((rung) => rung.short === short)) {
		throw new Error(`Invalid version for a storage key: ${short}.`);
	}
	return short;
}

function mediaKeys(prefix: string): MediaKeys {
	return {
		prefix,
		rendition: `${prefix}rendition.mp4`,
		sprite: `${prefix}sprite.jpg`,
		waveform: `${prefix}waveform.json`,
		poster(index) {
			return `${prefix}posters/${posterIndex(index)}.jpg`;
		},
		segment(segmentId) {
			return `${prefix}segments/${keySegment(segmentId, 'segment id')}.mp4`;
		},
		segmentPoster(segmentId, index) {
			return `${prefix}segments/${keySegment(segmentId, 'segment id')}/posters/${posterIndex(index)}.jpg`;
		},
		renditionVersion(short) {
			return `${prefix}rendition-${versionShort(short)}.mp4`;
		},
		segmentVersion(segmentId, short) {
			return `${prefix}segments/${keySegment(segmentId, 'segment id')}/clip-${versionShort(short)}.mp4`;
		},
		segmentFolder(segmentId) {
			return `${prefix}segments/${keySegment(segmentId, 'segment id')}/`;
		}
	};
}

export function clinicPrefix(clinicId: string): string {
	return `clinics/${keySegment(clinicId, 'clinic id')}/`;
}

export function recordingKeys(clinicId: string, recordingId: string): RecordingKeys {
	const prefix = `${clinicPrefix(clinicId)}recordings/${keySegment(recordingId, 'recording id')}/`;
	return { ...mediaKeys(prefix), original: `${prefix}original` };
}

export function libraryKeys(publishedVersionId: string): MediaKeys {
	return mediaKeys(`library/${keySegment(publishedVersionId, 'published version id')}/`);
}
