ALTER TABLE `recording` ADD `rendition_versions` text;--> statement-breakpoint
ALTER TABLE `segment` ADD `clip_versions` text;--> statement-breakpoint
ALTER TABLE `library_version` ADD `clip_versions` text;