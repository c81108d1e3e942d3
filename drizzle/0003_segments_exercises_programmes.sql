CREATE TABLE `segment` (
	`id` text PRIMARY KEY NOT NULL,
	`recording_id` text NOT NULL,
	`clinic_id` text NOT NULL,
	`position` integer NOT NULL,
	`title` text NOT NULL,
	`start_seconds` real NOT NULL,
	`end_seconds` real NOT NULL,
	`status` text DEFAULT 'cutting' NOT NULL,
	`clip_duration_seconds` real,
	`clip_size` integer,
	`poster_count` integer DEFAULT 0 NOT NULL,
	`cues` text DEFAULT '[]' NOT NULL,
	`captions_version` integer DEFAULT 0 NOT NULL,
	`captions_language` text DEFAULT 'en' NOT NULL,
	`failure_reason` text,
	`created_by` text,
	`created_at` integer NOT NULL,
	`superseded_at` integer,
	FOREIGN KEY (`recording_id`) REFERENCES `recording`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`clinic_id`) REFERENCES `clinic`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `segment_recording` ON `segment` (`recording_id`,`position`);--> statement-breakpoint
CREATE INDEX `segment_clinic` ON `segment` (`clinic_id`);--> statement-breakpoint
CREATE TABLE `exercise` (
	`id` text PRIMARY KEY NOT NULL,
	`clinic_id` text NOT NULL,
	`segment_id` text,
	`title` text NOT NULL,
	`description` text DEFAULT '' NOT NULL,
	`body_region` text NOT NULL,
	`side` text DEFAULT 'not applicable' NOT NULL,
	`position` text NOT NULL,
	`movement_type` text NOT NULL,
	`equipment` text DEFAULT '[]' NOT NULL,
	`phase` integer DEFAULT 1 NOT NULL,
	`coaching_cues` text DEFAULT '[]' NOT NULL,
	`safety_notes` text DEFAULT '' NOT NULL,
	`precaution_tags` text DEFAULT '[]' NOT NULL,
	`sets` integer NOT NULL,
	`reps` integer NOT NULL,
	`hold_seconds` integer DEFAULT 0 NOT NULL,
	`rest_seconds` integer DEFAULT 0 NOT NULL,
	`sessions_per_day` integer NOT NULL,
	`days_per_week` integer NOT NULL,
	`dosage_bounds` text,
	`progression` text DEFAULT '{"kind":"none"}' NOT NULL,
	`seconds_per_rep` real,
	`status` text DEFAULT 'draft' NOT NULL,
	`created_by` text,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`clinic_id`) REFERENCES `clinic`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`segment_id`) REFERENCES `segment`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `exercise_clinic` ON `exercise` (`clinic_id`,`status`);--> statement-breakpoint
CREATE INDEX `exercise_segment` ON `exercise` (`segment_id`);--> statement-breakpoint
CREATE TABLE `programme_item` (
	`id` text PRIMARY KEY NOT NULL,
	`programme_id` text NOT NULL,
	`exercise_id` text NOT NULL,
	`position` integer NOT NULL,
	`sets` integer NOT NULL,
	`reps` integer NOT NULL,
	`hold_seconds` integer DEFAULT 0 NOT NULL,
	`rest_seconds` integer DEFAULT 0 NOT NULL,
	`sessions_per_day` integer NOT NULL,
	`days_per_week` integer NOT NULL,
	`progression` text DEFAULT '{"kind":"none"}' NOT NULL,
	FOREIGN KEY (`programme_id`) REFERENCES `programme`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`exercise_id`) REFERENCES `exercise`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE INDEX `programme_item_programme` ON `programme_item` (`programme_id`,`position`);--> statement-breakpoint
