CREATE TABLE `recording` (
	`id` text PRIMARY KEY NOT NULL,
	`clinic_id` text NOT NULL,
	`uploaded_by` text,
	`title` text NOT NULL,
	`original_filename` text NOT NULL,
	`content_type` text NOT NULL,
	`size_bytes` integer NOT NULL,
	`status` text DEFAULT 'processing' NOT NULL,
	`duration_seconds` real NOT NULL,
	`width` integer NOT NULL,
	`height` integer NOT NULL,
	`video_codec` text NOT NULL,
	`audio_codec` text,
	`frame_rate` real,
	`rotation` integer DEFAULT 0 NOT NULL,
	`has_audio` integer DEFAULT false NOT NULL,
	`rendition_size` integer,
	`poster_count` integer DEFAULT 0 NOT NULL,
	`sprite` text,
	`waveform_key` text,
	`failure_reason` text,
	`created_at` integer NOT NULL,
	`ready_at` integer,
	FOREIGN KEY (`clinic_id`) REFERENCES `clinic`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`uploaded_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `recording_clinic_created` ON `recording` (`clinic_id`,`created_at`);--> statement-breakpoint
CREATE TABLE `upload` (
	`id` text PRIMARY KEY NOT NULL,
	`clinic_id` text NOT NULL,
	`user_id` text NOT NULL,
	`recording_id` text NOT NULL,
	`object_key` text NOT NULL,
	`s3_upload_id` text NOT NULL,
	`filename` text NOT NULL,
	`content_type` text NOT NULL,
	`size_bytes` integer NOT NULL,
	`part_size` integer NOT NULL,
	`created_at` integer NOT NULL,
	`last_activity_at` integer NOT NULL,
	FOREIGN KEY (`clinic_id`) REFERENCES `clinic`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `upload_clinic` ON `upload` (`clinic_id`);--> statement-breakpoint
CREATE INDEX `upload_activity` ON `upload` (`last_activity_at`);--> statement-breakpoint
CREATE TABLE `job` (
	`id` text PRIMARY KEY NOT NULL,
	`kind` text NOT NULL,
	`recording_id` text NOT NULL,
	`status` text DEFAULT 'queued' NOT NULL,
	`attempts` integer DEFAULT 0 NOT NULL,
	`max_attempts` integer DEFAULT 3 NOT NULL,
	`run_after` integer NOT NULL,
	`progress` real DEFAULT 0 NOT NULL,
	`stage` text DEFAULT 'waiting' NOT NULL,
	`last_error` text,
	`locked_by` text,
	`heartbeat_at` integer,
	`cancel_requested` integer DEFAULT false NOT NULL,
	`created_at` integer NOT NULL,
	`finished_at` integer,
	FOREIGN KEY (`recording_id`) REFERENCES `recording`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `job_claim` ON `job` (`status`,`run_after`);--> statement-breakpoint
CREATE INDEX `job_recording` ON `job` (`recording_id`);