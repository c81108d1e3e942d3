/**
 * The submission page's one-step caption fixes. A segment's captions follow the recording's
 * captions track, so a fix is saved as the track's next version — through `saveVersion`, the
 * studio's own save, which refuses when someone saved since — and the segment, its patients and
 * the checklist read it at once: nothing is cut again.
 */
import { LIBRARY_CAPTION_PROFILE } from '$lib/library/checklist';
import { failingCues, fixedTrack, type CueFix, type FailingCue } from '$lib/library/cue-fixes';
import { CaptionError, firstCaptionsTrack, getVersion, saveVersion } from '../captions';
import type { SegmentRow } from '../db/schema';
import { findClinicExercise, LibraryError } from './submissions';

export interface CueFixes {
	trackId: string;
	recordingId: string;
	/** The track version the fixes were worked out on (the one a fix is saved on top of). */
	version: number;
	cues: FailingCue[];
}

const windowOf = (segment: SegmentRow) => ({
	start: segment.startSeconds,
	end: segment.endSeconds
});

/** The segment's failing cues with their fixes; null when the recording has no captions track. */
export function cueFixesFor(segment: SegmentRow): CueFixes | null {
	const track = firstCaptionsTrack(segment.clinicId, segment.recordingId);
	if (!track) return null;
	const cues = getVersion(track)?.cues ?? [];
	return {
		trackId: track.id,
		recordingId: segment.recordingId,
		version: track.currentVersion,
		cues: failingCues(cues, windowOf(segment), LIBRARY_CAPTION_PROFILE)
	};
}

export type CueFixResult =
	| { ok: true; version: number; label: string }
	/** Nothing was saved: the track moved on since `baseVersion`. */
	| { ok: false; version: number; message: string };

/**
 * Applies one offered fix to the exercise's segment's captions and saves the track's next
 * version on top of `baseVersion`, the version the clinician saw. A track saved since is a
 * conflict: nothing is written, and the caller shows the checks for the newer version.
 */
export function fixSegmentCue(
	clinician: { id: string; clinicId: string },
	exerciseId: string,
	input: { trackId: string; baseVersion: number; trackIndex: number; fix: CueFix }
): CueFixResult {
	const found = findClinicExercise(clinician.clinicId, exerciseId);
	if (!found) throw new LibraryError(404, 'Not found.');
	const { segment } = found;
	if (!segment) {
		throw new LibraryError(409, 'Choose a segment for this exercise before fixing its captions.');
	}
	const track = firstCaptionsTrack(segment.clinicId, segment.recordingId);
	if (!track || track.id !== input.trackId) {
		return {
			ok: false,
			version: track?.currentVersion ?? 0,
			message:
				'The recording’s captions track changed since this page was opened; nothing was saved. The checks below are for the captions as they are now.'
		};
	}
	if (track.currentVersion !== input.baseVersion) return conflict(track.currentVersion, input);
	const base = getVersion(track, input.baseVersion);
	const window = windowOf(segment);
	const fixed = base
		? fixedTrack(base.cues, window, input.trackIndex, input.fix, LIBRARY_CAPTION_PROFILE)
		: null;
	const offered = base
		? failingCues(base.cues, window, LIBRARY_CAPTION_PROFILE)
				.find((c) => c.trackIndex === input.trackIndex)
				?.fixes.find((f) => f.fix === input.fix)
		: undefined;
	if (!fixed || !offered) {
		throw new LibraryError(
			409,
			'That fix does not apply to the captions as they are; nothing was saved. Change the cue in the caption editor.'
		);
	}
	let saved;
	try {
		saved = saveVersion(track, {
			baseVersion: input.baseVersion,
			cues: fixed,
			note: `${offered.label}, from the library checks`,
			source: 'edit',
			userId: clinician.id
		});
	} catch (error) {
		if (error instanceof CaptionError) throw new LibraryError(error.status, error.message);
		throw error;
	}
	if (!saved.ok) return conflict(saved.conflict.current.version, input);
	return { ok: true, version: saved.version, label: offered.label };
}

function conflict(version: number, input: { baseVersion: number }): CueFixResult {
	return {
		ok: false,
		version,
		message: `Someone saved version ${version} of the captions after the version ${input.baseVersion} this page showed; nothing was overwritten. The checks below are for version ${version}.`
	};
}