CREATE TABLE `programme_pause` (
	`id` text PRIMARY KEY NOT NULL,
	`programme_id` text NOT NULL,
	`from_date` text NOT NULL,
	`to_date` text NOT NULL,
	`reason` text DEFAULT '' NOT NULL,
	FOREIGN KEY (`programme_id`) REFERENCES `programme`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `programme_pause_programme` ON `programme_pause` (`programme_id`);--> statement-breakpoint
CREATE TABLE `programme` (
	`id` text PRIMARY KEY NOT NULL,
	`clinic_id` text NOT NULL,
	`patient_id` text NOT NULL,
	`title` text NOT NULL,
	`status` text DEFAULT 'draft' NOT NULL,
	`start_date` text NOT NULL,
	`end_date` text,
	`note` text DEFAULT '' NOT NULL,
	`created_by` text,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	`published_at` integer,
	FOREIGN KEY (`clinic_id`) REFERENCES `clinic`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`patient_id`) REFERENCES `patient`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `programme_patient` ON `programme` (`patient_id`,`status`);--> statement-breakpoint
CREATE INDEX `programme_clinic` ON `programme` (`clinic_id`);--> statement-breakpoint
CREATE TABLE `rom_measurement` (
	`id` text PRIMARY KEY NOT NULL,
	`clinic_id` text NOT NULL,
	`patient_id` text NOT NULL,
	`motion` text NOT NULL,
	`side` text NOT NULL,
	`mode` text NOT NULL,
	`degrees` real NOT NULL,
	`measured_on` text NOT NULL,
	`note` text DEFAULT '' NOT NULL,
	`recorded_by` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`clinic_id`) REFERENCES `clinic`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`patient_id`) REFERENCES `patient`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`recorded_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `rom_patient` ON `rom_measurement` (`patient_id`,`motion`,`measured_on`);--> statement-breakpoint
CREATE TABLE `safety_acknowledgement` (
	`patient_id` text NOT NULL,
	`exercise_id` text NOT NULL,
	`acknowledged_at` integer NOT NULL,
	PRIMARY KEY(`patient_id`, `exercise_id`),
	FOREIGN KEY (`patient_id`) REFERENCES `patient`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`exercise_id`) REFERENCES `exercise`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `session_log` (
	`id` text PRIMARY KEY NOT NULL,
	`clinic_id` text NOT NULL,
	`patient_id` text NOT NULL,
	`programme_item_id` text NOT NULL,
	`client_id` text NOT NULL,
	`done_at` integer NOT NULL,
	`local_date` text NOT NULL,
	`sets_done` integer NOT NULL,
	`reps_done` integer NOT NULL,
	`pain` integer NOT NULL,
	`note` text DEFAULT '' NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`clinic_id`) REFERENCES `clinic`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`patient_id`) REFERENCES `patient`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`programme_item_id`) REFERENCES `programme_item`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `session_log_client` ON `session_log` (`patient_id`,`client_id`);--> statement-breakpoint
CREATE INDEX `session_log_patient_date` ON `session_log` (`patient_id`,`local_date`);--> statement-breakpoint
CREATE INDEX `session_log_item` ON `session_log` (`programme_item_id`);--> statement-breakpoint
CREATE TABLE `weekly_digest` (
	`id` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`week_start` text NOT NULL,
	`sent_at` integer NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `weekly_digest_user_week` ON `weekly_digest` (`user_id`,`week_start`);--> statement-breakpoint
ALTER TABLE `clinic` ADD `caption_profile` text DEFAULT 'bbc' NOT NULL;--> statement-breakpoint
ALTER TABLE `patient` ADD `operation_date` text;--> statement-breakpoint
ALTER TABLE `patient` ADD `protocol` text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE `patient` ADD `precautions` text DEFAULT '[]' NOT NULL;--> statement-breakpoint
ALTER TABLE `patient` ADD `time_zone` text DEFAULT 'Europe/London' NOT NULL;--> statement-breakpoint
ALTER TABLE `patient` ADD `caption_style` text;--> statement-breakpoint
ALTER TABLE `job` ADD `segment_id` text REFERENCES segment(id) ON DELETE cascade;