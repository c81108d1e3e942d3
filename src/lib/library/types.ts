/**
 * The public library's shapes, shared by the server, the review screen and the public pages.
 * A submission freezes an exercise as it stood when the clinician sent it (its snapshot); an
 * approved submission becomes a published version that carries the same snapshot, unchanged.
 */
import type { Cue } from '../captions/types';
import type { Dosage } from '../dosage/types';
import type { ExerciseFields, LibraryField } from '../exercises/columns';

/** The fields every snapshot has had since the library began. */
type FirstLibraryField =
	| 'title'
	| 'description'
	| 'bodyRegion'
	| 'side'
	| 'position'
	| 'movementType'
	| 'equipment'
	| 'phase'
	| 'coachingCues'
	| 'safetyNotes'
	| 'precautionTags';

/**
 * A field as a snapshot keeps it: as the exercise stores it, except that a word from a vocabulary
 * (a position, a side) is kept as text, since the vocabulary may drop a word a snapshot still has.
 */
type Frozen<T> = {
	[K in keyof T]: NonNullable<T[K]> extends string
		? string | Extract<T[K], null | undefined>
		: T[K];
};

/**
 * The exercise's own fields in a snapshot: the ones LIBRARY_FIELDS names (lib/exercises/columns).
 * A field added to the library later is optional here, since snapshots frozen before it lack it.
 */
export type SnapshotFields = Frozen<
	Pick<ExerciseFields, FirstLibraryField> &
		Partial<Pick<ExerciseFields, Exclude<LibraryField, FirstLibraryField>>>
>;

/** An exercise frozen at submission time: what the public would see, and nothing of the clinic. */
export type ExerciseSnapshot = SnapshotFields & {
	/** The starting dosage. */
	dosage: Dosage;
	segment: {
		id: string;
		durationSeconds: number | null;
		posterCount: number;
		captionsLanguage: string;
		/** The clip's picture size, so players and stills take its shape (absent before it was kept). */
		width?: number | null;
		height?: number | null;
	};
	/** The segment's captions, clipped to it and starting at zero. */
	cues: Cue[];
};

/**
 * Licences a clinician may choose for reuse. The Creative Commons ones need the credit line
 * (attribution); "all rights reserved" allows watching on Kinelume and nothing more.
 */
export const LICENCES = [
	'cc-by-4.0',
	'cc-by-nc-4.0',
	'cc-by-nc-nd-4.0',
	'all-rights-reserved'
] as const;
export type Licence = (typeof LICENCES)[number];

export const LICENCE_LABELS: Record<Licence, string> = {
	'cc-by-4.0': 'CC BY 4.0 (reuse with credit)',
	'cc-by-nc-4.0': 'CC BY-NC 4.0 (reuse with credit, not commercially)',
	'cc-by-nc-nd-4.0': 'CC BY-NC-ND 4.0 (share unchanged with credit, not commercially)',
	'all-rights-reserved': 'All rights reserved (watch on Kinelume only)'
};

/** Where each Creative Commons licence's deed lives (the licences' own canonical addresses). */
export const LICENCE_LINKS: Partial<Record<Licence, string>> = {
	'cc-by-4.0': 'https://creativecommons.org/licenses/by/4.0/',
	'cc-by-nc-4.0': 'https://creativecommons.org/licenses/by-nc/4.0/',
	'cc-by-nc-nd-4.0': 'https://creativecommons.org/licenses/by-nc-nd/4.0/'
};

export function isLicence(value: unknown): value is Licence {
	return LICENCES.includes(value as Licence);
}

/**
 * A submission's life: waiting in the queue, sent back for changes, approved (published),
 * rejected, or replaced by a newer submission of the same exercise before anyone decided.
 */
export const SUBMISSION_STATUSES = [
	'waiting',
	'changes-requested',
	'approved',
	'rejected',
	'superseded'
] as const;
export type SubmissionStatus = (typeof SUBMISSION_STATUSES)[number];

export const SUBMISSION_STATUS: Record<
	SubmissionStatus,
	{ label: string; tone: 'good' | 'waiting' | 'stopped' | 'neutral' }
> = {
	waiting: { label: 'Waiting for review', tone: 'waiting' },
	'changes-requested': { label: 'Changes requested', tone: 'waiting' },
	approved: { label: 'Approved', tone: 'good' },
	rejected: { label: 'Rejected', tone: 'stopped' },
	superseded: { label: 'Replaced by a newer submission', tone: 'neutral' }
};

/**
 * What a submission asks for: a whole exercise (a first version, or a new version with any
 * change), or only new captions for the version on show, everything else kept as published.
 */
export const SUBMISSION_KINDS = ['exercise', 'captions'] as const;
export type SubmissionKind = (typeof SUBMISSION_KINDS)[number];

export const DECISIONS = ['approved', 'changes-requested', 'rejected'] as const;
export type Decision = (typeof DECISIONS)[number];

/** A public exercise: on show, taken down for now (404), or withdrawn for good (410). */
export const ENTRY_STATUSES = ['published', 'unpublished', 'retired'] as const;
export type EntryStatus = (typeof ENTRY_STATUSES)[number];

export const ENTRY_STATUS: Record<
	EntryStatus,
	{ label: string; tone: 'good' | 'waiting' | 'stopped' | 'neutral' }
> = {
	published: { label: 'Published', tone: 'good' },
	unpublished: { label: 'Unpublished', tone: 'waiting' },
	retired: { label: 'Retired', tone: 'neutral' }
};

export const COLLECTION_STATUSES = ['draft', 'published', 'unpublished'] as const;
export type CollectionStatus = (typeof COLLECTION_STATUSES)[number];

export const COLLECTION_STATUS: Record<
	CollectionStatus,
	{ label: string; tone: 'good' | 'waiting' | 'stopped' | 'neutral' }
> = {
	draft: { label: 'Draft', tone: 'waiting' },
	published: { label: 'Published', tone: 'good' },
	unpublished: { label: 'Unpublished', tone: 'waiting' }
};
