import { formatLength } from '../format/lengths';
import { ALLOWED_EXTENSIONS, declaredUploadProblem } from '../media/validate';

/** The content type each accepted extension is stored under when the browser names none. */
const TYPE_BY_EXTENSION: Record<string, string> = {
	'.mp4': 'video/mp4',
	'.m4v': 'video/x-m4v',
	'.mov': 'video/quicktime',
	'.webm': 'video/webm'
};

export const ACCEPT_ATTRIBUTE = [
	...Object.keys(ALLOWED_EXTENSIONS),
	...new Set(Object.values(TYPE_BY_EXTENSION))
].join(',');

/**
 * The content type to store a file under, or a sentence saying why it is not accepted. Browsers
 * often report an empty or generic type for .mov and .m4v, so the extension decides then.
 */
export function uploadType(
	filename: string,
	declaredType: string,
	sizeBytes: number
): { contentType: string } | { refusal: string } {
	const dot = filename.lastIndexOf('.');
	const ext = dot < 0 ? '' : filename.slice(dot).toLowerCase();
	const type = declaredType.split(';')[0].trim().toLowerCase();
	const contentType =
		type === '' || type === 'application/octet-stream' ? (TYPE_BY_EXTENSION[ext] ?? type) : type;
	const refusal = declaredUploadProblem({ filename, contentType, sizeBytes });
	return refusal ? { refusal } : { contentType };
}

/** A title from a file name: without its extension, underscores and dashes read as spaces. */
/** The most characters a recording's title keeps. */
export const MAX_RECORDING_TITLE = 120;

/**
 * A title as a clinician renames a recording: trimmed, runs of spaces as one, no control
 * characters (it is written into page titles, e-mails and file names), 1–120 characters.
 */
export function parseRecordingTitle(
	text: string
): { ok: true; title: string } | { ok: false; message: string } {
	const title = text.replace(/\s+/g, ' ').trim();
	if (title === '') return { ok: false, message: 'Give the recording a title.' };
	// eslint-disable-next-line no-control-regex
	if (/[\u0000-\u001f\u007f-\u009f]/.test(title)) {
		return { ok: false, message: 'A title cannot hold control characters.' };
	}
	if (title.length > MAX_RECORDING_TITLE) {
		return { ok: false, message: `Keep the title to ${MAX_RECORDING_TITLE} characters.` };
	}
	return { ok: true, title };
}

export function titleFromFilename(filename: string): string {
	const base = filename
		.replace(/\.[^.]+$/, '')
		.replace(/[_-]+/g, ' ')
		.trim();
	return (base || 'Untitled recording').slice(0, MAX_RECORDING_TITLE);
}

/** A recording's length, written as every length is (format/lengths): "2 min 39 s". */
export const formatDuration = formatLength;

/** "12.3 MB" style sizes (decimal units, as file managers show). */
export function formatBytes(bytes: number | null | undefined): string {
	if (bytes === null || bytes === undefined || !Number.isFinite(bytes)) return '—';
	const units = ['bytes', 'kB', 'MB', 'GB'];
	let value = bytes;
	let unit = 0;
	while (value >= 1000 && unit < units.length - 1) {
		value /= 1000;
		unit++;
	}
	return unit === 0 ? `${value} bytes` : `${value.toFixed(value < 10 ? 1 : 0)} ${units[unit]}`;
}
