CREATE TABLE `caption_track_version` (
	`id` text PRIMARY KEY NOT NULL,
	`track_id` text NOT NULL,
	`version` integer NOT NULL,
	`cues` text NOT NULL,
	`source` text NOT NULL,
	`note` text DEFAULT '' NOT NULL,
	`created_by` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`track_id`) REFERENCES `caption_track`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `caption_track_version_track_version` ON `caption_track_version` (`track_id`,`version`);--> statement-breakpoint
CREATE TABLE `caption_track` (
	`id` text PRIMARY KEY NOT NULL,
	`recording_id` text NOT NULL,
	`clinic_id` text NOT NULL,
	`kind` text NOT NULL,
	`language` text NOT NULL,
	`label` text NOT NULL,
	`current_version` integer DEFAULT 0 NOT NULL,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`recording_id`) REFERENCES `recording`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`clinic_id`) REFERENCES `clinic`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `caption_track_recording_kind_language` ON `caption_track` (`recording_id`,`kind`,`language`);--> statement-breakpoint
CREATE INDEX `caption_track_clinic` ON `caption_track` (`clinic_id`);