-- Custom SQL migration file, put your code below! --
-- A submission's kind never changes, like its snapshot; the trigger of 0005 is made again with it.
DROP TRIGGER IF EXISTS `library_submission_immutable`;
--> statement-breakpoint
CREATE TRIGGER `library_submission_immutable`
BEFORE UPDATE OF `kind`, `snapshot`, `consent_confirmed`, `consent_details`, `licence`, `attribution`,
	`note_to_reviewer`, `created_at`
ON `library_submission`
BEGIN
	SELECT RAISE(ABORT, 'A library submission never changes; submit again instead.');
END;
--> statement-breakpoint
-- The version a caption revision revises is a link: it may be cleared, never pointed elsewhere.
CREATE TRIGGER `library_submission_revises_fixed`
BEFORE UPDATE OF `revises_version_id` ON `library_submission`
WHEN NEW.`revises_version_id` IS NOT NULL AND NEW.`revises_version_id` IS NOT OLD.`revises_version_id`
BEGIN
	SELECT RAISE(ABORT, 'A library submission never changes; submit again instead.');
END;
