CREATE TABLE `library_collection_item` (
	`collection_id` text NOT NULL,
	`library_exercise_id` text NOT NULL,
	`position` integer NOT NULL,
	PRIMARY KEY(`collection_id`, `library_exercise_id`),
	FOREIGN KEY (`collection_id`) REFERENCES `library_collection`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`library_exercise_id`) REFERENCES `library_exercise`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `library_collection_item_order` ON `library_collection_item` (`collection_id`,`position`);--> statement-breakpoint
CREATE TABLE `library_collection` (
	`id` text PRIMARY KEY NOT NULL,
	`slug` text NOT NULL,
	`title` text NOT NULL,
	`introduction` text DEFAULT '' NOT NULL,
	`status` text DEFAULT 'draft' NOT NULL,
	`cover_library_exercise_id` text,
	`cover_poster` integer DEFAULT 0 NOT NULL,
	`created_by` text,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	`published_at` integer,
	FOREIGN KEY (`cover_library_exercise_id`) REFERENCES `library_exercise`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `library_collection_slug_unique` ON `library_collection` (`slug`);--> statement-breakpoint
CREATE INDEX `library_collection_status` ON `library_collection` (`status`);--> statement-breakpoint
CREATE TABLE `library_exercise` (
	`id` text PRIMARY KEY NOT NULL,
	`slug` text NOT NULL,
	`clinic_id` text NOT NULL,
	`source_exercise_id` text,
	`status` text DEFAULT 'published' NOT NULL,
	`current_version_id` text,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	`retired_at` integer,
	FOREIGN KEY (`clinic_id`) REFERENCES `clinic`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`source_exercise_id`) REFERENCES `exercise`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `library_exercise_slug_unique` ON `library_exercise` (`slug`);--> statement-breakpoint
CREATE INDEX `library_exercise_status` ON `library_exercise` (`status`);--> statement-breakpoint
CREATE INDEX `library_exercise_source` ON `library_exercise` (`source_exercise_id`);--> statement-breakpoint
CREATE TABLE `library_review` (
	`id` text PRIMARY KEY NOT NULL,
	`submission_id` text NOT NULL,
	`reviewer_id` text,
	`decision` text NOT NULL,
	`comment` text DEFAULT '' NOT NULL,
	`checklist` text NOT NULL,
	`judgement` text DEFAULT '[]' NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`submission_id`) REFERENCES `library_submission`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`reviewer_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `library_review_submission` ON `library_review` (`submission_id`,`created_at`);--> statement-breakpoint
CREATE TABLE `library_submission` (
	`id` text PRIMARY KEY NOT NULL,
	`clinic_id` text NOT NULL,
	`exercise_id` text,
	`segment_id` text,
	`library_exercise_id` text,
	`snapshot` text NOT NULL,
	`consent_confirmed` integer NOT NULL,
	`consent_details` text DEFAULT '' NOT NULL,
	`licence` text NOT NULL,
	`attribution` text NOT NULL,
	`note_to_reviewer` text DEFAULT '' NOT NULL,
	`status` text DEFAULT 'waiting' NOT NULL,
	`submitted_by` text,
	`created_at` integer NOT NULL,
	`decided_at` integer,
	FOREIGN KEY (`clinic_id`) REFERENCES `clinic`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`exercise_id`) REFERENCES `exercise`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`segment_id`) REFERENCES `segment`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`library_exercise_id`) REFERENCES `library_exercise`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`submitted_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `library_submission_status` ON `library_submission` (`status`,`created_at`);--> statement-breakpoint
CREATE INDEX `library_submission_exercise` ON `library_submission` (`exercise_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `library_submission_clinic` ON `library_submission` (`clinic_id`);--> statement-breakpoint
CREATE TABLE `library_version` (
	`id` text PRIMARY KEY NOT NULL,
	`library_exercise_id` text NOT NULL,
	`version` integer NOT NULL,
	`submission_id` text,
	`title` text NOT NULL,
	`body_region` text NOT NULL,
	`position` text NOT NULL,
	`movement_type` text NOT NULL,
	`phase` integer NOT NULL,
	`equipment` text NOT NULL,
	`snapshot` text NOT NULL,
	`licence` text NOT NULL,
	`attribution` text NOT NULL,
	`poster_count` integer DEFAULT 0 NOT NULL,
	`clip_duration_seconds` real,
	`clip_size` integer,
	`published_by` text,
	`published_at` integer NOT NULL,
	FOREIGN KEY (`library_exercise_id`) REFERENCES `library_exercise`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`submission_id`) REFERENCES `library_submission`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`published_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `library_version_number` ON `library_version` (`library_exercise_id`,`version`);--> statement-breakpoint
CREATE INDEX `library_version_filters` ON `library_version` (`body_region`,`position`,`movement_type`,`phase`);