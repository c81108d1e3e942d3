/**
 * Caption tracks and their versions. A track's cues are never edited in place: every save, import
 * and restore inserts a new version, and a save made against an older version than the current one
 * is refused with both sets of cues, so the person saving can merge rather than lose work.
 */
import { createHash } from 'node:crypto';
import { and, asc, desc, eq, sql } from 'drizzle-orm';
import { decodeCaptionFile } from '$lib/captions/decode';
import { parseSrt, serializeSrt } from '$lib/captions/srt';
import { plainText } from '$lib/captions/text';
import {
	canonicalLanguage,
	notALanguageTag,
	type CaptionProblem,
	type Cue,
	type TrackKind
} from '$lib/captions/types';
import { cueProblemSentence, cuesSchema, MAX_CUES } from '$lib/captions/schema';
import { cuesAsServed, parseVtt, serializeVtt } from '$lib/captions/vtt';
import { db, prepared } from '../db';
import { exportCache } from './export-cache';
import {
	captionTracks,
	captionTrackVersions,
	type CaptionTrack,
	type CaptionTrackVersion,
	type Recording,
	type VersionSource
} from '../db/schema';

export type { CaptionTrack, CaptionTrackVersion, VersionSource };

/** A refusal the caller can show as it is; `status` is the HTTP status an endpoint answers. */
export class CaptionError extends Error {
	constructor(
		readonly status: number,
		message: string
	) {
		super(message);
	}
}

/**
 * Caption files are small (an hour of speech is about 100 KB); this refuses a mistaken video or
 * archive before decoding it, and stays under adapter-node's default 512 KB request body limit.
 */
export const MAX_IMPORT_BYTES = 400 * 1024;

export { cueSchema, cuesSchema, MAX_CUES } from '$lib/captions/schema';

export interface TrackSummary {
	id: string;
	recordingId: string;
	kind: TrackKind;
	language: string;
	label: string;
	currentVersion: number;
	cueCount: number;
	updatedAt: string;
}

export interface VersionSummary {
	version: number;
	source: VersionSource;
	note: string;
	cueCount: number;
	createdBy: string | null;
	createdAt: string;
}

export interface Conflict {
	/** The version the caller started from. */
	baseVersion: number;
	/** What the caller tried to save, untouched. */
	yours: Cue[];
	/** The newer version someone else saved meanwhile. */
	current: { version: number; cues: Cue[]; note: string; createdAt: string };
}

export type SaveResult = { ok: true; version: number } | { ok: false; conflict: Conflict };

// Written out because drizzle leaves columns unqualified in a one-table select, which would make
// the subquery compare its own columns.
const cueCount = sql<number>`coalesce((select json_array_length(v.cues) from caption_track_version v where v.track_id = caption_track.id and v.version = caption_track.current_version), 0)`;

function summary(track: CaptionTrack, cues: number): TrackSummary {
	return {
		id: track.id,
		recordingId: track.recordingId,
		kind: track.kind,
		language: track.language,
		label: track.label,
		currentVersion: track.currentVersion,
		cueCount: cues,
		updatedAt: track.updatedAt.toISOString()
	};
}

/** The recording's tracks, captions first, then by language. */
export function listTracks(clinicId: string, recordingId: string): TrackSummary[] {
	return db()
		.select({ track: captionTracks, cues: cueCount })
		.from(captionTracks)
		.where(and(eq(captionTracks.clinicId, clinicId), eq(captionTracks.recordingId, recordingId)))
		.orderBy(asc(captionTracks.kind), asc(captionTracks.language), asc(captionTracks.createdAt))
		.all()
		.map((row) => summary(row.track, row.cues));
}

/** A track of the clinic, or null (also for another clinic's id). */
export function findTrack(clinicId: string, trackId: string): CaptionTrack | null {
	return trackOfClinic().get({ trackId, clinicId }) ?? null;
}

// Every caption file request starts here.
const trackOfClinic = prepared((store) =>
	store
		.select()
		.from(captionTracks)
		.where(
			and(
				eq(captionTracks.id, sql.placeholder('trackId')),
				eq(captionTracks.clinicId, sql.placeholder('clinicId'))
			)
		)
		.prepare()
);

export function trackSummary(track: CaptionTrack): TrackSummary {
	return summary(track, getVersion(track)?.cues.length ?? 0);
}

