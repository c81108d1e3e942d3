/**
 * The caption shapes shared by the studio, the endpoints and the segment cutter. Times are seconds
 * as numbers; cue text keeps its WebVTT tags (<i>, <b>, <v Name>…) so nothing is lost on a round trip.
 */

/** WebVTT cue settings (W3C WebVTT "WebVTT cue settings"); an absent field means the default. */
export interface CueSettings {
	vertical?: 'rl' | 'lr';
	/** A number of lines (snapToLines) or a percentage of the video height. */
	line?: number;
	snapToLines?: boolean;
	lineAlign?: 'start' | 'center' | 'end';
	position?: number;
	positionAlign?: 'line-left' | 'center' | 'line-right';
	size?: number;
	align?: 'start' | 'center' | 'end' | 'left' | 'right';
	/** A region identifier declared in a REGION block of the same file. */
	region?: string;
}

export interface Cue {
	id: string;
	start: number;
	end: number;
	text: string;
	settings?: CueSettings;
}

/** HTML track kinds that Kinelume authors; metadata tracks are never shown, so we do not make them. */
export const TRACK_KINDS = ['captions', 'subtitles', 'chapters', 'descriptions'] as const;
export type TrackKind = (typeof TRACK_KINDS)[number];

export function isTrackKind(value: unknown): value is TrackKind {
	return TRACK_KINDS.includes(value as TrackKind);
}

/** The canonical form of a BCP 47 language tag ("en-gb" → "en-GB"), or null when it is not one. */
export function canonicalLanguage(tag: string): string | null {
	try {
		const [canonical] = Intl.getCanonicalLocales(tag.trim());
		return canonical ?? null;
	} catch {
		return null;
	}
}

/** The refusal of something typed as a language that is not a language tag, in words. */
export function notALanguageTag(typed: string): string {
	return `“${typed}” is not a language tag. Use a BCP 47 tag such as en, en-GB or cy.`;
}

export interface Track {
	kind: TrackKind;
	/** BCP 47 language tag, e.g. "en-GB". */
	language: string;
	label: string;
	cues: Cue[];
}

/** Something wrong in an imported file, located for the person who has to fix it (1-based). */
export interface CaptionProblem {
	line: number;
	column: number;
	message: string;
}
