CREATE TABLE `pain_alert_mail` (
	`patient_id` text NOT NULL,
	`local_date` text NOT NULL,
	`session_log_id` text NOT NULL,
	`created_at` integer NOT NULL,
	PRIMARY KEY(`patient_id`, `local_date`),
	FOREIGN KEY (`patient_id`) REFERENCES `patient`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`session_log_id`) REFERENCES `session_log`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
ALTER TABLE `session_log` ADD `sharp_pain` integer DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE `session_log` ADD `captions_track_id` text;--> statement-breakpoint
ALTER TABLE `session_log` ADD `captions_version` integer;