/** Makes an empty track (version 0). Refuses a tag that is not BCP 47 and a second track of one kind and language. */
export function createTrack(
	recording: Recording,
	input: { kind: TrackKind; language: string; label?: string }
): CaptionTrack {
	const language = canonicalLanguage(input.language);
	if (!language) {
		throw new CaptionError(422, notALanguageTag(input.language));
	}
	const existing = db()
		.select({ id: captionTracks.id })
		.from(captionTracks)
		.where(
			and(
				eq(captionTracks.recordingId, recording.id),
				eq(captionTracks.kind, input.kind),
				eq(captionTracks.language, language)
			)
		)
		.get();
	if (existing) {
		throw new CaptionError(
			409,
			`This recording already has a ${input.kind} track in ${language}. Import into that one instead.`
		);
	}
	const label = input.label?.trim() || defaultLabel(input.kind, language);
	try {
		return db()
			.insert(captionTracks)
			.values({
				recordingId: recording.id,
				clinicId: recording.clinicId,
				kind: input.kind,
				language,
				label
			})
			.returning()
			.get();
	} catch (problem) {
		// Two people making the same track at once: the unique index decides, the second is told.
		if ((problem as { code?: string }).code === 'SQLITE_CONSTRAINT_UNIQUE') {
			throw new CaptionError(
				409,
				`This recording already has a ${input.kind} track in ${language}.`
			);
		}
		throw problem;
	}
}

/** "English (United Kingdom)" for en-GB; the tag itself when the runtime has no name for it. */
export function defaultLabel(kind: TrackKind, language: string): string {
	let name = language;
	try {
		name = new Intl.DisplayNames(['en'], { type: 'language' }).of(language) ?? language;
	} catch {
		// An unusual tag without a display name keeps its code.
	}
	return kind === 'captions' || kind === 'subtitles' ? name : `${name} ${kind}`;
}

/** One version of the track (the current one when `version` is left out); null for version 0 or a missing one. */
export function getVersion(track: CaptionTrack, version?: number): CaptionTrackVersion | null {
	const wanted = version ?? track.currentVersion;
	if (wanted < 1) return null;
	return (
		db()
			.select()
			.from(captionTrackVersions)
			.where(
				and(eq(captionTrackVersions.trackId, track.id), eq(captionTrackVersions.version, wanted))
			)
			.get() ?? null
	);
}

/** Every version of the track, newest first, without their cues. */
export function listVersions(track: CaptionTrack): VersionSummary[] {
	return db()
		.select({
			version: captionTrackVersions.version,
			source: captionTrackVersions.source,
			note: captionTrackVersions.note,
			cueCount: sql<number>`json_array_length(${captionTrackVersions.cues})`,
			createdBy: captionTrackVersions.createdBy,
			createdAt: captionTrackVersions.createdAt
		})
		.from(captionTrackVersions)
		.where(eq(captionTrackVersions.trackId, track.id))
		.orderBy(desc(captionTrackVersions.version))
		.all()
		.map((v) => ({ ...v, createdAt: v.createdAt.toISOString() }));
}

/**
 * Saves `cues` as the next version, but only if the track is still at `baseVersion`; otherwise
 * nothing is written and the conflict carries both sets of cues. The check and the write share
 * one immediate transaction, so two saves from the same base can never both succeed.
 */
export function saveVersion(
	track: CaptionTrack,
	input: {
		baseVersion: number;
		cues: Cue[];
		note?: string;
		source?: VersionSource;
		userId?: string | null;
	}
): SaveResult {
	// The one gate for every stored cue list (save, import, restore): what passes is what a
	// WebVTT file can hold unchanged (src/lib/captions/schema.ts).
	const checked = cuesSchema.safeParse(input.cues);
	if (!checked.success) throw new CaptionError(422, cueProblemSentence(checked.error));
	const cues = checked.data;
	return db().transaction(
		(tx): SaveResult => {
			const now = tx
				.select({ currentVersion: captionTracks.currentVersion })
				.from(captionTracks)
				.where(eq(captionTracks.id, track.id))
				.get();
			if (!now) throw new CaptionError(404, 'Not found.');
			if (now.currentVersion !== input.baseVersion) {
				const current = tx
					.select()
					.from(captionTrackVersions)
					.where(
						and(
							eq(captionTrackVersions.trackId, track.id),
							eq(captionTrackVersions.version, now.currentVersion)
						)
					)
					.get();
				return {
					ok: false,
					conflict: {
						baseVersion: input.baseVersion,
						yours: input.cues,
						current: {
							version: now.currentVersion,
							cues: current?.cues ?? [],
							note: current?.note ?? '',
							createdAt: (current?.createdAt ?? new Date()).toISOString()
						}
					}
				};
			}
			const version = now.currentVersion + 1;
			tx.insert(captionTrackVersions)
				.values({
					trackId: track.id,
					version,
					cues,
					source: input.source ?? 'edit',
					note: input.note?.trim().slice(0, 500) ?? '',
					createdBy: input.userId ?? null
				})
				.run();
			tx.update(captionTracks)
				.set({ currentVersion: version, updatedAt: new Date() })
				.where(eq(captionTracks.id, track.id))
				.run();
			return { ok: true, version };
		},
		{ behavior: 'immediate' }
	);
}

