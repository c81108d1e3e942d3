CREATE TABLE `recording_signals` (
	`recording_id` text PRIMARY KEY NOT NULL,
	`rendition_ready_at` integer NOT NULL,
	`settings` text NOT NULL,
	`silences` text NOT NULL,
	`scene_changes` text NOT NULL,
	`detected_at` integer NOT NULL,
	FOREIGN KEY (`recording_id`) REFERENCES `recording`(`id`) ON UPDATE no action ON DELETE cascade
);
