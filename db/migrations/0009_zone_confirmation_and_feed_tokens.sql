ALTER TABLE `sites` ADD `longitude_zone_confirmed` integer DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE `tokens` ADD `feed_campaign_id` integer REFERENCES campaigns(id);
