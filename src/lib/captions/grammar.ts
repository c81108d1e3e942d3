/**
 * What a WebVTT file can hold in each field Kinelume writes, from the W3C WebVTT specification
 * (§4.1 "WebVTT file structure": cue identifiers, cue settings, cue payload; §4.3 region
 * settings). The save schema (schema.ts) accepts only what these allow and the writer (vtt.ts)
 * refuses anything else, so no stored field can break out of its place in the file — a newline
 * in a setting would otherwise start a new, unseen cue.
 */

/**
 * §4.1 "WebVTT cue identifier": one or more characters, none a line terminator, not containing
 * "-->". We also refuse other control characters, which no editor means to type.
 */
export function isCueIdentifier(value: string): boolean {
	return value.length > 0 && !value.includes('-->') && !CONTROL.test(value);
}

/**
 * §4.3 "WebVTT region identifier": one or more characters, no ASCII whitespace, not containing
 * "-->" (and so, here, no control characters either).
 */
export function isRegionIdentifier(value: string): boolean {
	return value.length > 0 && !value.includes('-->') && !/\s/.test(value) && !CONTROL.test(value);
}

// eslint-disable-next-line no-control-regex -- control characters are what is being refused
const CONTROL = /[\u0000-\u001f\u007f]/;

/**
 * §4.1 "WebVTT cue text": lines of text, none empty (an empty line ends the cue) and none
 * containing "-->" (it would be read as a timing line). Line breaks other than LF are folded to
 * LF by the parser, so they are refused here rather than changed silently on the way out.
 */
export function cueTextProblem(text: string): string | null {
	if (text.includes('-->'))
		return 'cue words cannot contain “-->”, which a caption file reads as a new timing line; use an arrow such as → instead';
	if (/\r/.test(text)) return 'cue words hold a carriage return; use ordinary line breaks';
	// eslint-disable-next-line no-control-regex -- tab (\u0009) and line feed (\u000a) are allowed
	if (/[\u0000-\u0008\u000b-\u001f\u007f]/.test(text))
		return 'cue words hold an invisible control character';
	if (text.split('\n').some((line, i, lines) => line.trim() === '' && lines.length > 1))
		return 'cue words hold an empty line, which would end the cue early';
	return null;
}

/** Text as the editor may send it, made writable: CRLF to LF, blank lines and trailing breaks dropped. */
export function tidyCueText(text: string): string {
	return text
		.replace(/\r\n?/g, '\n')
		.split('\n')
		.filter((line) => line.trim() !== '')
		.join('\n');
}

/** The largest time a cue may carry: 99:59:59.999, the widest a two-digit hours field shows. */
export const MAX_CUE_SECONDS = 100 * 3600 - 0.001;
