/**
 * A recording's segments: one exercise each, suggested from its captions, sound and picture,
 * confirmed by a clinician, then cut to its own clip by a job. Confirmed segments never change:
 * confirming again supersedes them (the rows stay, so exercises built on them keep working).
 *
 * No request-bound imports here: the stand-alone worker process loads this module through the
 * cut-segment job. Endpoint access checks live in access.ts.
 */
import { LRUCache } from 'lru-cache';
import { configuredWordLists } from './word-lists';
import { createHash } from 'node:crypto';
import { and, asc, desc, eq, inArray, isNotNull, isNull, notExists } from 'drizzle-orm';
import { chaptersFromSegments, shiftAndClip } from '$lib/captions/segment';
import { suggestBoundaries, type Suggestion } from '$lib/captions/suggest';
import { plainText } from '$lib/captions/text';
import type { Cue } from '$lib/captions/types';
import { serializeVtt } from '$lib/captions/vtt';
import { planProblems, type PlannedSegment } from '$lib/segments/plan';
import type { StoredVersion } from '$lib/media/ladder';
import { createTrack, firstCaptionsTrack, getVersion, saveVersion } from '../captions';
import { db } from '../db';
import {
	captionTracks,
	exercises,
	jobs,
	librarySubmissions,
	programmeItems,
	programmes,
	recordings,
	segments,
	type CaptionTrack,
	type Job,
	type Recording,
	type SegmentRow,
	type SegmentStatus
} from '../db/schema';
import * as queue from '../jobs/queue';
import { recordingKeys } from '../storage/keys';
import { deleteObject, deletePrefix } from '../storage';
import { detectionState, forgetSignals } from './detection';
import { DEFAULT_MIN_SILENCE_SECONDS } from './suggest';

export type { SegmentRow, SegmentStatus };

/** A refusal the caller can show as it is; `status` is the HTTP status an endpoint answers. */
export class SegmentError extends Error {
	constructor(
		readonly status: number,
		message: string,
		readonly problems: string[] = []
	) {
		super(message);
	}
}

/** Attempts a cut gets before its segment is marked failed. */
export const CUT_ATTEMPTS = 3;

// ---------------------------------------------------------------------------------------------
// Suggestions

export interface SuggestionsReady {
	state: 'ready';
	recordingId: string;
	durationSeconds: number;
	/** The captions the suggestions read: track version, or 0 when the recording has none. */
	captionsVersion: number;
	suggestions: Suggestion[];
	/** Set when the sound and picture could not be read and only the captions were used. */
	note: string | null;
}

export type SuggestionsAnswer = SuggestionsReady | { state: 'working'; recordingId: string };

/** The recording's current captions: its first captions track and that track's newest cues. */
export function currentCaptions(recording: Recording): {
	track: CaptionTrack | null;
	version: number;
	cues: Cue[];
	language: string;
} {
	const track = firstCaptionsTrack(recording.clinicId, recording.id);
	const row = track ? getVersion(track) : null;
	return {
		track,
		version: row?.version ?? 0,
		cues: row?.cues ?? [],
		language: track?.language ?? 'en'
	};
}

/**
 * Suggested boundaries for a ready recording, from its current captions and its rendition's
 * sound and picture. Never measures anything itself: the detectors run as a `detect-signals`
 * job (detection.ts), queued here when their result is missing. Waits up to `waitMs` for that
 * result, reading the database; if it is not there by then, answers `working` and the caller
 * asks again (the job carries on).
 */
export async function suggestionsFor(
	recording: Recording,
	{ waitMs = 20_000, pollMs = 250 }: { waitMs?: number; pollMs?: number } = {}
): Promise<SuggestionsAnswer> {
	if (recording.status !== 'ready') {
		throw new SegmentError(409, 'The recording is not ready yet; suggestions follow once it is.');
	}
	const until = Date.now() + waitMs;
	let detection = detectionState(recording);
	while (detection.state === 'working') {
		const left = until - Date.now();
		if (left <= 0) return { state: 'working', recordingId: recording.id };
		await new Promise((resolve) => setTimeout(resolve, Math.min(pollMs, left)));
		detection = detectionState(recording);
	}
	const signals = detection.state === 'ready' ? detection.signals : null;
	// Read after the wait: captions saved meanwhile are the ones to suggest from.
	const captions = currentCaptions(recording);
	const words = { language: captions.language, wordLists: configuredWordLists() };
	const input = { cues: captions.cues, durationSeconds: recording.durationSeconds };
	return {
		state: 'ready',
		recordingId: recording.id,
		durationSeconds: recording.durationSeconds,
		captionsVersion: captions.version,
		suggestions: suggestBoundaries(
			{ ...input, ...(signals ?? { silences: [], sceneChanges: [] }) },
			{ ...words, minSilenceSeconds: DEFAULT_MIN_SILENCE_SECONDS }
		),
		// The captions alone still say a good deal; the page says what was left out.
		note: signals
			? null
			: 'The sound and picture could not be read this time, so these suggestions come from the captions alone.'
	};
}

