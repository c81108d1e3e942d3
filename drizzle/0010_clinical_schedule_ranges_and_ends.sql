ALTER TABLE `patient` ADD `precaution_details` text DEFAULT '{}' NOT NULL;--> statement-breakpoint
ALTER TABLE `patient` ADD `protocol_shift_weeks` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `patient` ADD `sling_until` text;--> statement-breakpoint
ALTER TABLE `patient` ADD `birth_year` integer;--> statement-breakpoint
ALTER TABLE `patient` ADD `sex` text;--> statement-breakpoint
ALTER TABLE `programme_item` ADD `weekdays` text;--> statement-breakpoint
ALTER TABLE `programme_item` ADD `range_guides` text DEFAULT '[]' NOT NULL;--> statement-breakpoint
ALTER TABLE `rom_measurement` ADD `instrument` text DEFAULT 'goniometer' NOT NULL;--> statement-breakpoint
ALTER TABLE `rom_measurement` ADD `arm_position` text;