CREATE TABLE `site_clear_priors` (
	`site_id` integer NOT NULL,
	`month` integer NOT NULL,
	`clear_fraction` real NOT NULL,
	`strength_nights` real NOT NULL,
	`updated_at` text NOT NULL,
	PRIMARY KEY(`site_id`, `month`),
	FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON UPDATE no action ON DELETE cascade
);