/** Forgets what the detectors found and their jobs (tests, and asking for a fresh measurement). */
export function forgetSuggestions(recordingId?: string): void {
	forgetSignals(recordingId);
}

// ---------------------------------------------------------------------------------------------
// Reading segments

/** A segment of the clinic (superseded ones included, since exercises may still use them), or null. */
export function findSegment(clinicId: string, segmentId: string): SegmentRow | null {
	return (
		db()
			.select()
			.from(segments)
			.where(and(eq(segments.id, segmentId), eq(segments.clinicId, clinicId)))
			.get() ?? null
	);
}

export interface ReadySegment {
	id: string;
	recordingId: string;
	recordingTitle: string;
	position: number;
	title: string;
	startSeconds: number;
	endSeconds: number;
	durationSeconds: number;
	posterCount: number;
	cueCount: number;
	captionsLanguage: string;
	/** The recording's picture size: the clip's shape. */
	width: number;
	height: number;
}

/** Every current, cut segment of the clinic, by recording and then order: what exercises pick from. */
export function listReadySegments(clinicId: string): ReadySegment[] {
	return db()
		.select({
			segment: segments,
			recordingTitle: recordings.title,
			width: recordings.width,
			height: recordings.height
		})
		.from(segments)
		.innerJoin(recordings, eq(recordings.id, segments.recordingId))
		.where(
			and(
				eq(segments.clinicId, clinicId),
				eq(segments.status, 'ready'),
				isNull(segments.supersededAt)
			)
		)
		.orderBy(asc(recordings.title), asc(segments.recordingId), asc(segments.position))
		.all()
		.map(({ segment: s, recordingTitle, width, height }) => ({
			id: s.id,
			recordingId: s.recordingId,
			recordingTitle,
			position: s.position,
			title: s.title,
			startSeconds: s.startSeconds,
			endSeconds: s.endSeconds,
			durationSeconds: s.clipDurationSeconds ?? s.endSeconds - s.startSeconds,
			posterCount: s.posterCount,
			cueCount: s.cues.length,
			captionsLanguage: s.captionsLanguage,
			width,
			height
		}));
}

/**
 * Whether a patient may watch a segment: one of their PUBLISHED programmes has an item whose
 * exercise is built on it. Drafts and ended programmes do not count.
 */
export function patientCanSeeSegment(patientId: string, segmentId: string): boolean {
	const row = db()
		.select({ id: programmeItems.id })
		.from(programmeItems)
		.innerJoin(programmes, eq(programmes.id, programmeItems.programmeId))
		.innerJoin(exercises, eq(exercises.id, programmeItems.exerciseId))
		.innerJoin(segments, eq(segments.id, exercises.segmentId))
		.where(
			and(
				eq(programmes.patientId, patientId),
				eq(programmes.status, 'published'),
				eq(exercises.segmentId, segmentId),
				eq(segments.clinicId, programmes.clinicId)
			)
		)
		.limit(1)
		.get();
	return row !== undefined;
}

/** Where a segment's files are served. */
export function segmentUrls(segmentId: string, posterCount: number) {
	const base = `/api/segments/${segmentId}`;
	return {
		clip: `${base}/clip.mp4`,
		posters: Array.from({ length: posterCount }, (_, i) => `${base}/poster-${i}.jpg`),
		captions: `${base}/captions.vtt`,
		transcript: `${base}/transcript.json`
	};
}

export interface SegmentView {
	id: string;
	position: number;
	title: string;
	start: number;
	end: number;
	status: SegmentStatus;
	failureReason: string | null;
	clipDurationSeconds: number | null;
	posterCount: number;
	cueCount: number;
	captionsLanguage: string;
	job: {
		status: Job['status'];
		stage: string;
		progress: number;
		attempts: number;
		maxAttempts: number;
		lastError: string | null;
	} | null;
	urls: ReturnType<typeof segmentUrls>;
}

export interface RecordingSegments {
	recordingId: string;
	segments: SegmentView[];
	/** Whether every segment has finished (ready or failed): the page stops polling. */
	settled: boolean;
	chapters: string | null;
}

