ALTER TABLE `sites` ADD `horizon_mask` text DEFAULT '[]' NOT NULL;--> statement-breakpoint
ALTER TABLE `systems` ADD `position_epoch` text DEFAULT '2000-01-01T12:00:00.000Z' NOT NULL;