CREATE TABLE `audit_trail` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`at` text NOT NULL,
	`user_id` integer,
	`action` text NOT NULL,
	`entity` text NOT NULL,
	`entity_id` integer,
	`detail` text,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `audit_entity` ON `audit_trail` (`entity`,`entity_id`);--> statement-breakpoint
CREATE TABLE `block_outcomes` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`report_id` integer NOT NULL,
	`block_id` integer NOT NULL,
	`status` text NOT NULL,
	`exposure_minutes` real,
	`notes` text DEFAULT '' NOT NULL,
	FOREIGN KEY (`report_id`) REFERENCES `night_reports`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`block_id`) REFERENCES `blocks`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE UNIQUE INDEX `block_outcomes_block_id_unique` ON `block_outcomes` (`block_id`);--> statement-breakpoint
CREATE TABLE `blocks` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`night_id` integer NOT NULL,
	`target_id` integer NOT NULL,
	`kind` text NOT NULL,
	`start_utc` text NOT NULL,
	`end_utc` text NOT NULL,
	`status` text DEFAULT 'planned' NOT NULL,
	`laser_guide_star` integer DEFAULT false NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`version` integer DEFAULT 1 NOT NULL,
	`created_at` text NOT NULL,
	`updated_at` text NOT NULL,
	FOREIGN KEY (`night_id`) REFERENCES `nights`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`target_id`) REFERENCES `targets`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE INDEX `blocks_night` ON `blocks` (`night_id`);--> statement-breakpoint
CREATE INDEX `blocks_target` ON `blocks` (`target_id`);--> statement-breakpoint
CREATE TABLE `campaign_sites` (
	`campaign_id` integer NOT NULL,
	`site_id` integer NOT NULL,
	PRIMARY KEY(`campaign_id`, `site_id`),
	FOREIGN KEY (`campaign_id`) REFERENCES `campaigns`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE TABLE `campaign_targets` (
	`campaign_id` integer NOT NULL,
	`target_id` integer NOT NULL,
	PRIMARY KEY(`campaign_id`, `target_id`),
	FOREIGN KEY (`campaign_id`) REFERENCES `campaigns`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`target_id`) REFERENCES `targets`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE TABLE `campaigns` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`name` text NOT NULL,
	`start_date` text NOT NULL,
	`end_date` text NOT NULL,
	`goals` text NOT NULL,
	`constraints` text NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`created_at` text NOT NULL,
	`updated_at` text NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `campaigns_name_unique` ON `campaigns` (`name`);--> statement-breakpoint
CREATE TABLE `measurements` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`target_id` integer NOT NULL,
	`block_id` integer,
	`kind` text NOT NULL,
	`epoch` text NOT NULL,
	`epoch_jd` real NOT NULL,
	`d_ra_mas` real,
	`d_dec_mas` real,
	`sigma_d_ra_mas` real,
	`sigma_d_dec_mas` real,
	`separation_mas` real,
	`position_angle_deg` real,
	`sigma_separation_mas` real,
	`sigma_position_angle_deg` real,
	`correlation` real,
	`radial_velocity_km_s` real,
	`sigma_radial_velocity_km_s` real,
	`instrument` text NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`created_at` text NOT NULL,
	`updated_at` text NOT NULL,
	FOREIGN KEY (`target_id`) REFERENCES `targets`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`block_id`) REFERENCES `blocks`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `measurements_target_epoch` ON `measurements` (`target_id`,`epoch_jd`);--> statement-breakpoint
CREATE INDEX `measurements_block` ON `measurements` (`block_id`);--> statement-breakpoint
CREATE TABLE `night_reports` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`night_id` integer NOT NULL,
	`seeing_arcsec` real,
	`strehl_ratio` real,
	`cloud_cover_pct` real,
	`humidity_pct` real,
	`wind_m_s` real,
	`temperature_c` real,
	`time_lost_hours` real DEFAULT 0 NOT NULL,
	`time_lost_reason` text DEFAULT '' NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`author_id` integer,
	`version` integer DEFAULT 1 NOT NULL,
	`created_at` text NOT NULL,
	`updated_at` text NOT NULL,
	FOREIGN KEY (`night_id`) REFERENCES `nights`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`author_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `night_reports_night_id_unique` ON `night_reports` (`night_id`);--> statement-breakpoint
CREATE TABLE `nights` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`site_id` integer NOT NULL,
	`campaign_id` integer,
	`date` text NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`created_at` text NOT NULL,
	`updated_at` text NOT NULL,
	FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`campaign_id`) REFERENCES `campaigns`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE UNIQUE INDEX `nights_site_date` ON `nights` (`site_id`,`date`);--> statement-breakpoint
CREATE INDEX `nights_campaign` ON `nights` (`campaign_id`);--> statement-breakpoint
CREATE TABLE `orbit_solutions` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`target_id` integer NOT NULL,
	`version` integer NOT NULL,
	`current` integer NOT NULL,
	`orbit` text NOT NULL,
	`provenance` text NOT NULL,
	`fitted_from` text,
	`reference` text DEFAULT '' NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`created_by` integer,
	`created_at` text NOT NULL,
	FOREIGN KEY (`target_id`) REFERENCES `targets`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `orbit_solutions_target_version` ON `orbit_solutions` (`target_id`,`version`);--> statement-breakpoint
CREATE UNIQUE INDEX `orbit_solutions_one_current` ON `orbit_solutions` (`target_id`) WHERE current = 1;--> statement-breakpoint
CREATE TABLE `sites` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`name` text NOT NULL,
	`latitude_deg` real NOT NULL,
	`longitude_deg` real NOT NULL,
	`elevation_m` real NOT NULL,
	`time_zone` text NOT NULL,
	`min_altitude_deg` real DEFAULT 30 NOT NULL,
	`sun_avoidance_deg` real DEFAULT 45 NOT NULL,
	`pressure_hpa` real,
	`temperature_c` real,
	`laser_guide_star` integer DEFAULT false NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`created_at` text NOT NULL,
	`updated_at` text NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `sites_name_unique` ON `sites` (`name`);--> statement-breakpoint
CREATE TABLE `systems` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`name` text NOT NULL,
	`ra_deg` real NOT NULL,
	`dec_deg` real NOT NULL,
	`pm_ra_mas_yr` real DEFAULT 0 NOT NULL,
	`pm_dec_mas_yr` real DEFAULT 0 NOT NULL,
	`distance_pc` real,
	`mass_solar` real,
	`notes` text DEFAULT '' NOT NULL,
	`created_at` text NOT NULL,
	`updated_at` text NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `systems_name_unique` ON `systems` (`name`);--> statement-breakpoint
CREATE TABLE `targets` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`system_id` integer NOT NULL,
	`name` text NOT NULL,
	`magnitude` real,
	`band` text,
	`notes` text DEFAULT '' NOT NULL,
	`created_at` text NOT NULL,
	`updated_at` text NOT NULL,
	FOREIGN KEY (`system_id`) REFERENCES `systems`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE UNIQUE INDEX `targets_system_name` ON `targets` (`system_id`,`name`);--> statement-breakpoint
CREATE TABLE `tokens` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`user_id` integer NOT NULL,
	`hash` text NOT NULL,
	`label` text NOT NULL,
	`created_at` text NOT NULL,
	`revoked_at` text,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `tokens_hash_unique` ON `tokens` (`hash`);--> statement-breakpoint
CREATE TABLE `users` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`name` text NOT NULL,
	`role` text NOT NULL,
	`created_at` text NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `users_name_unique` ON `users` (`name`);