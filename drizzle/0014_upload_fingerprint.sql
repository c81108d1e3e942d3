ALTER TABLE `upload` ADD `fingerprint` text;--> statement-breakpoint
CREATE INDEX `upload_owner_file` ON `upload` (`clinic_id`,`user_id`,`size_bytes`);