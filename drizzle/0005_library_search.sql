-- Custom SQL migration file, put your code below! --
-- Full-text search over the public library (SQLite FTS5). One row per PUBLISHED exercise, written
-- by src/lib/server/library/search-index.ts whenever an exercise is published, unpublished,
-- retired or gets a new version. The Porter stemmer lets "bending" find "bend"; the prefix
-- indexes make "kne*" style queries cheap.
CREATE VIRTUAL TABLE `library_search` USING fts5(
	`title`,
	`description`,
	`coaching_cues`,
	`captions`,
	`library_exercise_id` UNINDEXED,
	tokenize = 'porter unicode61 remove_diacritics 2',
	prefix = '2 3'
);
--> statement-breakpoint
-- A published version never changes: a later approval adds the next version instead. The links
-- that may lose their target (submission, publisher) may still be cleared.
CREATE TRIGGER `library_version_immutable`
BEFORE UPDATE OF `library_exercise_id`, `version`, `title`, `body_region`, `position`, `movement_type`,
	`phase`, `equipment`, `snapshot`, `licence`, `attribution`, `poster_count`, `clip_duration_seconds`,
	`clip_size`, `published_at`
ON `library_version`
BEGIN
	SELECT RAISE(ABORT, 'A published library version never changes; publish a new version instead.');
END;
--> statement-breakpoint
-- What a clinician submitted stays as submitted: only its status and links move on.
CREATE TRIGGER `library_submission_immutable`
BEFORE UPDATE OF `snapshot`, `consent_confirmed`, `consent_details`, `licence`, `attribution`,
	`note_to_reviewer`, `created_at`
ON `library_submission`
BEGIN
	SELECT RAISE(ABORT, 'A library submission never changes; submit again instead.');
END;