/** Makes a new version with the cues of an older one; the older one stays as it was. */
export function restoreVersion(
	track: CaptionTrack,
	input: { version: number; baseVersion?: number; userId?: string | null }
): SaveResult {
	const old = getVersion(track, input.version);
	if (!old) throw new CaptionError(404, `There is no version ${input.version} of this track.`);
	return saveVersion(track, {
		baseVersion: input.baseVersion ?? currentVersionOf(track.id),
		cues: old.cues,
		note: `Restored version ${old.version}`,
		source: 'restore',
		userId: input.userId
	});
}

function currentVersionOf(trackId: string): number {
	return (
		db()
			.select({ v: captionTracks.currentVersion })
			.from(captionTracks)
			.where(eq(captionTracks.id, trackId))
			.get()?.v ?? 0
	);
}

export type CaptionFormat = 'vtt' | 'srt';

export type ReadResult =
	| { ok: true; format: CaptionFormat; cues: Cue[]; warnings: CaptionProblem[] }
	| { ok: false; message: string; errors: CaptionProblem[] };

/**
 * Reads an uploaded caption file: UTF-8 only (a BOM is fine), WebVTT or SRT chosen by the file
 * name. Every problem comes back with its line and column; nothing is stored.
 */
export function readCaptionFile(bytes: Uint8Array, filename: string): ReadResult {
	const extension = /\.([a-z0-9]+)$/i.exec(filename.trim())?.[1]?.toLowerCase();
	if (extension !== 'vtt' && extension !== 'srt') {
		return {
			ok: false,
			message: `“${filename}” is not a caption file Kinelume reads. Choose a WebVTT (.vtt) or SRT (.srt) file.`,
			errors: []
		};
	}
	if (bytes.length > MAX_IMPORT_BYTES) {
		return {
			ok: false,
			message:
				'This file is larger than 400 KB, far more than any caption file; check it is the right one.',
			errors: []
		};
	}
	const decoded = decodeCaptionFile(bytes);
	if (!decoded.ok) return { ok: false, message: decoded.message, errors: [] };
	const parsed = extension === 'vtt' ? parseVtt(decoded.text) : parseSrt(decoded.text);
	if (!parsed.ok) {
		const n = parsed.errors.length;
		return {
			ok: false,
			message: `The file was not imported: ${n} ${n === 1 ? 'problem needs' : 'problems need'} fixing first.`,
			errors: parsed.errors
		};
	}
	if (parsed.cues.length === 0) {
		return {
			ok: false,
			message: 'The file holds no cues, so there was nothing to import.',
			errors: []
		};
	}
	if (parsed.cues.length > MAX_CUES) {
		return {
			ok: false,
			message: `The file holds ${parsed.cues.length} cues; a track can hold at most ${MAX_CUES}.`,
			errors: []
		};
	}
	// The file parsed, but a field in it may still be one a served file could not hold as it is
	// (a 600-character cue name, say): refused here, with the cue, rather than at a later save.
	const checked = cuesSchema.safeParse(parsed.cues);
	if (!checked.success) {
		return {
			ok: false,
			message: `The file was not imported. ${cueProblemSentence(checked.error)}`,
			errors: []
		};
	}
	return { ok: true, format: extension, cues: checked.data, warnings: parsed.warnings };
}

export type ImportResult =
	| { ok: true; version: number; cueCount: number; warnings: CaptionProblem[] }
	| { ok: false; message: string; errors: CaptionProblem[] }
	| { ok: false; conflict: Conflict };

/**
 * Imports a file as the track's next version. A refused file writes nothing. Without a
 * `baseVersion` the import goes on top of whatever is current, since choosing a file is itself
 * the decision to replace the cues.
 */
export function importFile(
	track: CaptionTrack,
	bytes: Uint8Array,
	filename: string,
	options: { userId?: string | null; baseVersion?: number } = {}
): ImportResult {
	const read = readCaptionFile(bytes, filename);
	if (!read.ok) return read;
	const saved = saveVersion(track, {
		baseVersion: options.baseVersion ?? currentVersionOf(track.id),
		cues: read.cues,
		note: `Imported ${filename.slice(0, 200)}`,
		source: 'import',
		userId: options.userId
	});
	if (!saved.ok) return saved;
	return { ok: true, version: saved.version, cueCount: read.cues.length, warnings: read.warnings };
}

