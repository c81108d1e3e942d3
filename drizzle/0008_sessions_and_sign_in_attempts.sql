CREATE TABLE `user_session` (
	`id` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`created_at` integer NOT NULL,
	`last_seen_at` integer NOT NULL,
	`expires_at` integer NOT NULL,
	`idle_seconds` integer NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `user_session_user` ON `user_session` (`user_id`);--> statement-breakpoint
CREATE TABLE `sign_in_attempt` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`kind` text DEFAULT 'password-failure' NOT NULL,
	`email` text NOT NULL,
	`address` text NOT NULL,
	`created_at` integer NOT NULL
);
--> statement-breakpoint
CREATE INDEX `sign_in_attempt_email_time` ON `sign_in_attempt` (`kind`,`email`,`created_at`);--> statement-breakpoint
CREATE INDEX `sign_in_attempt_address_time` ON `sign_in_attempt` (`kind`,`address`,`created_at`);--> statement-breakpoint
DROP TABLE `sign_in_failure`;