import { stat } from 'node:fs/promises';
import type { ProbeResult } from '$lib/media/validate';
import { MediaError, runFfprobe } from './ffmpeg';

export type { ProbeResult } from '$lib/media/validate';
export { MediaError } from './ffmpeg';

/** ffprobe reads only headers and a few packets; a minute means the file is pathological. */
const PROBE_TIMEOUT_SECONDS = 60;

interface FfprobeStream {
	codec_type?: string;
	codec_name?: string;
	width?: number;
	height?: number;
	pix_fmt?: string;
	avg_frame_rate?: string;
	r_frame_rate?: string;
	sample_rate?: string;
	channels?: number;
	duration?: string;
	disposition?: { attached_pic?: number };
	tags?: Record<string, string>;
	side_data_list?: { side_data_type?: string; rotation?: number }[];
}

interface FfprobeOutput {
	format?: { format_name?: string; duration?: string; size?: string; bit_rate?: string };
	streams?: FfprobeStream[];
}

/**
 * What a local media file holds: container, duration, size, and its first video and audio
 * streams. Throws MediaError ('unreadable') when ffprobe cannot read it as media.
 */
export async function probeFile(
	path: string,
	options: { signal?: AbortSignal; timeoutSeconds?: number } = {}
): Promise<ProbeResult> {
	let output: FfprobeOutput;
	try {
		const { stdout } = await runFfprobe(
			['-print_format', 'json', '-show_format', '-show_streams', '-i', path],
			{ timeoutSeconds: PROBE_TIMEOUT_SECONDS, ...options }
		);
		output = JSON.parse(stdout) as FfprobeOutput;
	} catch (error) {
		if (error instanceof MediaError && error.kind !== 'failed') throw error;
		const detail = error instanceof MediaError ? error.detail : String(error);
		throw new MediaError('This file could not be read as a video.', 'unreadable', detail);
	}
	const format = output.format;
	if (!format?.format_name) {
		throw new MediaError('This file could not be read as a video.', 'unreadable', 'no format');
	}
	const streams = output.streams ?? [];
	// Cover art in MP4/MOV is a one-frame "video" stream; it is not the recording.
	const videoStream = streams.find(
		(s) => s.codec_type === 'video' && s.disposition?.attached_pic !== 1
	);
	const audioStream = streams.find((s) => s.codec_type === 'audio');

	const sizeBytes = numberOr(format.size, null) ?? (await stat(path)).size;
	const durationSeconds =
		numberOr(format.duration, null) ??
		numberOr(videoStream?.duration, null) ??
		numberOr(audioStream?.duration, 0);

	return {
		formatName: format.format_name,
		durationSeconds,
		sizeBytes,
		bitRate: numberOr(format.bit_rate, null),
		video: videoStream ? describeVideo(videoStream) : null,
		audio: audioStream
			? {
					codec: audioStream.codec_name ?? 'unknown',
					sampleRate: numberOr(audioStream.sample_rate, 0) ?? 0,
					channels: audioStream.channels ?? 0
				}
			: null
	};
}

function describeVideo(stream: FfprobeStream): NonNullable<ProbeResult['video']> {
	const width = stream.width ?? 0;
	const height = stream.height ?? 0;
	const rotation = rotationOf(stream);
	const quarterTurn = rotation === 90 || rotation === 270;
	const frameRate = rate(stream.avg_frame_rate) || rate(stream.r_frame_rate);
	return {
		codec: stream.codec_name ?? 'unknown',
		width,
		height,
		displayWidth: quarterTurn ? height : width,
		displayHeight: quarterTurn ? width : height,
		rotation,
		frameRate,
		pixelFormat: stream.pix_fmt ?? null
	};
}

/**
 * Clockwise display rotation, normalised to 0/90/180/270. Newer ffprobe reports only the
 * display matrix, whose `rotation` is counter-clockwise; older builds also give a `rotate` tag,
 * which is clockwise.
 */
function rotationOf(stream: FfprobeStream): number {
	const matrix = stream.side_data_list?.find(
		(d) => typeof d.rotation === 'number' && /display ?matrix/i.test(d.side_data_type ?? '')
	);
	let clockwise: number | null = null;
	if (matrix?.rotation !== undefined) clockwise = -matrix.rotation;
	else if (stream.tags?.rotate !== undefined) clockwise = Number(stream.tags.rotate);
	if (clockwise === null || !Number.isFinite(clockwise)) return 0;
	const quarter = Math.round(clockwise / 90) * 90;
	return ((quarter % 360) + 360) % 360;
}

function rate(value: string | undefined): number {
	if (!value) return 0;
	const [num, den] = value.split('/').map(Number);
	if (!Number.isFinite(num)) return 0;
	if (den === undefined) return num;
	return den > 0 ? num / den : 0;
}

function numberOr<T extends number | null>(value: string | undefined, fallback: T): number | T {
	if (value === undefined || value === 'N/A') return fallback;
	const parsed = Number(value);
	return Number.isFinite(parsed) ? parsed : fallback;
}