export interface Exported {
	body: string;
	version: number;
	etag: string;
	filename: string;
}

/** Strong validator for one rendering of one version; a version never changes, so neither does its tag. */
export function exportTag(trackId: string, version: number, format: string): string {
	const hash = createHash('sha256').update(`${trackId}\n${version}\n${format}`).digest('base64url');
	return `"${hash.slice(0, 32)}"`;
}

function fileStem(track: CaptionTrack): string {
	return `${track.kind}-${track.language}`.replace(/[^A-Za-z0-9-]/g, '');
}

/**
 * Files already written, by track, version and format: a `<track>` revalidates on every page
 * load, and a version never changes once saved. About 50 long (2,000-cue) tracks fit.
 */
const exportedFiles = exportCache(8 * 1024 * 1024);

/** The track (or one version of it) as WebVTT or SRT; version 0 exports an empty file. */
export function exportTrack(
	track: CaptionTrack,
	format: CaptionFormat,
	version?: number
): Exported | null {
	const wanted = version ?? track.currentVersion;
	const key = `${track.id}\n${wanted}\n${format}`;
	let body = exportedFiles.get(key);
	if (body === undefined) {
		const row = getVersion(track, wanted);
		if (wanted > 0 && !row) return null;
		const cues = row?.cues ?? [];
		body = format === 'vtt' ? serializeVtt(cues) : serializeSrt(cues);
		// Only a stored version: version 0 is the empty file and costs nothing to write.
		if (row) exportedFiles.set(key, body);
	}
	return {
		body,
		version: wanted,
		etag: exportTag(track.id, wanted, format),
		filename: `${fileStem(track)}-v${wanted}.${format}`
	};
}

export interface TranscriptLine {
	id: string;
	start: number;
	end: number;
	/** The cue text with its WebVTT tags. */
	text: string;
	/** The same words without tags, for reading and searching. */
	plain: string;
}

export interface Transcript {
	trackId: string;
	kind: TrackKind;
	language: string;
	version: number;
	lines: TranscriptLine[];
}

export function transcript(track: CaptionTrack, version?: number): Transcript | null {
	const wanted = version ?? track.currentVersion;
	const row = getVersion(track, wanted);
	if (wanted > 0 && !row) return null;
	return {
		trackId: track.id,
		kind: track.kind,
		language: track.language,
		version: wanted,
		// The lines a browser reads from the served file, so the transcript says what the captions say.
		lines: cuesAsServed(row?.cues ?? []).map((cue) => ({
			id: cue.id,
			start: cue.start,
			end: cue.end,
			text: cue.text,
			plain: plainText(cue.text)
		}))
	};
}

/** The first captions track of a recording, for the player's default `<track>`. */
export function firstCaptionsTrack(clinicId: string, recordingId: string): CaptionTrack | null {
	return (
		db()
			.select()
			.from(captionTracks)
			.where(
				and(
					eq(captionTracks.clinicId, clinicId),
					eq(captionTracks.recordingId, recordingId),
					eq(captionTracks.kind, 'captions')
				)
			)
			.orderBy(asc(captionTracks.createdAt))
			.limit(1)
			.get() ?? null
	);
}

/**
 * Imports a caption file straight into a recording's captions track in `language`, making the
 * track when there is none. The file is read first, so a refused file makes no empty track.
 */
export function importIntoCaptions(
	recording: Recording,
	input: { language: string; bytes: Uint8Array; filename: string; userId?: string | null }
): ImportResult & { trackId?: string } {
	const read = readCaptionFile(input.bytes, input.filename);
	if (!read.ok) return read;
	const language = canonicalLanguage(input.language);
	if (!language) {
		throw new CaptionError(422, notALanguageTag(input.language));
	}
	const existing = db()
		.select()
		.from(captionTracks)
		.where(
			and(
				eq(captionTracks.recordingId, recording.id),
				eq(captionTracks.clinicId, recording.clinicId),
				eq(captionTracks.kind, 'captions'),
				eq(captionTracks.language, language)
			)
		)
		.get();
	const track = existing ?? createTrack(recording, { kind: 'captions', language });
	const result = importFile(track, input.bytes, input.filename, { userId: input.userId });
	return result.ok ? { ...result, trackId: track.id } : result;
}
