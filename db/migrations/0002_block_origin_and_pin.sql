ALTER TABLE `blocks` ADD `origin` text DEFAULT 'by-hand' NOT NULL;--> statement-breakpoint
ALTER TABLE `blocks` ADD `pinned` integer DEFAULT false NOT NULL;--> statement-breakpoint
UPDATE `blocks` SET `origin` = 'season-plan' WHERE substr(`notes`, 1, 12) = 'season plan ';--> statement-breakpoint
UPDATE `blocks` SET `origin` = 'night-schedule', `pinned` = (instr(`notes`, ' (pinned)') > 0) WHERE substr(`notes`, 1, 15) = 'night schedule ';
