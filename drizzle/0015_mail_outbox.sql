CREATE TABLE `mail_outbox` (
	`id` text PRIMARY KEY NOT NULL,
	`clinic_id` text NOT NULL,
	`recipients` text NOT NULL,
	`subject` text NOT NULL,
	`text` text,
	`html` text,
	`attempts` integer DEFAULT 0 NOT NULL,
	`next_attempt_at` integer NOT NULL,
	`sent_at` integer,
	`last_error` text,
	`created_at` integer NOT NULL
);
--> statement-breakpoint
CREATE INDEX `mail_outbox_due` ON `mail_outbox` (`sent_at`,`next_attempt_at`);