/** The recording's current (not superseded) segments with their jobs, for its page and polling. */
export function recordingSegments(recording: Recording): RecordingSegments {
	const rows = db()
		.select()
		.from(segments)
		.where(and(eq(segments.recordingId, recording.id), isNull(segments.supersededAt)))
		.orderBy(asc(segments.position))
		.all();
	const jobs = queue.latestSegmentJobs(rows.map((r) => r.id));
	const chapters = chaptersTrack(recording);
	return {
		recordingId: recording.id,
		segments: rows.map((s) => {
			const job = jobs.get(s.id);
			return {
				id: s.id,
				position: s.position,
				title: s.title,
				start: s.startSeconds,
				end: s.endSeconds,
				status: s.status,
				failureReason: s.failureReason,
				clipDurationSeconds: s.clipDurationSeconds,
				posterCount: s.posterCount,
				cueCount: s.cues.length,
				captionsLanguage: s.captionsLanguage,
				job: job
					? {
							status: job.status,
							stage: job.stage,
							progress: job.progress,
							attempts: job.attempts,
							maxAttempts: job.maxAttempts,
							lastError: job.lastError
						}
					: null,
				urls: segmentUrls(s.id, s.status === 'ready' ? s.posterCount : 0)
			};
		}),
		settled: rows.every((s) => s.status !== 'cutting'),
		chapters:
			chapters && chapters.currentVersion > 0
				? `/api/recordings/${recording.id}/chapters.vtt`
				: null
	};
}

// ---------------------------------------------------------------------------------------------
// Confirming

export interface Confirmed {
	segments: SegmentRow[];
	/** The chapters track written from them, and its new version. */
	chapters: { trackId: string; version: number };
	/** Superseded segments that nothing used, deleted with this confirmation. */
	removed: string[];
	/** Settles once the removed segments' clips and posters are deleted from storage. */
	filesRemoved: Promise<void>;
}

/**
 * Confirms a recording's segments. In one transaction the current segments are superseded (kept
 * for exercises that use them), the new ones inserted as `cutting` with their cues (the current
 * captions clipped to each and shifted to zero; a cue across a boundary is split), and one
 * cut-segment job queued for each. Then the recording's chapters track gets a new version.
 */
export function confirmSegments(
	clinician: { id: string; clinicId: string },
	recordingId: string,
	plan: readonly PlannedSegment[]
): Confirmed {
	const recording = db()
		.select()
		.from(recordings)
		.where(and(eq(recordings.id, recordingId), eq(recordings.clinicId, clinician.clinicId)))
		.get();
	if (!recording) throw new SegmentError(404, 'Not found.');
	if (recording.status !== 'ready') {
		throw new SegmentError(409, 'Segments can be confirmed once the recording is ready.');
	}
	const cleaned = plan.map((s) => ({
		title: s.title.trim().replace(/\s+/g, ' '),
		start: Math.round(s.start * 1000) / 1000,
		end: Math.min(Math.round(s.end * 1000) / 1000, recording.durationSeconds)
	}));
	const problems = planProblems(cleaned, recording.durationSeconds);
	if (problems.length > 0) {
		throw new SegmentError(
			422,
			problems.length === 1 ? problems[0] : `${problems.length} things need fixing first.`,
			problems
		);
	}
	const captions = currentCaptions(recording);
	const now = new Date();
	const inserted = db().transaction(
		(tx) => {
			tx.update(segments)
				.set({ supersededAt: now })
				.where(and(eq(segments.recordingId, recording.id), isNull(segments.supersededAt)))
				.run();
			// Cuts of segments replaced before they were made stop: a queued one now, a running one
			// at its worker's next heartbeat (which aborts its ffmpeg).
			const replacedWhileCutting = tx
				.select({ id: segments.id })
				.from(segments)
				.where(
					and(
						eq(segments.recordingId, recording.id),
						isNotNull(segments.supersededAt),
						eq(segments.status, 'cutting')
					)
				);
			tx.update(jobs)
				.set({ status: 'cancelled', stage: 'cancelled', finishedAt: now })
				.where(and(eq(jobs.status, 'queued'), inArray(jobs.segmentId, replacedWhileCutting)))
				.run();
			tx.update(jobs)
				.set({ cancelRequested: true })
				.where(and(eq(jobs.status, 'running'), inArray(jobs.segmentId, replacedWhileCutting)))
				.run();
			const removed = tx
				.delete(segments)
				.where(
					and(
						eq(segments.recordingId, recording.id),
						isNotNull(segments.supersededAt),
						// A cut still running could store its clip after the files were deleted; its
						// segment goes with a later confirmation.
						notExists(
							tx
								.select({ id: jobs.id })
								.from(jobs)
								.where(and(eq(jobs.segmentId, segments.id), eq(jobs.status, 'running')))
						),
						notExists(
							tx
								.select({ id: exercises.id })
								.from(exercises)
								.where(eq(exercises.segmentId, segments.id))
						),
						notExists(
							tx
								.select({ id: librarySubmissions.id })
								.from(librarySubmissions)
								.where(eq(librarySubmissions.segmentId, segments.id))
						)
					)
				)
				.returning({ id: segments.id })
				.all()
				.map((r) => r.id);
			const rows = cleaned.map((s, position) => {
				const row = tx
					.insert(segments)
					.values({
						recordingId: recording.id,
						clinicId: recording.clinicId,
						position,
						title: s.title,
						startSeconds: s.start,
						endSeconds: s.end,
						status: 'cutting',
						cues: shiftAndClip(captions.cues, s.start, s.end),
						captionsVersion: captions.version,
						captionsLanguage: captions.language,
						createdBy: clinician.id,
						createdAt: now
					})
					.returning()
					.get();
				queue.enqueue(
					{
						kind: 'cut-segment',
						recordingId: recording.id,
						segmentId: row.id,
						maxAttempts: CUT_ATTEMPTS
					},
					tx
				);
				return row;
			});
			return { rows, removed };
		},
		{ behavior: 'immediate' }
	);
	const chapters = writeChapters(recording, inserted.rows, captions.language, clinician.id);
	return {
		segments: inserted.rows,
		chapters,
		removed: inserted.removed,
		filesRemoved: deleteSegmentFiles(recording, inserted.removed)
	};
}

