/**
 * One-step fixes for the caption errors that keep a submission from the library, offered beside
 * the checklist. A segment's captions are the recording's track clipped to the segment, so a
 * fix is made on the track's cue (the studio's own fixes, through `applyFix`) and judged on the
 * segment's captions as they would then be served: it is offered only when it removes an error
 * of the segment and brings none.
 */
import { checkCues, type Finding, type GuidelineProfile } from '../captions/checks';
import { applyFix } from '../captions/edit';
import { shiftAndClip } from '../captions/segment';
import { plainText } from '../captions/text';
import { formatTimestamp } from '../captions/timestamp';
import type { Cue } from '../captions/types';
import { cuesAsServed } from '../captions/vtt';

/** The fixes offered here: show the cue longer in the free time after it, or split it in two. */
export const CUE_FIXES = ['extend-into-gap', 'split-cue'] as const;
export type CueFix = (typeof CUE_FIXES)[number];

export function isCueFix(value: unknown): value is CueFix {
	return CUE_FIXES.includes(value as CueFix);
}

/** The part of the recording a segment covers, in the track's seconds. */
export interface Window {
	start: number;
	end: number;
}

export interface CueFixOption {
	fix: CueFix;
	/** What the fix does, in words, naming the cue (it is the button's text). */
	label: string;
}

export interface FailingCue {
	/** Position in the segment's captions, as the checklist counts them (from 0). */
	index: number;
	/** Position of the cue it comes from in the track; null when none can be fixed here. */
	trackIndex: number | null;
	/** Start in the segment's clip, in seconds. */
	start: number;
	text: string;
	/** The errors the checks found, in their words. */
	problems: string[];
	fixes: CueFixOption[];
	/** Why no fix is offered, when none is. */
	note: string | null;
}

const at = (seconds: number) => formatTimestamp(Math.max(0, seconds), { hours: 'auto' });
const secs = (seconds: number) => `${Math.round(seconds * 100) / 100} s`;

/** The positions in `trackCues` of the cues `shiftAndClip` keeps for the window, in its order. */
function keptPositions(trackCues: readonly Cue[], window: Window): number[] {
	const kept: number[] = [];
	trackCues.forEach((cue, k) => {
		if (shiftAndClip([cue], window.start, window.end).length > 0) kept.push(k);
	});
	return kept;
}

/** The segment's cues as a browser reads its served file; null when it cannot be written. */
function served(trackCues: readonly Cue[], window: Window): Cue[] | null {
	try {
		return cuesAsServed(shiftAndClip(trackCues, window.start, window.end));
	} catch {
		return null;
	}
}

const errorsOf = (cues: readonly Cue[], profile: GuidelineProfile) =>
	checkCues(cues, profile).filter((f) => f.severity === 'error');

// An error is the same one after a fix when the same cue (its start and words) has it.
const errorKey = (cues: readonly Cue[], f: Finding) =>
	`${f.kind}\n${cues[f.index].start}\n${cues[f.index].text}`;

/**
 * Applies `fix` to the track's cue at `trackIndex`, for the segment in `window`. The cue must lie
 * inside the window, and it is never shown past the window's end (that time belongs to the next
 * segment). Null unless the segment then has fewer errors and none it did not have.
 */
export function fixedTrack(
	trackCues: readonly Cue[],
	window: Window,
	trackIndex: number,
	fix: CueFix,
	profile: GuidelineProfile
): Cue[] | null {
	const cue = trackCues[trackIndex];
	if (!cue || cue.start < window.start || cue.end > window.end) return null;
	const edit = applyFix(trackCues, trackIndex, fix, profile, { duration: window.end });
	if (!edit.changed) return null;
	const before = served(trackCues, window);
	const after = served(edit.cues, window);
	if (!before || !after) return null;
	const was = errorsOf(before, profile);
	const had = new Set(was.map((f) => errorKey(before, f)));
	const now = errorsOf(after, profile);
	if (now.length >= was.length || now.some((f) => !had.has(errorKey(after, f)))) return null;
	return edit.cues;
}

function describe(
	fix: CueFix,
	number: number,
	before: readonly Cue[],
	after: Cue[],
	trackIndex: number,
	window: Window
): string {
	const cue = before[trackIndex];
	if (fix === 'extend-into-gap') {
		const moved = after.find((c) => c.start === cue.start && c.text === cue.text) ?? cue;
		return `Show cue ${number} until ${at(moved.end - window.start)} (${secs(moved.end - cue.end)} longer)`;
	}
	const parts = after.length - before.length + 1;
	return `Split cue ${number} in ${parts === 2 ? 'two' : parts}`;
}

/**
 * The segment's cues with errors under `profile`, each with the fixes that would clear it. The
 * cues are the track's (`trackCues`) clipped to `window`, numbered as the checklist numbers them.
 */
export function failingCues(
	trackCues: readonly Cue[],
	window: Window,
	profile: GuidelineProfile
): FailingCue[] {
	const cues = served(trackCues, window);
	if (!cues) return [];
	const positions = keptPositions(trackCues, window);
	// Fixes work on cues in time order; a track out of order is put right in the caption editor first.
	const ordered = trackCues.every((c, k) => k === 0 || c.start >= trackCues[k - 1].start);
	const byCue = new Map<number, Finding[]>();
	for (const finding of errorsOf(cues, profile)) {
		byCue.set(finding.index, [...(byCue.get(finding.index) ?? []), finding]);
	}
	return [...byCue.entries()]
		.sort(([a], [b]) => a - b)
		.map(([index, findings]) => {
			const cue = cues[index];
			const base = {
				index,
				start: cue.start,
				text: plainText(cue.text),
				problems: findings.map((f) => f.message)
			};
			const trackIndex = positions.length === cues.length ? positions[index] : undefined;
			const source = trackIndex === undefined ? undefined : trackCues[trackIndex];
			let note: string | null = null;
			if (!ordered)
				note = 'The cues are out of order; put them in order in the caption editor first.';
			else if (!source) note = 'Change it in the caption editor.';
			else if (source.start < window.start || source.end > window.end) {
				note = 'It runs across the edge of the segment; change it in the caption editor.';
			}
			if (note || trackIndex === undefined) {
				return { ...base, trackIndex: null, fixes: [], note };
			}
			const fixes: CueFixOption[] = [];
			for (const fix of CUE_FIXES) {
				const after = fixedTrack(trackCues, window, trackIndex, fix, profile);
				if (after) {
					fixes.push({
						fix,
						label: describe(fix, index + 1, trackCues, after, trackIndex, window)
					});
				}
			}
			return {
				...base,
				trackIndex,
				fixes,
				note: fixes.length ? null : 'No one-step fix clears this; change it in the caption editor.'
			};
		});
}
