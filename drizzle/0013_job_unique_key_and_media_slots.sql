CREATE TABLE `media_slot` (
	`id` text PRIMARY KEY NOT NULL,
	`holder` text NOT NULL,
	`acquired_at` integer NOT NULL,
	`expires_at` integer NOT NULL
);
--> statement-breakpoint
ALTER TABLE `job` ADD `unique_key` text;--> statement-breakpoint
CREATE UNIQUE INDEX `job_unique_key` ON `job` (`unique_key`);