ALTER TABLE `library_submission` ADD `kind` text DEFAULT 'exercise' NOT NULL;--> statement-breakpoint
ALTER TABLE `library_submission` ADD `revises_version_id` text;