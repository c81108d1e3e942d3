import { apiError } from '../api';
import { exportTrack, type CaptionFormat } from '.';
import { callerTrack, matchesNoneMatch, REVALIDATE, versionParam } from './api';
import { exportCache } from './export-cache';

const TYPES: Record<CaptionFormat, string> = {
	vtt: 'text/vtt; charset=utf-8',
	srt: 'application/x-subrip; charset=utf-8'
};

/**
 * Answers a GET for a track's file. The tag names the version, which never changes, so a player
 * revalidating on every page load gets a 304 until someone saves a new version.
 */
export function serveTrackFile(
	id: string,
	url: URL,
	request: Request,
	format: CaptionFormat
): Response {
	const found = callerTrack(id);
	if (found instanceof Response) return found;
	const version = versionParam(url);
	if (version instanceof Response) return version;
	const file = exportTrack(found.track, format, version);
	if (!file) return apiError(404, `There is no version ${version} of this track.`);
	return serveCaptionFile(request, { ...file, format });
}

// The encoded bytes of files recently served, by their strong tag (which names one content for
// good). Encoding a long track to UTF-8 on every request was a good part of each answer's cost.
const encodedFiles = exportCache<Uint8Array<ArrayBuffer>>(16 * 1024 * 1024);
const utf8 = new TextEncoder();

/**
 * Answers with a caption file that a strong `etag` names (never changing for that tag): the right
 * type, revalidation on every use, inline for WebVTT (a `<track>` reads it) and a download for
 * SRT, and 304 when the caller already holds it. The body may be given as a function, so a 304 or
 * a file already encoded never writes it again. Segment captions and chapters use it too.
 */
export function serveCaptionFile(
	request: Request,
	file: { body: string | (() => string); etag: string; filename: string; format: CaptionFormat }
): Response {
	const headers = new Headers({
		ETag: file.etag,
		'Cache-Control': REVALIDATE,
		'Content-Type': TYPES[file.format]
	});
	headers.set(
		'Content-Disposition',
		`${file.format === 'srt' ? 'attachment' : 'inline'}; filename="${file.filename}"`
	);
	if (matchesNoneMatch(request.headers.get('if-none-match'), file.etag)) {
		headers.delete('Content-Type');
		return new Response(null, { status: 304, headers });
	}
	let bytes = encodedFiles.get(file.etag);
	if (!bytes) {
		bytes = utf8.encode(typeof file.body === 'function' ? file.body() : file.body);
		encodedFiles.set(file.etag, bytes);
	}
	return new Response(bytes, { status: 200, headers });
}