/**
 * Deletes the clips and posters of segments whose rows are gone. The rows go first, in the
 * confirmation's transaction, so a crash here leaves unreachable files, never a segment without
 * its clip. Never rejects: a failure is logged and the files stay.
 */
async function deleteSegmentFiles(recording: Recording, segmentIds: readonly string[]) {
	const keys = recordingKeys(recording.clinicId, recording.id);
	for (const id of segmentIds) {
		try {
			await deleteObject(keys.segment(id));
			// Its posters and the clip's smaller versions.
			await deletePrefix(keys.segmentFolder(id));
		} catch (error) {
			console.error(`[segments] the files of removed segment ${id} could not be deleted:`, error);
		}
	}
}

/** The recording's chapters track: the one in the captions' language, else its first. */
function chaptersTrack(recording: Recording, language?: string): CaptionTrack | null {
	const tracks = db()
		.select()
		.from(captionTracks)
		.where(and(eq(captionTracks.recordingId, recording.id), eq(captionTracks.kind, 'chapters')))
		.orderBy(asc(captionTracks.createdAt))
		.all();
	return tracks.find((t) => t.language === language) ?? tracks[0] ?? null;
}

/** The chapters track a recording's chapters.vtt serves, or null. */
export function findChaptersTrack(recording: Recording): CaptionTrack | null {
	return chaptersTrack(recording, currentCaptions(recording).language);
}

function writeChapters(
	recording: Recording,
	rows: readonly SegmentRow[],
	language: string,
	userId: string
): { trackId: string; version: number } {
	const track =
		db()
			.select()
			.from(captionTracks)
			.where(
				and(
					eq(captionTracks.recordingId, recording.id),
					eq(captionTracks.kind, 'chapters'),
					eq(captionTracks.language, language)
				)
			)
			.get() ?? createTrack(recording, { kind: 'chapters', language });
	const cues = chaptersFromSegments(
		rows.map((r) => ({ start: r.startSeconds, end: r.endSeconds, title: r.title }))
	);
	let base = track.currentVersion;
	// Chapters are made, never hand-edited here: a save that raced another just goes on top of it.
	for (let attempt = 0; attempt < 3; attempt++) {
		const saved = saveVersion(track, {
			baseVersion: base,
			cues,
			note: `Chapters from ${rows.length} confirmed ${rows.length === 1 ? 'segment' : 'segments'}`,
			source: 'generated',
			userId
		});
		if (saved.ok) return { trackId: track.id, version: saved.version };
		base = saved.conflict.current.version;
	}
	throw new SegmentError(409, 'The chapters track kept changing while it was being written.');
}

// ---------------------------------------------------------------------------------------------
// Cutting outcomes

