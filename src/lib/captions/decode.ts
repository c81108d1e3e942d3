/**
 * Turns an uploaded caption file's bytes into text, refusing what is not a UTF-8 text file before
 * any parser sees it: WebVTT is UTF-8 by definition (W3C WebVTT), and SRT files exported by
 * today's tools are too. A wrong guess at another encoding would garble every accented letter.
 */

export type DecodeResult = { ok: true; text: string } | { ok: false; message: string };

// A caption file is short lines of words; a few stray control characters can come from a copy and
// paste, but a high share means the file is not text at all (common practice, no published limit).
const MAX_CONTROL_SHARE = 0.01;

/** C0 controls other than tab, line feed, form feed and carriage return, and DEL. */
function countControls(text: string): number {
	let count = 0;
	for (let i = 0; i < text.length; i++) {
		const c = text.charCodeAt(i);
		if ((c < 0x20 && c !== 0x09 && c !== 0x0a && c !== 0x0c && c !== 0x0d) || c === 0x7f) count++;
	}
	return count;
}

/** Decodes UTF-8 (BOM stripped) or says in plain words why the file cannot be read. */
export function decodeCaptionFile(bytes: Uint8Array): DecodeResult {
	if (bytes.length === 0) return { ok: false, message: 'The file is empty.' };
	const utf16 =
		(bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff);
	if (utf16) {
		return {
			ok: false,
			message: 'This file is saved as UTF-16. Save it again as UTF-8 and import it again.'
		};
	}
	if (bytes.includes(0)) {
		return {
			ok: false,
			message:
				'This is not a text file (it contains NUL bytes). Caption files are plain text: choose a .vtt or .srt file.'
		};
	}
	let text: string;
	try {
		// ignoreBOM: false makes the decoder drop a leading UTF-8 byte order mark.
		text = new TextDecoder('utf-8', { fatal: true, ignoreBOM: false }).decode(bytes);
	} catch {
		return {
			ok: false,
			message:
				'This file is not in UTF-8. Save it again as UTF-8 (most editors offer this under "Save as" or "Encoding") and import it again.'
		};
	}
	const controls = countControls(text);
	if (controls > 0 && controls / text.length > MAX_CONTROL_SHARE) {
		return {
			ok: false,
			message:
				'This does not look like a caption file: it is full of control characters, as binary files are.'
		};
	}
	return { ok: true, text };
}
