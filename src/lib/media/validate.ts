/**
 * What Kinelume accepts as a recording, decided from the upload's declared name, type and size
 * and from what ffprobe found in the stored file. Pure, so the upload form can run the declared
 * checks before a single byte leaves the browser and the server can run all of them after.
 */

/** What ffprobe found in a file; produced by `probeFile` in $lib/server/media/probe. */
export interface ProbeResult {
	/** ffprobe's demuxer name, e.g. 'mov,mp4,m4a,3gp,3g2,mj2' or 'matroska,webm'. */
	formatName: string;
	durationSeconds: number;
	sizeBytes: number;
	bitRate: number | null;
	video: {
		codec: string;
		/** Coded size, before rotation. */
		width: number;
		height: number;
		/** Size as shown, after rotation. */
		displayWidth: number;
		displayHeight: number;
		/** Clockwise degrees to turn the coded picture for display: 0, 90, 180 or 270. */
		rotation: number;
		frameRate: number;
		pixelFormat: string | null;
	} | null;
	audio: { codec: string; sampleRate: number; channels: number } | null;
}

/** What the browser said about the file when the upload started. */
export interface DeclaredUpload {
	filename: string;
	contentType: string;
	sizeBytes: number;
}

export const MAX_UPLOAD_BYTES = 2 * 1024 ** 3;
export const MAX_DURATION_SECONDS = 60 * 60;

const MP4_FAMILY = 'mov,mp4,m4a,3gp,3g2,mj2';
const WEBM_FAMILY = 'matroska,webm';

/** Declared types we take, each with the ffprobe format its file must turn out to be. */
export const ALLOWED_TYPES: Readonly<Record<string, string>> = {
	'video/mp4': MP4_FAMILY,
	'video/quicktime': MP4_FAMILY,
	'video/x-m4v': MP4_FAMILY,
	'video/webm': WEBM_FAMILY
};

export const ALLOWED_EXTENSIONS: Readonly<Record<string, string>> = {
	'.mp4': MP4_FAMILY,
	'.mov': MP4_FAMILY,
	'.m4v': MP4_FAMILY,
	'.webm': WEBM_FAMILY
};

const ACCEPTED = 'MP4, MOV, M4V or WebM';

function extensionOf(filename: string): string {
	const dot = filename.lastIndexOf('.');
	return dot < 0 ? '' : filename.slice(dot).toLowerCase();
}

function mediaTypeOf(contentType: string): string {
	return contentType.split(';')[0].trim().toLowerCase();
}

function formatSize(bytes: number): string {
	return bytes >= 1024 ** 2 ? `${(bytes / 1024 ** 2).toFixed(1)} MB` : `${bytes} bytes`;
}

/**
 * A sentence saying why the declared upload cannot be a recording, or null. Needs no file, so
 * the upload form runs it first.
 */
export function declaredUploadProblem(declared: DeclaredUpload): string | null {
	const extension = extensionOf(declared.filename);
	const extensionFormat = ALLOWED_EXTENSIONS[extension];
	if (!extensionFormat) {
		return `“${declared.filename}” is not a video file we can take. Please choose an ${ACCEPTED} file.`;
	}
	const typeFormat = ALLOWED_TYPES[mediaTypeOf(declared.contentType)];
	if (!typeFormat) {
		return `“${declared.filename}” was sent as ${declared.contentType || 'an unknown type'}, which is not a video type we can take. Please choose an ${ACCEPTED} file.`;
	}
	if (typeFormat !== extensionFormat) {
		return `“${declared.filename}” was sent as ${declared.contentType}, which does not match its name. Please rename the file or export it again.`;
	}
	if (!Number.isInteger(declared.sizeBytes) || declared.sizeBytes <= 0) {
		return `“${declared.filename}” is empty.`;
	}
	if (declared.sizeBytes > MAX_UPLOAD_BYTES) {
		return `“${declared.filename}” is ${formatSize(declared.sizeBytes)}; recordings can be at most 2 GB. Please trim or compress it first.`;
	}
	return null;
}

/**
 * A sentence saying why a stored upload is refused, or null when it is a recording we can process.
 * `probe` is null when ffprobe could not read the file at all.
 */
export function refusalReason(probe: ProbeResult | null, declared: DeclaredUpload): string | null {
	const declaredProblem = declaredUploadProblem(declared);
	if (declaredProblem) return declaredProblem;
	const name = `“${declared.filename}”`;
	if (probe === null) {
		return `We could not read ${name} as a video. It may be damaged, incomplete or not a video file. Please export it again and upload the new file.`;
	}
	// A short or long file is an interrupted or mixed-up upload; say so before any reading error.
	if (probe.sizeBytes !== declared.sizeBytes) {
		return `${name} arrived as ${formatSize(probe.sizeBytes)} but should be ${formatSize(declared.sizeBytes)}, so the upload did not finish properly. Please upload it again.`;
	}
	const expectedFormat = ALLOWED_EXTENSIONS[extensionOf(declared.filename)];
	if (probe.formatName !== expectedFormat) {
		return `${name} is named like ${expectedFormat === WEBM_FAMILY ? 'a WebM' : 'an MP4 or MOV'} file but its contents are something else. Please export it again as ${ACCEPTED}.`;
	}
	if (probe.video === null) {
		return `${name} has no picture (no video track). Please upload a recording with video.`;
	}
	if (!(probe.durationSeconds > 0)) {
		return `${name} has no length (its duration is zero). Please record or export it again.`;
	}
	if (probe.durationSeconds > MAX_DURATION_SECONDS) {
		const minutes = Math.round(probe.durationSeconds / 60);
		return `${name} is about ${minutes} minutes long; recordings can be at most 60 minutes. Please trim it or split it into parts.`;
	}
	return null;
}