/** Cuts a failed segment again with fresh attempts. Answers false when it had not failed. */
export function retrySegment(clinicId: string, segmentId: string): boolean {
	const segment = findSegment(clinicId, segmentId);
	if (!segment || segment.status !== 'failed') return false;
	const job = queue.latestSegmentJobs([segment.id]).get(segment.id);
	db().transaction((tx) => {
		tx.update(segments)
			.set({ status: 'cutting', failureReason: null })
			.where(eq(segments.id, segment.id))
			.run();
		if (!job || !queue.requeue(job.id)) {
			queue.enqueue(
				{
					kind: 'cut-segment',
					recordingId: segment.recordingId,
					segmentId: segment.id,
					maxAttempts: CUT_ATTEMPTS
				},
				tx
			);
		}
	});
	return true;
}

export function markSegmentFailed(segmentId: string, reason: string): void {
	db()
		.update(segments)
		.set({ status: 'failed', failureReason: reason })
		.where(and(eq(segments.id, segmentId), inArray(segments.status, ['cutting', 'failed'])))
		.run();
}

/** Marks a segment ready, last, once its clip and posters are stored; false if it was gone. */
export function markSegmentReady(
	segmentId: string,
	result: {
		clipDurationSeconds: number;
		clipSize: number;
		posterCount: number;
		clipVersions?: StoredVersion[] | null;
	}
): boolean {
	const updated = db()
		.update(segments)
		.set({ status: 'ready', failureReason: null, ...result })
		.where(eq(segments.id, segmentId))
		.run();
	return updated.changes > 0;
}

// ---------------------------------------------------------------------------------------------
// Captions of a segment

/** Which captions a segment shows now: the track and version they come from, and the cues. */
export interface SegmentCaptions {
	/** The recording's captions track they follow, or null when it has none any more. */
	trackId: string | null;
	/** That track's version; with no track, the version copied at confirmation. */
	version: number;
	language: string;
	cues: Cue[];
}

// Clipped cues by track, version and segment: a version never changes, so neither do they.
const clippedCaptions = new LRUCache<string, Cue[]>({ max: 500 });

/**
 * A segment's captions as patients see them: the recording's current captions track clipped to
 * the segment and shifted to start at zero. A fix saved in the caption editor reaches every
 * replay at once; the clip's pictures did not change, so nothing is cut again. A recording whose
 * captions track is gone keeps the copy made when the segment was confirmed.
 */
export function segmentCaptions(segment: SegmentRow): SegmentCaptions {
	const track = firstCaptionsTrack(segment.clinicId, segment.recordingId);
	if (!track) {
		return {
			trackId: null,
			version: segment.captionsVersion,
			language: segment.captionsLanguage,
			cues: segment.cues
		};
	}
	const key = `${track.id}\n${track.currentVersion}\n${segment.id}`;
	let cues = clippedCaptions.get(key);
	if (!cues) {
		cues = shiftAndClip(getVersion(track)?.cues ?? [], segment.startSeconds, segment.endSeconds);
		clippedCaptions.set(key, cues);
	}
	return { trackId: track.id, version: track.currentVersion, language: track.language, cues };
}

/** Strong validator for a segment's captions in one format: it names the track version shown. */
export function segmentTag(
	segment: SegmentRow,
	format: string,
	captions = segmentCaptions(segment)
): string {
	const hash = createHash('sha256')
		.update(`segment\n${segment.id}\n${captions.trackId ?? ''}\n${captions.version}\n${format}`)
		.digest('base64url');
	return `"${hash.slice(0, 32)}"`;
}

export function segmentVtt(segment: SegmentRow): {
	body: () => string;
	etag: string;
	filename: string;
} {
	const captions = segmentCaptions(segment);
	return {
		body: () => serializeVtt(captions.cues),
		etag: segmentTag(segment, 'vtt', captions),
		filename: `segment-${segment.position + 1}-${captions.language.replace(/[^A-Za-z0-9-]/g, '')}.vtt`
	};
}

export interface SegmentTranscript {
	segmentId: string;
	title: string;
	language: string;
	/** The captions track version the lines come from. */
	captionsVersion: number;
	lines: { id: string; start: number; end: number; text: string; plain: string }[];
}

export function segmentTranscript(
	segment: SegmentRow,
	captions = segmentCaptions(segment)
): SegmentTranscript {
	return {
		segmentId: segment.id,
		title: segment.title,
		language: captions.language,
		captionsVersion: captions.version,
		lines: captions.cues.map((cue) => ({
			id: cue.id,
			start: cue.start,
			end: cue.end,
			text: cue.text,
			plain: plainText(cue.text)
		}))
	};
}

/** The newest segments first, for reports; superseded included. */
export function segmentHistory(recordingId: string): SegmentRow[] {
	return db()
		.select()
		.from(segments)
		.where(eq(segments.recordingId, recordingId))
		.orderBy(desc(segments.createdAt), asc(segments.position))
		.all();
}
