import { apiError } from '../api';
import { exportTrack, type CaptionFormat } from '.';
import { callerTrack, matchesNoneMatch, REVALIDATE, versionParam } from './api';

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
	const headers = new Headers({
		ETag: file.etag,
		'Cache-Control': REVALIDATE,
		'Content-Type': TYPES[format]
	});
	// SRT is for taking elsewhere; WebVTT is what a <track> reads, so it stays inline.
	headers.set(
		'Content-Disposition',
		`${format === 'srt' ? 'attachment' : 'inline'}; filename="${file.filename}"`
	);
	if (matchesNoneMatch(request.headers.get('if-none-match'), file.etag)) {
		headers.delete('Content-Type');
		return new Response(null, { status: 304, headers });
	}
	return new Response(file.body, { status: 200, headers });
}
